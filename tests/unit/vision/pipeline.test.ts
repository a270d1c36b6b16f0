// The pipeline runner: verdicts, gauges, regions, units and buffer reuse.
import type { RuleDocumentInput } from '../../../shared/rules/schema';
import { regionSpans, spanPixelCount } from '../../../shared/vision/gauges';
import { laplacian } from '../../../shared/vision/laplacian';
import type { RawPhoto } from '../../../shared/vision/image';
import { RuleRunError, runRule } from '../../../shared/vision/pipeline';

/** A 60x40 8-bit photo: dark background (40) with a bright 10x6 block (200) and a 2x2 speck. */
function blockPhoto(noise = true): RawPhoto {
  const w = 60;
  const h = 40;
  const samples = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let v = 40 + (noise ? ((x * 7 + y * 13) % 9) - 4 : 0);
      if (x >= 20 && x < 30 && y >= 10 && y < 16) v = 200;
      if (x >= 45 && x < 47 && y >= 30 && y < 32) v = 200;
      samples[y * w + x] = v;
    }
  }
  return { width: w, height: h, channels: 1, bitDepth: 8, samples };
}

const rule = (gauges: RuleDocumentInput['gauges'], extra: Partial<RuleDocumentInput> = {}): RuleDocumentInput => ({
  format: 'kernwright-rule/1',
  name: 'Bright block',
  steps: [{ op: 'threshold', method: 'fixed', value: 120 }],
  gauges,
  ...extra,
});

test('blob gauges measure the thresholded blocks: count 2, largest area 60 px², length 10 px', () => {
  const run = runRule(
    rule([
      { name: 'count', measure: 'blob-count', limits: { max: 5 } },
      { name: 'area', measure: 'largest-blob-area', limits: { max: 100 } },
      { name: 'length', measure: 'largest-blob-length', limits: { max: 100 } },
      { name: 'share', measure: 'edge-fraction', limits: { max: 1 } },
    ]),
    blockPhoto(),
  );
  expect(run.measurements.map((m) => [m.name, m.value, m.unit])).toEqual([
    ['count', 2, null],
    ['area', 60, 'px2'],
    ['length', 10, 'px'],
    ['share', 64 / 2400, null],
  ]);
  expect(run.verdict).toBe('PASS');
});

test('a gauge outside its limits fails the part', () => {
  const run = runRule(rule([{ name: 'area', measure: 'largest-blob-area', limits: { max: 59 } }]), blockPhoto());
  expect(run.measurements[0].pass).toBe(false);
  expect(run.verdict).toBe('FAIL');
});

test('limits are inclusive', () => {
  const run = runRule(rule([{ name: 'area', measure: 'largest-blob-area', limits: { min: 60, max: 60 } }]), blockPhoto());
  expect(run.verdict).toBe('PASS');
});

test('calibration converts px to mm and px² to mm² (REFERENCES.md §8: s = 0.025 mm/px, 150 px² → 0.09375 mm²)', () => {
  // 10 px × 0.025 = 0.25 mm; 60 px² × 0.025² = 0.0375 mm².
  const run = runRule(
    rule([
      { name: 'area', measure: 'largest-blob-area', unit: 'mm2', limits: { max: 1 } },
      { name: 'length', measure: 'largest-blob-length', unit: 'mm', limits: { max: 1 } },
    ]),
    blockPhoto(),
    { mmPerPx: 0.025 },
  );
  expect(run.measurements[0].value).toBeCloseTo(0.0375, 12);
  expect(run.measurements[1].value).toBeCloseTo(0.25, 12);
  expect(150 * 0.025 * 0.025).toBeCloseTo(0.09375, 12);
});

test('a gauge in mm without the station calibration cannot run', () => {
  expect(() => runRule(rule([{ name: 'a', measure: 'largest-blob-area', unit: 'mm2', limits: { max: 1 } }]), blockPhoto())).toThrow(RuleRunError);
});

test('a region cuts the mask: only the speck lies in the lower right quarter', () => {
  const run = runRule(
    rule([{ name: 'count', measure: 'blob-count', region: { shape: 'rect', x: 0.5, y: 0.5, w: 0.5, h: 0.5 }, limits: { max: 0 } }]),
    blockPhoto(),
  );
  expect(run.measurements[0].value).toBe(1);
  expect(run.verdict).toBe('FAIL');
});

test('region pixels are those whose centres lie inside: a rect of 0.25 x 0.5 of 8x4 holds 2x2 pixels', () => {
  expect(spanPixelCount(regionSpans(8, 4, { shape: 'rect', x: 0.25, y: 0.25, w: 0.25, h: 0.5 }))).toBe(4);
  // A circle of radius 0.5·min(w,h) = 2 centred at (4, 2) holds the 12 pixel centres within 2 of it.
  expect(spanPixelCount(regionSpans(8, 4, { shape: 'circle', cx: 0.5, cy: 0.5, r: 0.5 }))).toBe(12);
});

