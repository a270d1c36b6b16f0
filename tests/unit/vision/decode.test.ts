// The server's photo decoder: formats, bit depths, BT.601 luma, and clear refusals.
import sharp from 'sharp';
import { PhotoDecodeError, decodePhoto } from '../../../server/vision/decode';
import { channelImage } from '../../../shared/vision/image';
import { encodePng } from './png';

const W = 7;
const H = 5;

async function refusal(input: Uint8Array, maxPixels?: number): Promise<PhotoDecodeError> {
  try {
    await decodePhoto(input, { maxPixels });
  } catch (e) {
    if (e instanceof PhotoDecodeError) return e;
    throw e;
  }
  throw new Error('the decoder accepted the file');
}

test('an 8-bit grey PNG keeps its values', async () => {
  const samples = Array.from({ length: W * H }, (_, i) => (i * 37) % 256);
  const photo = await decodePhoto(encodePng(W, H, 1, 8, samples));
  expect([photo.width, photo.height, photo.channels, photo.bitDepth, photo.format]).toEqual([W, H, 1, 8, 'png']);
  expect(Array.from(photo.samples)).toEqual(samples);
});

test('a 16-bit grey PNG keeps its 0-65535 values (no rescaling)', async () => {
  const samples = Array.from({ length: W * H }, (_, i) => (i * 1999 + 300) % 65536);
  const photo = await decodePhoto(encodePng(W, H, 1, 16, samples));
  expect(photo.bitDepth).toBe(16);
  expect(Array.from(channelImage(photo, 'luma').data)).toEqual(samples);
});

test('colour becomes luma with the BT.601 weights 0.299, 0.587, 0.114 on the RGB samples, unrounded', async () => {
  const rgb = Array.from({ length: W * H * 3 }, (_, i) => (i * 53 + 11) % 256);
  const photo = await decodePhoto(encodePng(W, H, 3, 8, rgb));
  const luma = channelImage(photo, 'luma').data;
  for (let p = 0; p < W * H; p++) {
    // ITU-R BT.601-7 §2.5.1 weights, applied here independently of the engine.
    const expected = Math.fround(0.299 * rgb[3 * p] + 0.587 * rgb[3 * p + 1] + 0.114 * rgb[3 * p + 2]);
    expect(luma[p]).toBe(expected);
  }
  expect(Array.from(channelImage(photo, 'green').data)).toEqual(rgb.filter((_, i) => i % 3 === 1));
});

test.each([
  [3, 16],
  [4, 8],
  [4, 16],
] as const)('%i channels of %i bits become luma with the BT.601 weights too, alpha ignored', async (channels, depth) => {
  const top = depth === 16 ? 65536 : 256;
  const samples = Array.from({ length: W * H * channels }, (_, i) => (i * 2741 + 17) % top);
  const photo = await decodePhoto(encodePng(W, H, channels, depth, samples));
  expect([photo.channels, photo.bitDepth]).toEqual([channels, depth]);
  const luma = channelImage(photo, 'luma').data;
  for (let p = 0; p < W * H; p++) {
    const s = channels * p;
    // ITU-R BT.601-7 §2.5.1 weights, applied here independently of the engine.
    expect(luma[p]).toBe(Math.fround(0.299 * samples[s] + 0.587 * samples[s + 1] + 0.114 * samples[s + 2]));
  }
});

test('16-bit colour keeps 16-bit samples', async () => {
  const rgb = Array.from({ length: W * H * 3 }, (_, i) => (i * 2741) % 65536);
  const photo = await decodePhoto(encodePng(W, H, 3, 16, rgb));
  expect([photo.bitDepth, photo.channels]).toEqual([16, 3]);
  expect(Array.from(photo.samples)).toEqual(rgb);
});

test.each(['jpeg', 'webp', 'tiff'] as const)('%s files are read', async (format) => {
  const grey = encodePng(W, H, 1, 8, Array.from({ length: W * H }, (_, i) => i * 5));
  const pipeline = sharp(grey);
  const file = await (format === 'jpeg' ? pipeline.jpeg({ quality: 95 }) : format === 'webp' ? pipeline.webp({ lossless: true }) : pipeline.tiff({ compression: 'lzw' })).toBuffer();
  const photo = await decodePhoto(file);
  expect([photo.format, photo.width, photo.height, photo.bitDepth]).toEqual([format, W, H, 8]);
  if (format !== 'jpeg') expect(channelImage(photo, 'luma').data[W * H - 1]).toBeCloseTo((W * H - 1) * 5, 3);
});

test.each([
  ['8-bit colour', 3, 8],
  ['16-bit grey', 1, 16],
] as const)('%s samples are a buffer of their own that moves to a worker thread uncopied', async (_label, channels, depth) => {
  const photo = await decodePhoto(encodePng(W, H, channels, depth, Array.from({ length: W * H * channels }, (_, i) => i % 200)));
  const { samples } = photo;
  expect([samples.byteOffset, samples.byteLength]).toEqual([0, samples.buffer.byteLength]);
  // Moving a buffer detaches it here; memory the decoder allocated outside V8 would be cloned instead.
  const { port1, port2 } = new MessageChannel();
  port1.postMessage(samples, [samples.buffer as ArrayBuffer]);
  port1.close();
  port2.close();
  expect(samples.byteLength).toBe(0);
});

test('a photo over the pixel limit is refused with too_many_pixels (HTTP 413) before decoding', async () => {
  const e = await refusal(encodePng(W, H, 1, 8, Array(W * H).fill(0)), W * H - 1);
  expect([e.code, e.status]).toEqual(['too_many_pixels', 413]);
  expect(e.message).toMatch(/35 pixels; at most 34/);
});

test('an empty file is refused with empty_file (400)', async () => {
  const e = await refusal(new Uint8Array(0));
  expect([e.code, e.status]).toEqual(['empty_file', 400]);
});

test('a text file is refused with not_an_image (415)', async () => {
  const e = await refusal(Buffer.from('part number, verdict\n17, PASS\n'));
  expect([e.code, e.status]).toEqual(['not_an_image', 415]);
});

test('a GIF is refused with unsupported_format (415)', async () => {
  const gif = await sharp(encodePng(W, H, 1, 8, Array(W * H).fill(9))).gif().toBuffer();
  const e = await refusal(gif);
  expect([e.code, e.status]).toEqual(['unsupported_format', 415]);
});

test('a truncated PNG is refused with corrupt_image (400)', async () => {
  const big = encodePng(200, 200, 3, 8, Array.from({ length: 200 * 200 * 3 }, (_, i) => (i * 7919) % 256));
  const e = await refusal(big.subarray(0, big.length >> 1));
  expect([e.code, e.status]).toEqual(['corrupt_image', 400]);
});
