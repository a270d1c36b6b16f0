// The plain engine's correlation through the FFT in 128×128 tiles (fft-correlate.ts) against its
// direct correlation, which sums in double precision: the two agree within the double-precision FFT's
// error bound, then float32 rounding. (OpenCV filter2D checks it from outside in
// opencv-wide-kernels.test.ts.)
import fc from 'fast-check';
import { correlate, correlateDirect, PLAIN_FFT_KERNEL_TAPS } from '../../../shared/vision/convolve';
import { correlateFft, largestFiniteMagnitude } from '../../../shared/vision/fft-correlate';
import { createImage } from '../../../shared/vision/image';
import { kernelFromMatrix } from '../../../shared/vision/kernels';
import { bitsOf, borderMode, float32Tolerance, l1, largestDifference, largestMagnitude, onEngine, sampleImage, sampleKind, seed, useEngine } from './engines';

useEngine('plain');

// Higham, Accuracy and Stability of Numerical Algorithms (2nd ed.), §24.1: a radix-2 FFT of m points
// in floating point has a 2-norm relative error of at most log₂(m)·η/(1 − log₂(m)·η), η = μ + γ₄(√2 + μ),
// μ the twiddles' error (one rounding). Forward, product and inverse give |error of one output| ≤
// (3·log₂(m)·η + u)·‖k‖₁·‖tile‖₂, with ‖tile‖₂ ≤ √2·128·max|x| (two image tiles as real and imaginary
// parts). Here u = 2⁻⁵³ (double precision). A structural mistake (a tile's edge, the border, the flip,
// the bit-reversed rows) gives errors of the outputs' own size.
const u = 2 ** -53;
const eta = u + ((4 * u) / (1 - 4 * u)) * (Math.SQRT2 + u);
const logM = Math.log2(128 * 128);
const fftFactor = (3 * logM * eta) / (1 - logM * eta) + u;

const weight = fc.integer({ min: -40, max: 40 }).map((v) => v / 8);
const kernelShape = fc.constantFrom([7, 7], [9, 9], [7, 11], [11, 11], [15, 15], [5, 31], [31, 31], [3, 61], [61, 3]);

function matrixOf(rows: number, cols: number, flat: number[]): number[][] {
  const matrix = Array.from({ length: rows }, (_, j) => flat.slice(j * cols, (j + 1) * cols));
  // Never rank 1 (that would be separable; here it does not matter, but keep kernels as rules have them).
  matrix[0][0] += 0.375;
  return matrix;
}

test('the FFT in tiles equals the direct correlation within the FFT bound in double precision, then float32 rounding', () => {
  const kernel = kernelShape.chain(([rows, cols]) =>
    fc.tuple(fc.constant(rows), fc.constant(cols), fc.array(weight, { minLength: rows * cols, maxLength: rows * cols }), fc.constantFrom(1, 3, 16), weight),
  );
  fc.assert(
    fc.property(fc.tuple(fc.integer({ min: 1, max: 300 }), fc.integer({ min: 1, max: 200 })), sampleKind, seed, borderMode, kernel, ([w, h], kind, s, border, [rows, cols, flat, divisor, offset]) => {
      const image = sampleImage(w, h, kind, s);
      const matrix = matrixOf(rows, cols, flat);
      const k = kernelFromMatrix(matrix, divisor, offset);
      const direct = correlateDirect(image, k, border);
      const fft = createImage(w, h);
      correlateFft(image, k, border, fft);
      const bound = fftFactor * (l1(matrix.flat()) / divisor) * Math.SQRT2 * 128 * largestMagnitude(image.data);
      expect(largestDifference(fft.data, direct.data)).toBeLessThanOrEqual(bound + float32Tolerance(2, largestMagnitude(direct.data) + Math.abs(offset)));
    }),
    { numRuns: 40 },
  );
});

