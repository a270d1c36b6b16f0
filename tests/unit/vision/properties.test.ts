// Properties every correct implementation has, checked on random images with fast-check.
import fc from 'fast-check';
import type { BorderMode } from '../../../shared/rules/schema';
import { correlate, correlateDirect, correlateSeparable } from '../../../shared/vision/convolve';
import { gradient } from '../../../shared/vision/gradient';
import { imageFromSamples, type Image } from '../../../shared/vision/image';
import { kernelFromMatrix, outerProduct } from '../../../shared/vision/kernels';
import { thresholdAdaptiveMean, thresholdFixed, thresholdOtsu } from '../../../shared/vision/threshold';
import { float32Tolerance, l1, largestDifference, largestMagnitude } from './engines';

const border = fc.constantFrom<BorderMode>('reflect', 'replicate', 'constant');

const image = (maxSide = 12) =>
  fc
    .record({ w: fc.integer({ min: 1, max: maxSide }), h: fc.integer({ min: 1, max: maxSide }) })
    .chain(({ w, h }) =>
      fc.array(fc.integer({ min: 0, max: 65535 }), { minLength: w * h, maxLength: w * h }).map((v) => imageFromSamples(w, h, v)),
    );

const oddLength = fc.constantFrom(1, 3, 5, 7);
const taps = (n: number) => fc.array(fc.integer({ min: -9, max: 9 }), { minLength: n, maxLength: n });

function maxAbs(a: Float32Array): number {
  return a.reduce((m, v) => Math.max(m, Math.abs(v)), 1);
}

test('the identity kernel leaves every image unchanged, whatever the border', () => {
  fc.assert(
    fc.property(image(), border, (img, b) => {
      const out = correlate(img, kernelFromMatrix([[0, 0, 0], [0, 1, 0], [0, 0, 0]]), b);
      expect(Array.from(out.data)).toEqual(Array.from(img.data));
    }),
  );
});

test('the separable path equals the direct path for any rank-1 kernel', () => {
  fc.assert(
    fc.property(
      image(),
      border,
      oddLength.chain((n) => taps(n)),
      oddLength.chain((n) => taps(n)),
      (img, b, column, row) => {
        const direct = correlateDirect(img, kernelFromMatrix(outerProduct(column, row)), b);
        const separable = correlateSeparable(img, column, row, b);
        // Two summation orders (on the SIMD engine in float32): they differ by rounding of what is
        // summed, Σ|wᵢ·xᵢ| ≤ Σ|column|·Σ|row|·max|x|, however small the result (float32Tolerance, engines.ts).
        const summed = l1(column) * l1(row) * largestMagnitude(img.data);
        expect(largestDifference(direct.data, separable.data)).toBeLessThanOrEqual(2 * float32Tolerance(column.length * row.length, summed));
      },
    ),
  );
});

test('convolution is linear: K(a·f + c·g) = a·K(f) + c·K(g)', () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 10 }),
      fc.integer({ min: 1, max: 10 }),
      border,
      fc.integer({ min: -4, max: 4 }),
      fc.integer({ min: -4, max: 4 }),
      oddLength.chain((r) => oddLength.chain((c) => fc.array(taps(c), { minLength: r, maxLength: r }))),
      fc.integer(),
      (w, h, b, a, c, matrix, seed) => {
        const f = imageFromSamples(w, h, Array.from({ length: w * h }, (_, i) => ((seed + i * 7919) % 1000) / 10));
        const g = imageFromSamples(w, h, Array.from({ length: w * h }, (_, i) => ((seed ^ (i * 104729)) % 997) / 10));
        const kernel = kernelFromMatrix(matrix);
        const mixed = imageFromSamples(w, h, f.data.map((v, i) => a * v + c * g.data[i]));
        const left = correlate(mixed, kernel, b);
        const kf = correlate(f, kernel, b);
        const kg = correlate(g, kernel, b);
        const right = imageFromSamples(w, h, kf.data.map((v, i) => a * v + c * kg.data[i]));
        // Float32 rounding scales with what is summed, not with the result: a kernel whose taps add up
        // to 0 on a flat neighbourhood gives 0 exactly in real numbers and rounding noise in float32.
        const summed = matrix.flat().reduce((sum, tap) => sum + Math.abs(tap), 0) * (Math.abs(a) * maxAbs(f.data) + Math.abs(c) * maxAbs(g.data));
        expect(left.data.every((v, i) => Math.abs(v - right.data[i]) <= 1e-5 * summed)).toBe(true);
      },
    ),
  );
});

test('a constant image has zero gradient everywhere with the reflect and replicate borders', () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 9 }),
      fc.integer({ min: 1, max: 9 }),
      fc.integer({ min: 0, max: 65535 }),
      fc.constantFrom<BorderMode>('reflect', 'replicate'),
      fc.constantFrom('sobel', 'scharr', 'prewitt' as const),
      fc.constantFrom('x', 'y', 'magnitude' as const),
      (w, h, value, b, operator, output) => {
        const out = gradient(imageFromSamples(w, h, Array(w * h).fill(value)), operator, output, b);
        expect(out.data.every((v) => v === 0)).toBe(true);
      },
    ),
  );
});

function isSubset(smaller: Image, larger: Image): boolean {
  return smaller.data.every((v, i) => v === 0 || larger.data[i] === 1);
}

test('a higher fixed threshold never sets more pixels', () => {
  fc.assert(
    fc.property(image(), fc.integer({ min: -10, max: 70000 }), fc.integer({ min: 0, max: 70000 }), (img, t, step) => {
      expect(isSubset(thresholdFixed(img, t + step), thresholdFixed(img, t))).toBe(true);
    }),
  );
});

test('a larger adaptive-mean c (a lower local threshold) never sets fewer pixels', () => {
  fc.assert(
    fc.property(image(), border, fc.constantFrom(3, 5, 7), fc.integer({ min: -50, max: 50 }), fc.integer({ min: 0, max: 100 }), (img, b, size, c, step) => {
      expect(isSubset(thresholdAdaptiveMean(img, size, c, b), thresholdAdaptiveMean(img, size, c + step, b))).toBe(true);
    }),
  );
});

test('an Otsu mask is the fixed-threshold mask at its own threshold (8-bit data)', () => {
  fc.assert(
    fc.property(image(), (img) => {
      const eightBit = imageFromSamples(img.width, img.height, img.data.map((v) => v % 256));
      const { mask, threshold } = thresholdOtsu(eightBit);
      if (Number.isNaN(threshold)) expect(mask.data.every((v) => v === 0)).toBe(true);
      else expect(Array.from(mask.data)).toEqual(Array.from(thresholdFixed(eightBit, threshold).data));
    }),
  );
});
