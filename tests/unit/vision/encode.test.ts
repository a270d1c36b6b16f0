// Display and evidence images: masks black/white, signed values centred on grey, failing regions outlined.
import sharp from 'sharp';
import { decodePhoto } from '../../../server/vision/decode';
import { displayPng, displaySamples, evidenceSamples } from '../../../server/vision/encode';
import { imageFromSamples } from '../../../shared/vision/image';
import { runRule } from '../../../shared/vision/pipeline';

test('a mask shows 0 as black and anything else as white', () => {
  expect(Array.from(displaySamples(imageFromSamples(3, 1, [0, 1, 0.5]), 'mask'))).toEqual([0, 255, 255]);
});

test('signed values are centred on grey 128, the largest magnitude reaching 1 or 255', () => {
  expect(Array.from(displaySamples(imageFromSamples(3, 1, [-100, 0, 50]), 'signed'))).toEqual([1, 128, 192]);
});

test('8-bit intensities keep their brightness; 16-bit ones are scaled by 255/65535', () => {
  expect(Array.from(displaySamples(imageFromSamples(3, 1, [0, 100, 255]), 'intensity', 8))).toEqual([0, 100, 255]);
  expect(Array.from(displaySamples(imageFromSamples(2, 1, [65535, 257 * 10]), 'intensity', 16))).toEqual([255, 10]);
});

test('the display PNG decodes to the display samples', async () => {
  const image = imageFromSamples(4, 2, [-4, -2, 0, 2, 4, 0, 0, 0]);
  const png = await displayPng(image, 'signed');
  const meta = await sharp(png).metadata();
  expect([meta.format, meta.width, meta.height, meta.channels]).toEqual(['png', 4, 2, 1]);
  const photo = await decodePhoto(png);
  expect(Array.from(photo.samples)).toEqual(Array.from(displaySamples(image, 'signed')));
});

test('the evidence image outlines a failing region in red and its largest blob in amber', () => {
  const w = 20;
  const h = 20;
  const samples = new Uint8Array(w * h).fill(30);
  for (let y = 8; y < 12; y++) for (let x = 8; x < 12; x++) samples[y * w + x] = 220;
  const run = runRule(
    {
      format: 'kernwright-rule/1',
      name: 'evidence',
      steps: [{ op: 'threshold', method: 'fixed', value: 100 }],
      gauges: [{ name: 'spot', measure: 'largest-blob-area', region: { shape: 'rect', x: 0.25, y: 0.25, w: 0.5, h: 0.5 }, limits: { max: 4 } }],
    },
    { width: w, height: h, channels: 1, bitDepth: 8, samples },
  );
  expect(run.verdict).toBe('FAIL');
  const rgb = evidenceSamples(run);
  const at = (x: number, y: number) => Array.from(rgb.subarray(3 * (y * w + x), 3 * (y * w + x) + 3));
  expect(at(5, 5)).toEqual([230, 30, 30]); // region corner
  expect(at(8, 8)).toEqual([255, 170, 0]); // blob outline
  expect(at(9, 9)).toEqual([220, 220, 220]); // blob inside
  expect(at(1, 1)).toEqual([30, 30, 30]); // untouched photo
});