test('on a wider image, whose inner tiles take no column through the border, the FFT equals the direct correlation within the same bound', () => {
  // 520 × 300: with a 31×31 kernel the tiles at x = 98, 196 and 294 take no column through the border,
  // nor with 11×11 the tiles at x = 118, 236 and 354; the image's rows go through it only at the top and bottom.
  const pattern = (side: number) =>
    Array.from({ length: side }, (_, j) => Array.from({ length: side }, (_, i) => ((i * 5 + j * 11) % 7) - 3 + (i === j ? 1.25 : 0)));
  for (const [side, kind, border] of [[31, '8-bit', 'reflect'], [11, '16-bit', 'constant'], [31, 'signed float', 'replicate']] as const) {
    const image = sampleImage(520, 300, kind, side);
    const matrix = pattern(side);
    const k = kernelFromMatrix(matrix, 4, 0.5);
    const direct = correlateDirect(image, k, border);
    const fft = createImage(520, 300);
    correlateFft(image, k, border, fft);
    // The same error bound as above (Higham, §24.1), against the direct sum of the definition.
    const bound = fftFactor * (l1(matrix.flat()) / 4) * Math.SQRT2 * 128 * largestMagnitude(image.data);
    expect(largestDifference(fft.data, direct.data)).toBeLessThanOrEqual(bound + float32Tolerance(2, largestMagnitude(direct.data) + 0.5));
  }
});

test(`correlate takes the FFT from ${PLAIN_FFT_KERNEL_TAPS} weights and the direct path below`, () => {
  const image = sampleImage(150, 140, '8-bit', 11);
  const pattern = (rows: number, cols: number) =>
    Array.from({ length: rows }, (_, j) => Array.from({ length: cols }, (_, i) => ((i * 7 + j * 3) % 5) / 3 - 0.7 + (i === j ? 0.1 : 0)));
  const small = kernelFromMatrix(pattern(9, 13));
  expect(small.rows * small.cols).toBeLessThan(PLAIN_FFT_KERNEL_TAPS);
  expect(bitsOf(correlate(image, small, 'reflect'))).toEqual(bitsOf(correlateDirect(image, small, 'reflect')));
  const large = kernelFromMatrix(pattern(11, 11));
  const fft = createImage(150, 140);
  correlateFft(image, large, 'reflect', fft);
  expect(bitsOf(correlate(image, large, 'reflect'))).toEqual(bitsOf(fft));
});

test('a NaN or an infinity keeps a large kernel on the direct path: it reaches only the outputs whose window holds it', () => {
  for (const bad of [NaN, Infinity]) {
    const image = sampleImage(200, 150, '8-bit', 5);
    image.data[70 * 200 + 90] = bad;
    // No zero weight: 0·∞ is NaN.
    const matrix = Array.from({ length: 15 }, (_, j) => Array.from({ length: 15 }, (_, i) => ((i * 7 + j * 3) % 5) - 2.25 + (i === j ? 1 : 0)));
    const k = kernelFromMatrix(matrix);
    const out = correlate(image, k, 'reflect');
    expect(bitsOf(out)).toEqual(bitsOf(correlateDirect(image, k, 'reflect')));
    expect(Number.isFinite(out.data[0])).toBe(true);
    expect(Number.isFinite(out.data[70 * 200 + 90])).toBe(false);
  }
});

