import sharp from 'sharp';
import { generateDataset } from '../../../server/demo';

describe('16-bit demo photos', () => {
  jest.setTimeout(60_000);

  it('decode back as 16-bit PNGs with values above 255, in grey and in colour', async () => {
    const seen = { grey: 0, colour: 0 };
    for await (const image of generateDataset({
      count: 4,
      seed: 16,
      sizes: [{ width: 640, height: 480 }],
      sixteenBitShare: 1,
      colourShare: 0.5,
      retakeShare: 0,
    })) {
      expect(image.truth.bitDepth).toBe(16);
      expect(image.fileName).toMatch(/\.png$/);
      const metadata = await sharp(image.buffer).metadata();
      expect(metadata.format).toBe('png');
      expect(metadata.depth).toBe('ushort');
      expect(metadata.channels).toBe(image.truth.colour ? 3 : 1);
      const { data } = await sharp(image.buffer)
        .toColourspace(image.truth.colour ? 'rgb16' : 'grey16')
        .raw({ depth: 'ushort' })
        .toBuffer({ resolveWithObject: true });
      const samples = new Uint16Array(data.buffer, data.byteOffset, data.length / 2);
      expect(samples.reduce((largest, value) => Math.max(largest, value), 0)).toBeGreaterThan(255);
      // Not an 8-bit image scaled up: the low byte varies.
      expect(samples.some((value) => value % 257 !== 0)).toBe(true);
      seen[image.truth.colour ? 'colour' : 'grey'] += 1;
    }
    expect(seen.grey).toBeGreaterThan(0);
    expect(seen.colour).toBeGreaterThan(0);
  });
});