test('intensity gauges read the step they name: mean, min, max and population stddev of the input', () => {
  const photo = blockPhoto(false);
  const run = runRule(
    {
      format: 'kernwright-rule/1',
      name: 'stats',
      steps: [{ op: 'box', size: 3 }],
      gauges: [
        { name: 'mean', measure: 'mean', step: 1, region: { shape: 'rect', x: 0, y: 0, w: 0.25, h: 0.25 }, limits: { min: 0 } },
        { name: 'max', measure: 'max', limits: { min: 0 } },
        { name: 'min', measure: 'min', limits: { min: 0 } },
        { name: 'sd', measure: 'stddev', region: { shape: 'rect', x: 0, y: 0, w: 0.25, h: 0.25 }, limits: { min: 0 } },
      ],
    },
    photo,
  );
  expect(run.measurements.map((m) => m.value)).toEqual([40, 200, 40, 0]);
});

test('a blurred or dark photo is a RETAKE even when every gauge passes', () => {
  const flat: RawPhoto = { width: 20, height: 20, channels: 1, bitDepth: 8, samples: new Uint8Array(400).fill(20) };
  const run = runRule(rule([{ name: 'count', measure: 'blob-count', limits: { max: 5 } }], { quality: { minFocus: 5, minMean: 30 } }), flat);
  expect(run.measurements[0].pass).toBe(true);
  expect(run.verdict).toBe('RETAKE');
  expect(run.quality.focus).toBe(0);
  expect(run.quality.problems).toHaveLength(2);
});

test('clipped share counts pixels at the 8-bit maximum 255', () => {
  const samples = new Uint8Array(100).fill(100);
  samples.fill(255, 0, 5);
  const run = runRule(rule([], { quality: { maxClipped: 0.04 } }), { width: 10, height: 10, channels: 1, bitDepth: 8, samples });
  expect(run.quality.clipped).toBe(0.05);
  expect(run.verdict).toBe('RETAKE');
});

test("focus is the population variance of the 4-neighbour Laplacian: a single bright pixel of 10 in 5x5 zeros", () => {
  const samples = new Uint8Array(25);
  samples[12] = 10;
  const run = runRule(rule([]), { width: 5, height: 5, channels: 1, bitDepth: 8, samples });
  // Laplacian: −40 at the centre, 10 at its 4 neighbours, 0 elsewhere (interior: the border is not reached).
  const values = [-40, 10, 10, 10, 10, ...Array(20).fill(0)];
  const mean = values.reduce((a, b) => a + b) / 25;
  const variance = values.reduce((a, v) => a + (v - mean) ** 2, 0) / 25;
  expect(run.quality.focus).toBeCloseTo(variance, 10);
});

test("retain 'gauged' gives the same measurements as 'all' and drops unread outputs", () => {
  const doc = rule([{ name: 'area', measure: 'largest-blob-area', limits: { max: 100 } }], {
    steps: [
      { op: 'gaussian', sigma: 1 },
      { op: 'gradient', operator: 'sobel', output: 'magnitude' },
      { op: 'threshold', method: 'otsu' },
      { op: 'close', radius: 1 },
    ],
  });
  const all = runRule(doc, blockPhoto());
  const gauged = runRule(doc, blockPhoto(), { retain: 'gauged' });
  expect(gauged.measurements).toEqual(all.measurements);
  expect(all.steps.every((s) => s.output !== null)).toBe(true);
  expect(gauged.steps.map((s) => s.output !== null)).toEqual([false, false, false, true]);
  expect(Array.from(gauged.steps[3].output!.data)).toEqual(Array.from(all.steps[3].output!.data));
});

test('a library kernel is resolved by name, and an unknown name is an error naming the step', () => {
  const kernels = new Map([['sobel-x', { name: 'sobel-x', matrix: [[-1, 0, 1], [-2, 0, 2], [-1, 0, 1]], divisor: 1, offset: 0, description: 'd', source: 's' }]]);
  const run = runRule(rule([], { steps: [{ op: 'kernel', kernel: 'sobel-x' }] }), blockPhoto(false), { kernels });
  expect(run.steps[0].kind).toBe('signed');
  // Left edge of the block (x = 19 → 20), row 12: (200 − 40)·(1 + 2 + 1) = 640.
  expect(run.steps[0].output!.data[12 * 60 + 19]).toBe(640);
  try {
    runRule(rule([], { steps: [{ op: 'gaussian', sigma: 1 }, { op: 'kernel', kernel: 'emboss' }] }), blockPhoto(), { kernels });
    throw new Error('ran');
  } catch (e) {
    expect(e).toBeInstanceOf(RuleRunError);
    expect((e as RuleRunError).issues[0].path).toBe('steps[1].kernel');
  }
});

test('an invalid document is refused before anything runs, with its paths', () => {
  try {
    runRule({ format: 'kernwright-rule/1', name: 'x', steps: [{ op: 'box', size: 2 }], gauges: [] }, blockPhoto());
    throw new Error('ran');
  } catch (e) {
    expect((e as RuleRunError).code).toBe('invalid_rule');
    expect((e as RuleRunError).issues[0].path).toBe('steps[0].size');
  }
});

test('the focus figure equals the variance of the full 4-neighbour Laplacian image (reflect border) on a textured photo', () => {
  const photo = blockPhoto();
  const run = runRule(rule([]), photo);
  const lap = laplacian(run.input, 4, 'reflect').data;
  const mean = lap.reduce((a, b) => a + b, 0) / lap.length;
  const variance = lap.reduce((a, v) => a + (v - mean) ** 2, 0) / lap.length;
  expect(run.quality.focus).toBeCloseTo(variance, 6);
});
