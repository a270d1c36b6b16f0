// Display and evidence images: masks black/white, signed values centred on grey, failing regions outlined.
import sharp from 'sharp';
import { decodePhoto } from '../../../server/vision/decode';
import { displaySamples } from '../../../server/vision/display';
import { displayPng } from '../../../server/vision/encode';
import { evidenceRaster } from '../../../server/vision/evidence';
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
  const { rgb, factor } = evidenceRaster(run);
  expect(factor).toBe(1);
  const at = (x: number, y: number) => Array.from(rgb.subarray(3 * (y * w + x), 3 * (y * w + x) + 3));
  expect(at(5, 5)).toEqual([230, 30, 30]); // region corner
  expect(at(8, 8)).toEqual([255, 170, 0]); // blob outline
  expect(at(9, 9)).toEqual([220, 220, 220]); // blob inside
  expect(at(1, 1)).toEqual([30, 30, 30]); // untouched photo
});

test("a large photo's evidence is shrunk by a whole factor, each pixel the block's mean, outlines kept visible", () => {
  const w = 20;
  const h = 20;
  const samples = new Uint8Array(w * h).fill(30);
  samples[1] = 70; // block (0, 0) = mean of 30, 70, 30, 30 = 40
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
  const raster = evidenceRaster(run, 10);
  expect([raster.width, raster.height, raster.factor]).toEqual([10, 10, 2]);
  const at = (x: number, y: number) => Array.from(raster.rgb.subarray(3 * (y * 10 + x), 3 * (y * 10 + x) + 3));
  expect(at(0, 0)).toEqual([40, 40, 40]);
  expect(at(2, 2)).toEqual([230, 30, 30]); // the region's corner (5, 5)
  expect(at(4, 4)).toEqual([255, 170, 0]); // the blob's outline (8, 8)
  expect(at(5, 5)).toEqual([255, 170, 0]); // the blob's outline (11, 11)
  expect(at(8, 1)).toEqual([30, 30, 30]);
});

test('a failing max gauge rings the pixel where the maximum is, not a blob', () => {
  const w = 60;
  const h = 60;
  const samples = new Uint8Array(w * h).fill(50);
  samples[40 * w + 20] = 250; // the one bright pixel: the maximum
  const run = runRule(
    {
      format: 'kernwright-rule/1',
      name: 'evidence of a maximum',
      steps: [],
      gauges: [{ name: 'brightest', measure: 'max', limits: { max: 200 } }],
    },
    { width: w, height: h, channels: 1, bitDepth: 8, samples },
  );
  expect(run.verdict).toBe('FAIL');
  const { rgb } = evidenceRaster(run);
  const at = (x: number, y: number) => Array.from(rgb.subarray(3 * (y * w + x), 3 * (y * w + x) + 3));
  // The ring's radius is 6 px here (at least 6, or a thirtieth of the shorter side), centred on (20.5, 40.5).
  expect(at(20 + 6, 40)).toEqual([255, 170, 0]);
  expect(at(20, 40 - 7)).toEqual([255, 170, 0]);
  expect(at(20, 40)).toEqual([250, 250, 250]); // the pixel itself stays visible
  expect(at(5, 5)).toEqual([50, 50, 50]);
});
