// Otsu's histogram (the fast path: partial histograms, branch-free range) against the binning
// the rule format states in plain words (../shared/DESIGN.md, "threshold"): 256 integer levels
// for 8-bit data, else bin = floor((v − min)·256/(max − min)) with the maximum in bin 255.
import fc from 'fast-check';
import { gradient } from '../../../shared/vision/gradient';
import { imageFromSamples } from '../../../shared/vision/image';
import { otsuHistogram, thresholdOtsu } from '../../../shared/vision/threshold';

function plainCounts(values: number[]): number[] {
  const counts = new Array<number>(256).fill(0);
  const numbers = values.filter((v) => !Number.isNaN(v));
  const min = Math.min(...numbers);
  const max = Math.max(...numbers);
  const eightBit = values.every((v) => Number.isInteger(v)) && min >= 0 && max <= 255;
  for (const v of values) {
    const bin = eightBit ? v : Math.floor(((v - min) * 256) / (max - min));
    counts[Number.isNaN(bin) ? 0 : Math.min(255, bin)]++;
  }
  return counts;
}

const float32 = (v: number) => Math.fround(v);

test('every value lands in the bin the rule format states, for float data of any length', () => {
  fc.assert(
    fc.property(fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }).map(float32), { minLength: 2, maxLength: 300 }), (values) => {
      fc.pre(Math.max(...values) > Math.min(...values));
      const hist = otsuHistogram(Float32Array.from(values));
      expect(Array.from(hist.counts)).toEqual(plainCounts(values));
    }),
    { numRuns: 300 },
  );
});

test('8-bit data uses the 256 integer levels', () => {
  fc.assert(
    fc.property(fc.array(fc.integer({ min: 0, max: 255 }), { minLength: 2, maxLength: 300 }), (values) => {
      fc.pre(Math.max(...values) > Math.min(...values));
      const hist = otsuHistogram(Float32Array.from(values));
      expect(hist.origin).toBe(0);
      expect(hist.binsPerUnit).toBe(1);
      expect(Array.from(hist.counts)).toEqual(plainCounts(values));
    }),
    { numRuns: 200 },
  );
});

test('a NaN does not decide the range: the other values set min and max', () => {
  const hist = otsuHistogram(Float32Array.from([0.5, NaN, 2.5, 1.5]));
  expect(hist.flat).toBe(false);
  expect(hist.origin).toBe(0.5);
  expect(hist.binsPerUnit).toBe(128);
});

test('the Otsu mask is 1 exactly where the value’s bin is above the chosen bin, whatever the range', () => {
  fc.assert(
    fc.property(
      fc.array(fc.double({ min: -300, max: 300, noNaN: true }).map(float32), { minLength: 2, maxLength: 200 }),
      fc.boolean(),
      (values, invert) => {
        const hist = otsuHistogram(Float32Array.from(values));
        const { mask, bin } = thresholdOtsu(imageFromSamples(values.length, 1, values), invert);
        if (bin < 0) return;
        const binOf = (v: number) => Math.min(255, Math.floor((v - hist.origin) * hist.binsPerUnit));
        const expected = values.map((v) => ((binOf(v) > bin) !== invert ? 1 : 0));
        expect(Array.from(mask.data)).toEqual(expected);
      },
    ),
    { numRuns: 300 },
  );
});

test('float data spanning exactly 256 units keeps its origin when thresholding (bins of width 1 from the minimum)', () => {
  // min 10.5, max 266.5: bins of width 1 starting at 10.5, so 138.5 is in bin 128 and 138.25 in bin 127.
  const values = [10.5, 266.5, 138.25, 138.5, 20.5, 250.5];
  const hist = otsuHistogram(Float32Array.from(values));
  expect(hist.binsPerUnit).toBe(1);
  const { mask, bin } = thresholdOtsu(imageFromSamples(values.length, 1, values));
  const expected = values.map((v) => (Math.min(255, Math.floor(v - 10.5)) > bin ? 1 : 0));
  expect(Array.from(mask.data)).toEqual(expected);
});

test('the gradient magnitude reports the range Otsu would find itself, and Otsu gives the same mask with it', () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 40 }).chain((w) =>
        fc.integer({ min: 1, max: 8 }).chain((h) =>
          fc.array(fc.double({ min: -500, max: 500, noNaN: true }), { minLength: w * h, maxLength: w * h }).map((v) => imageFromSamples(w, h, v)),
        ),
      ),
      (img) => {
        const range = { min: NaN, max: NaN };
        const magnitude = gradient(img, 'sobel', 'magnitude', 'reflect', undefined, range);
        const values = Array.from(magnitude.data);
        expect(range.min).toBe(Math.min(...values));
        expect(range.max).toBe(Math.max(...values));
        const own = thresholdOtsu(magnitude).mask.data;
        const told = thresholdOtsu(magnitude, false, undefined, range).mask.data;
        expect(Array.from(told)).toEqual(Array.from(own));
      },
    ),
    { numRuns: 200 },
  );
});

test('outputs other than the magnitude leave the range unknown', () => {
  const range = { min: 0, max: 1 };
  gradient(imageFromSamples(3, 3, [1, 2, 3, 4, 5, 6, 7, 8, 9]), 'sobel', 'x', 'reflect', undefined, range);
  expect(range.min).toBeNaN();
  expect(range.max).toBeNaN();
});