test('both engines take the direct path below the FFT threshold, so exact zeros stay zeros: a 9×9 LoG of a mask gives the same edge fraction', () => {
  // Seen in the workbench: a LoG over a flat part of a mask is exactly 0 by a direct sum; through a
  // transform it is a round-off residue, which a gauge counting non-zero pixels counts.
  const mask = sampleImage(160, 120, 'mask', 3);
  const log9 = kernelFromMatrix([
    [0, 1, 1, 2, 2, 2, 1, 1, 0], [1, 2, 4, 5, 5, 5, 4, 2, 1], [1, 4, 5, 3, 0, 3, 5, 4, 1],
    [2, 5, 3, -12, -24, -12, 3, 5, 2], [2, 5, 0, -24, -40, -24, 0, 5, 2], [2, 5, 3, -12, -24, -12, 3, 5, 2],
    [1, 4, 5, 3, 0, 3, 5, 4, 1], [1, 2, 4, 5, 5, 5, 4, 2, 1], [0, 1, 1, 2, 2, 2, 1, 1, 0],
  ]);
  const nonZero = (data: Float32Array) => data.reduce((n, v) => n + +(v !== 0), 0);
  const plain = nonZero(onEngine('plain', () => correlate(mask, log9, 'reflect')).data);
  const simd = nonZero(onEngine('simd', () => correlate(mask, log9, 'reflect')).data);
  expect(plain).toBe(simd);
  expect(bitsOf(onEngine('plain', () => correlate(mask, log9, 'reflect')))).toEqual(bitsOf(correlateDirect(mask, log9, 'reflect')));
});

test('through the FFT, a sum whose exact value is 0 comes out 0 on both engines: masks and whole-number kernels from 11×11 to 31×31 give the non-zero pixels of the direct path', () => {
  // The direct sums are exact here (whole numbers), so their zeros are the exact zeros; a transform's
  // round-off residue there would count as an edge (fftZeroFloor).
  const side = fc.constantFrom(11, 13, 21, 31);
  fc.assert(
    fc.property(fc.tuple(fc.integer({ min: 40, max: 300 }), fc.integer({ min: 40, max: 200 })), seed, borderMode, side, side, fc.integer({ min: 0, max: 2 ** 31 - 1 }), ([w, h], s, border, rows, cols, weightSeed) => {
      const mask = sampleImage(w, h, 'mask', s);
      let state = weightSeed;
      const matrix = Array.from({ length: rows }, () =>
        Array.from({ length: cols }, () => {
          state = (Math.imul(state, 1103515245) + 12345) >>> 0;
          return (state % 41) - 20;
        }),
      );
      const k = kernelFromMatrix(matrix);
      const zeros = (data: Float32Array) => Array.from(data, (v) => +(v === 0));
      const expected = zeros(onEngine('plain', () => correlateDirect(mask, k, border)).data);
      expect(zeros(onEngine('plain', () => correlate(mask, k, border)).data)).toEqual(expected);
      expect(zeros(onEngine('simd', () => correlate(mask, k, border)).data)).toEqual(expected);
    }),
    { numRuns: 30 },
  );
});

test('largestFiniteMagnitude: the largest |sample|, NaN when a sample is NaN or ±∞ (IEEE 754 binary32 patterns)', () => {
  fc.assert(
    fc.property(fc.array(fc.float({ noNaN: true, noDefaultInfinity: true }), { maxLength: 41 }), (values) => {
      const data = Float32Array.from(values);
      const expected = data.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
      expect(largestFiniteMagnitude(data)).toBe(expected);
    }),
    { numRuns: 300 },
  );
  for (const bad of [NaN, Infinity, -Infinity]) {
    for (const at of [0, 3, 4, 6]) {
      const data = Float32Array.from([1, -2, 0.5, -0, 3, 7, -7]);
      data[at] = bad;
      expect(largestFiniteMagnitude(data)).toBeNaN();
    }
  }
  // A subarray reads its own samples only; the largest subnormal and the largest finite float32.
  const whole = Float32Array.from([Infinity, -5, 2, NaN]);
  expect(largestFiniteMagnitude(whole.subarray(1, 3))).toBe(5);
  expect(largestFiniteMagnitude(Float32Array.of(-(2 ** -149), 2 ** -149))).toBe(2 ** -149);
  expect(largestFiniteMagnitude(Float32Array.of(-3.4028234663852886e38, 1))).toBe(3.4028234663852886e38);
  expect(largestFiniteMagnitude(new Float32Array(0))).toBe(0);
});
