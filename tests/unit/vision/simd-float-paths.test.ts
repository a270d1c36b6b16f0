// The WebAssembly SIMD kernels against the plain TypeScript path (the reference) on the float paths:
// separable and direct correlation, Gaussian, gradients, Laplacian and LoG, on random images of odd
// and degenerate sizes, every border mode, 8-bit, 16-bit and signed samples. The two agree within
// float32 rounding: the bound of float32Tolerance (engines.ts) for the operation's length and scale.
// A Gaussian and a gradient swept together (smoothed-gradient.ts) must give the same bits as the two
// SIMD steps in turn, alone and inside a rule run.
import fc from 'fast-check';
import { correlate, correlateSeparable } from '../../../shared/vision/convolve';
import { gradient } from '../../../shared/vision/gradient';
import type { RawPhoto } from '../../../shared/vision/image';
import { measurePixels, regionSpans, spanPixelCount } from '../../../shared/vision/gauges';
import { runRule } from '../../../shared/vision/pipeline';
import { gaussianGradient } from '../../../shared/vision/smoothed-gradient';
import { gaussianSecondDerivativeWeights, gaussianWeights, kernelFromMatrix, SCHARR_SMOOTHING, SOBEL_SMOOTHING, PREWITT_SMOOTHING } from '../../../shared/vision/kernels';
import { laplacian, laplacianOfGaussian } from '../../../shared/vision/laplacian';
import { qualityFigures } from '../../../shared/vision/quality';
import { gaussianBlur } from '../../../shared/vision/smoothing';
import { bitsOf, borderMode, float32Tolerance, imageSize, l1, largestDifference, largestMagnitude, onBoth, onEngine, sampleImage, sampleKind, seed, type SampleKind } from './engines';
import { seededRandom } from './images';

const RUNS = { numRuns: 150 };
const weight = fc.integer({ min: -40, max: 40 }).map((v) => v / 8);
const oddLength = fc.constantFrom(1, 3, 5, 7, 9, 13);
const weights = (n: number) => fc.array(weight, { minLength: n, maxLength: n });

test('separable correlation: SIMD within float32 rounding of plain, any column and row (symmetric or not), with an offset', () => {
  fc.assert(
    fc.property(imageSize, sampleKind, seed, borderMode, oddLength.chain(weights), oddLength.chain(weights), weight, ([w, h], kind, s, border, column, row, offset) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => correlateSeparable(image, column, row, border, undefined, offset));
      const magnitude = l1(column) * l1(row) * largestMagnitude(image.data) + Math.abs(offset);
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(column.length + row.length, magnitude));
    }),
    RUNS,
  );
});

test('symmetric separable kernels (radius 1 columns first, 2 and more through the ring of filtered rows) agree within float32 rounding', () => {
  fc.assert(
    fc.property(imageSize, sampleKind, seed, borderMode, fc.integer({ min: 0, max: 6 }).chain((r) => weights(r + 1)), ([w, h], kind, s, border, half) => {
      const symmetric = [...half.slice(1).reverse(), ...half];
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => correlateSeparable(image, symmetric, symmetric, border));
      const magnitude = l1(symmetric) ** 2 * largestMagnitude(image.data);
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(2 * symmetric.length, magnitude));
    }),
    RUNS,
  );
});

test('a symmetric column of radius 2 or more (rows filtered first into a ring) with any row: short, long or not symmetric, with an offset, within float32 rounding of plain', () => {
  // The row kernel's ways through the SIMD kernel: a symmetric radius of 1 to 9 read in place but
  // for its ends, and any other row through a padded copy; widths across both ends' copies.
  // Reference: the plain engine (double precision, rounded once; held to OpenCV's filters in
  // opencv-reference.test.ts); the bound is float32Tolerance's γₙ (Higham §3.1, from memory).
  const halfColumn = fc.integer({ min: 3, max: 10 }).chain((n) => weights(n));
  const row = fc.oneof(
    fc.integer({ min: 1, max: 13 }).chain((n) => weights(n)).map((half) => [...half.slice(1).reverse(), ...half]),
    oddLength.chain(weights),
  );
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 20, max: 90 }), fc.integer({ min: 1, max: 30 })));
  fc.assert(
    fc.property(size, sampleKind, seed, borderMode, halfColumn, row, weight, ([w, h], kind, s, border, half, rowWeights, offset) => {
      const column = [...half.slice(1).reverse(), ...half];
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => correlateSeparable(image, column, rowWeights, border, undefined, offset));
      const magnitude = l1(column) * l1(rowWeights) * largestMagnitude(image.data) + Math.abs(offset);
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(column.length + rowWeights.length, magnitude));
    }),
    RUNS,
  );
});

test('Gaussian blur of images wider than the ring of filtered rows takes (4096): the columns-first way, within float32 rounding of plain', () => {
  // 4096 wide still goes through the ring; wider images go the columns-first way, whose radii 1, 2
  // and 3 (σ 0.3, 0.6 and 1) have loops of their own, and longer columns go in sweeps of pairs.
  // Reference and bound as in the test above: the plain engine, float32Tolerance.
  const cases: [number, number, number][] = [[4096, 3, 3], [4099, 5, 3], [4101, 4, 1.5], [4097, 6, 1], [4103, 5, 0.6], [4098, 4, 0.3]];
  cases.forEach(([w, h, sigma], i) => {
    const image = sampleImage(w, h, i % 2 === 0 ? 'signed float' : '16-bit', 90 + i);
    const border = (['reflect', 'replicate', 'constant'] as const)[i % 3];
    const { plain, simd } = onBoth(() => gaussianBlur(image, sigma, border));
    const taps = gaussianWeights(sigma).length;
    expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(2 * taps, largestMagnitude(image.data)));
  });
});

test('Gaussian and gradient in one sweep on an image wider than the ring takes: the same bits and range as the two SIMD steps in turn', () => {
  const image = sampleImage(4099, 7, 'signed float', 97);
  for (const sigma of [1, 2.5]) {
    const stepRange = { min: NaN, max: NaN };
    const sweptRange = { min: NaN, max: NaN };
    const { steps, swept } = onEngine('simd', () => ({
      steps: gradient(gaussianBlur(image, sigma, 'reflect'), 'sobel', 'magnitude', 'reflect', undefined, stepRange),
      swept: gaussianGradient(image, sigma, 'sobel', 'magnitude', 'reflect', undefined, sweptRange),
    }));
    expect(bitsOf(swept)).toEqual(bitsOf(steps));
    expect(sweptRange).toEqual(stepRange);
  }
});

test('non-separable kernels from 11×11 go through the FFT in 128×128 tiles: SIMD within the float32 FFT bound of plain', () => {
  // Higham, Accuracy and Stability of Numerical Algorithms (2nd ed.), §24.1: a radix-2 FFT of m points
  // computed in floating point has a 2-norm relative error of at most log₂(m)·η/(1 − log₂(m)·η),
  // η = μ + γ₄(√2 + μ), μ the twiddles' error (here one rounding). Forward, product and inverse give
  // |error of one output| ≤ ‖error‖₂ ≤ (3·log₂(m)·η + u)·‖k‖₁·‖tile‖₂, and a tile (two image tiles as
  // real and imaginary parts) has ‖tile‖₂ ≤ √2·128·max|x|. Structural mistakes (alignment, border,
  // flip, a tile's edge) give errors of the outputs' own size, far above this bound.
  const u = 2 ** -24;
  const eta = u + (4 * u) / (1 - 4 * u) * (Math.SQRT2 + u);
  const logM = Math.log2(128 * 128);
  const fftFactor = 3 * logM * eta / (1 - logM * eta) + u;
  const kernel = fc
    .constantFrom([11, 11], [13, 11], [9, 15], [15, 15], [31, 31])
    .chain(([rows, cols]) => fc.tuple(fc.constant(rows), fc.constant(cols), weights(rows * cols), fc.constantFrom(1, 16), weight));
  fc.assert(
    fc.property(fc.tuple(fc.integer({ min: 1, max: 300 }), fc.integer({ min: 1, max: 160 })), sampleKind, seed, borderMode, kernel, ([w, h], kind, s, border, [rows, cols, flat, divisor, offset]) => {
      const matrix = Array.from({ length: rows }, (_, j) => flat.slice(j * cols, (j + 1) * cols));
      matrix[0][0] += 0.375;
      const image = sampleImage(w, h, kind, s);
      const k = kernelFromMatrix(matrix, divisor, offset);
      const { plain, simd } = onBoth(() => correlate(image, k, border));
      const bound = fftFactor * (l1(matrix.flat()) / divisor) * Math.SQRT2 * 128 * largestMagnitude(image.data);
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(bound + float32Tolerance(2, largestMagnitude(plain.data) + Math.abs(offset)));
    }),
    { numRuns: 40 },
  );
});

test('a NaN or an infinity keeps a large kernel on the direct path: it reaches only the outputs whose window holds it', () => {
  const image = sampleImage(60, 50, '8-bit', 7);
  image.data[25 * 60 + 30] = NaN;
  // No zero weight: 0·NaN is NaN, and the engines differ in whether they multiply by a zero weight at all.
  const matrix = Array.from({ length: 11 }, (_, j) => Array.from({ length: 11 }, (_, i) => ((i * 7 + j * 3) % 5) - 2.25 + (i === j ? 1 : 0)));
  const { plain, simd } = onBoth(() => correlate(image, kernelFromMatrix(matrix), 'reflect'));
  expect(Number.isNaN(simd.data[0])).toBe(false);
  expect(Number.isNaN(simd.data[25 * 60 + 30])).toBe(true);
  expect(simd.data.map((v) => +Number.isNaN(v))).toEqual(plain.data.map((v) => +Number.isNaN(v)));
});

test('Gaussian blur: SIMD within float32 rounding of plain for sigma 0.3 to 4', () => {
  fc.assert(
    fc.property(imageSize, sampleKind, seed, borderMode, fc.double({ min: 0.3, max: 4, noNaN: true }), ([w, h], kind, s, border, sigma) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => gaussianBlur(image, sigma, border));
      const taps = gaussianWeights(sigma).length;
      // The weights sum to 1: Σ|wᵢ·xᵢ| ≤ max |x| per pass.
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(2 * taps, largestMagnitude(image.data)));
    }),
    RUNS,
  );
});

test('Gaussian blur of images wider than the SIMD column pass\'s strips of 512 columns (radius above 3): within float32 rounding of plain', () => {
  // Widths with whole strips, a part strip and columns past the last whole vector; every strip must
  // take every sweep of pairs of taps, so a skipped or misplaced one would leave errors of the
  // samples' size, not of their rounding.
  const cases: [number, number, number][] = [[1031, 9, 1.5], [2053, 7, 3], [515, 12, 4], [1024, 5, 2.2]];
  cases.forEach(([w, h, sigma], i) => {
    const image = sampleImage(w, h, i % 2 === 0 ? '8-bit' : 'signed float', 70 + i);
    const border = (['reflect', 'replicate', 'constant'] as const)[i % 3];
    const { plain, simd } = onBoth(() => gaussianBlur(image, sigma, border));
    const taps = gaussianWeights(sigma).length;
    expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(2 * taps, largestMagnitude(image.data)));
  });
});

test('direct correlation of non-separable kernels up to 9×9 (the 3×3 kernel and the general loop): SIMD within float32 rounding', () => {
  const kernel = fc
    .tuple(fc.constantFrom(1, 3, 5, 9), fc.constantFrom(1, 3, 5, 7))
    .chain(([rows, cols]) => fc.tuple(fc.constant(rows), fc.constant(cols), weights(rows * cols), fc.constantFrom(1, 3, 16), weight));
  fc.assert(
    fc.property(imageSize, sampleKind, seed, borderMode, kernel, ([w, h], kind, s, border, [rows, cols, flat, divisor, offset]) => {
      const matrix = Array.from({ length: rows }, (_, j) => flat.slice(j * cols, (j + 1) * cols));
      // A rank-1 matrix would take the separable path; this test is about the direct one.
      matrix[0][0] += 0.375;
      const image = sampleImage(w, h, kind, s);
      const k = kernelFromMatrix(matrix, divisor, offset);
      const { plain, simd } = onBoth(() => correlate(image, k, border));
      const magnitude = (l1(matrix.flat()) / divisor) * largestMagnitude(image.data) + Math.abs(offset);
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(rows * cols + 2, magnitude));
    }),
    RUNS,
  );
});

const OPERATORS = { sobel: SOBEL_SMOOTHING, scharr: SCHARR_SMOOTHING, prewitt: PREWITT_SMOOTHING } as const;

test('Sobel, Scharr and Prewitt x, y and magnitude: SIMD within float32 rounding, and the magnitude range handed on is the output range', () => {
  fc.assert(
    fc.property(
      imageSize,
      sampleKind,
      seed,
      borderMode,
      fc.constantFrom('sobel', 'scharr', 'prewitt' as const),
      fc.constantFrom('x', 'y', 'magnitude' as const),
      ([w, h], kind, s, border, operator, output) => {
        const image = sampleImage(w, h, kind, s);
        const range = { min: NaN, max: NaN };
        const plain = onBoth(() => gradient(image, operator, output, border)).plain;
        const simd = onBoth(() => gradient(image, operator, output, border, undefined, range)).simd;
        // One derivative: two smoothings of three taps; the magnitude adds squares and a root.
        const [a, b] = OPERATORS[operator];
        const magnitude = 2 * (2 * a + b) * largestMagnitude(image.data);
        const operations = output === 'magnitude' ? 24 : 8;
        expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(operations, output === 'magnitude' ? 2 * magnitude : magnitude));
        if (output === 'magnitude') {
          expect(range.min).toBe(Math.min(...simd.data));
          expect(range.max).toBe(Math.max(...simd.data));
        } else {
          expect(range).toEqual({ min: NaN, max: NaN });
        }
      },
    ),
    RUNS,
  );
});

test('Sobel on the SIMD engine, inside the image: the float32 evaluation of its definition in the kernel\'s order, bit for bit', () => {
  // Sobel's 3×3 operator as [1 2 1]ᵀ smoothing times [−1 0 1] difference (the kernel OpenCV's Sobel
  // documentation gives, which opencv-reference.test.ts checks the engine against; common practice):
  // s = (up + down) + 2·centre down the column, t = down − up; gx = s(x+1) − s(x−1),
  // gy = (t(x−1) + t(x+1)) + 2·t(x), magnitude √(gx² + gy²), every operation rounded to float32.
  // A double square root of a float32, rounded to float32, is the float32 square root (double
  // rounding is innocuous when the wider format has at least 2p + 2 bits: Figueroa 1995, from memory).
  const f = Math.fround;
  fc.assert(
    fc.property(imageSize, sampleKind, seed, fc.constantFrom('x', 'y', 'magnitude' as const), ([w, h], kind, s, output) => {
      fc.pre(w >= 3 && h >= 3);
      const image = sampleImage(w, h, kind, s);
      const at = (x: number, y: number) => image.data[y * w + x];
      const sm = (x: number, y: number) => f(f(at(x, y - 1) + at(x, y + 1)) + f(2 * at(x, y)));
      const df = (x: number, y: number) => f(at(x, y + 1) - at(x, y - 1));
      const simd = onEngine('simd', () => gradient(image, 'sobel', output, 'reflect'));
      for (let y = 1; y < h - 1; y++) {
        for (let x = 1; x < w - 1; x++) {
          const gx = f(sm(x + 1, y) - sm(x - 1, y));
          const gy = f(f(df(x - 1, y) + df(x + 1, y)) + f(2 * df(x, y)));
          const expected = output === 'x' ? gx : output === 'y' ? gy : f(Math.sqrt(f(f(gx * gx) + f(gy * gy))));
          if (!Object.is(simd.data[y * w + x], expected)) expect({ x, y, value: simd.data[y * w + x] }).toEqual({ x, y, value: expected });
        }
      }
    }),
    RUNS,
  );
});

test('Gaussian and gradient in one sweep: the same bits and magnitude range as the two SIMD steps in turn (radius 1 to 12, every border)', () => {
  fc.assert(
    fc.property(
      imageSize,
      fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float', 'awkward'),
      seed,
      borderMode,
      fc.oneof(fc.constantFrom(0.3, 0.5, 1), fc.double({ min: 0.3, max: 4, noNaN: true })),
      fc.constantFrom('sobel', 'scharr', 'prewitt' as const),
      fc.constantFrom('x', 'y', 'magnitude' as const),
      ([w, h], kind, s, border, sigma, operator, output) => {
        const image = sampleImage(w, h, kind, s);
        const stepRange = { min: NaN, max: NaN };
        const sweptRange = { min: NaN, max: NaN };
        const { steps, swept } = onEngine('simd', () => ({
          steps: gradient(gaussianBlur(image, sigma, border), operator, output, border, undefined, stepRange),
          swept: gaussianGradient(image, sigma, operator, output, border, undefined, sweptRange),
        }));
        expect(bitsOf(swept)).toEqual(bitsOf(steps));
        expect(sweptRange).toEqual(stepRange);
      },
    ),
    RUNS,
  );
});

test('a rule run that keeps no intermediate image sweeps Gaussian and gradient together: the same outputs, measurements and verdict as one that keeps them all', () => {
  const rule = {
    format: 'kernwright-rule/1',
    name: 'Edges',
    border: 'replicate',
    steps: [
      { op: 'gaussian', sigma: 1.2 },
      { op: 'gradient', operator: 'sobel', output: 'magnitude' },
      { op: 'threshold', method: 'otsu' },
      { op: 'open', radius: 1 },
      { op: 'gaussian', sigma: 0.7 },
      { op: 'gradient', operator: 'scharr', output: 'x' },
    ],
    gauges: [
      { name: 'share', measure: 'edge-fraction', step: 4, limits: { max: 0.5 } },
      { name: 'mean', measure: 'mean', limits: { min: -1, max: 1 } },
    ],
  };
  fc.assert(
    fc.property(imageSize, seed, ([w, h], s) => {
      const rand = seededRandom(s);
      const photo: RawPhoto = { width: w, height: h, channels: 1, bitDepth: 8, samples: Uint8Array.from({ length: w * h }, () => Math.floor(rand() * 256)) };
      const { kept, swept } = onEngine('simd', () => ({ kept: runRule(rule, photo, { retain: 'all' }), swept: runRule(rule, photo, { retain: 'gauged' }) }));
      expect(swept.verdict).toBe(kept.verdict);
      expect(swept.measurements).toEqual(kept.measurements);
      for (const index of [4, 6]) expect(bitsOf(swept.steps[index - 1].output!)).toEqual(bitsOf(kept.steps[index - 1].output!));
      // The Gaussians ran inside the gradients: no image of theirs, and their time in the gradient's.
      for (const index of [1, 5]) expect({ output: swept.steps[index - 1].output, ms: swept.steps[index - 1].ms }).toEqual({ output: null, ms: 0 });
    }),
    { numRuns: 60 },
  );
});

test('the gradient direction runs the plain code on both engines: identical bits', () => {
  fc.assert(
    fc.property(imageSize, sampleKind, seed, borderMode, ([w, h], kind, s, border) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => gradient(image, 'sobel', 'direction', border));
      expect(Array.from(simd.data)).toEqual(Array.from(plain.data));
    }),
    { numRuns: 30 },
  );
});

test('4- and 8-neighbour Laplacian: SIMD within float32 rounding (exact for 8- and 16-bit samples, whose sums are whole numbers below 2²⁴)', () => {
  fc.assert(
    fc.property(imageSize, sampleKind, seed, borderMode, fc.constantFrom(4, 8 as const), ([w, h], kind, s, border, neighbours) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => laplacian(image, neighbours, border));
      const tolerance = kind === 'signed float' ? float32Tolerance(9, 2 * neighbours * largestMagnitude(image.data)) : 0;
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(tolerance);
    }),
    RUNS,
  );
});

test('Laplacian of Gaussian: SIMD within float32 rounding of plain', () => {
  fc.assert(
    fc.property(imageSize, sampleKind, seed, borderMode, fc.double({ min: 0.5, max: 2.5, noNaN: true }), ([w, h], kind, s, border, sigma) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => laplacianOfGaussian(image, sigma, border));
      const g = gaussianWeights(sigma);
      const g2 = gaussianSecondDerivativeWeights(sigma);
      const magnitude = 2 * l1(g) * l1(g2) * largestMagnitude(image.data);
      expect(largestDifference(simd.data, plain.data)).toBeLessThanOrEqual(float32Tolerance(4 * g.length, magnitude));
    }),
    RUNS,
  );
});

test('quality gate: clipped share exact; mean and focus the same per-pixel terms in double precision, summed in another order', () => {
  fc.assert(
    fc.property(imageSize, fc.constantFrom('8-bit', '16-bit', 'signed float' as const), seed, ([w, h], kind, s) => {
      const image = sampleImage(w, h, kind, s);
      const bitDepth = kind === '16-bit' ? 16 : 8;
      const { plain, simd } = onBoth(() => qualityFigures(image, bitDepth));
      expect(simd.clipped).toBe(plain.clipped);
      // Double-precision sums of n terms in two orders: within n·2⁻⁵³ of the sum of magnitudes (Higham §3.1, from memory).
      const n = w * h;
      const doubleBound = (sumOfMagnitudes: number) => 2 * n * 2 ** -53 * sumOfMagnitudes;
      const largest = largestMagnitude(image.data);
      expect(Math.abs(simd.mean - plain.mean)).toBeLessThanOrEqual(doubleBound(largest));
      expect(Math.abs(simd.focus - plain.focus)).toBeLessThanOrEqual(doubleBound((8 * largest) ** 2) * 4);
    }),
    RUNS,
  );
});

test('mean, standard deviation, minimum and maximum gauges: extremes exact, sums in another order within double rounding', () => {
  const region = fc.oneof(
    fc.constant(undefined),
    fc.record({ shape: fc.constant('rect' as const), x: fc.double({ min: 0, max: 0.5, noNaN: true }), y: fc.double({ min: 0, max: 0.5, noNaN: true }), w: fc.double({ min: 0.05, max: 0.5, noNaN: true }), h: fc.double({ min: 0.05, max: 0.5, noNaN: true }) }),
    fc.record({ shape: fc.constant('circle' as const), cx: fc.double({ min: 0.2, max: 0.8, noNaN: true }), cy: fc.double({ min: 0.2, max: 0.8, noNaN: true }), r: fc.double({ min: 0.05, max: 0.5, noNaN: true }) }),
  );
  fc.assert(
    fc.property(imageSize, fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float'), seed, region, ([w, h], kind, s, shape) => {
      const image = sampleImage(w, h, kind, s);
      const spans = regionSpans(w, h, shape);
      const n = spanPixelCount(spans);
      const { plain, simd } = onBoth(() => Object.fromEntries((['mean', 'stddev', 'min', 'max'] as const).map((m) => [m, measurePixels(image, m, spans)])));
      if (n === 0) {
        for (const m of ['mean', 'stddev', 'min', 'max']) expect(Number.isNaN(simd[m])).toBe(true);
        return;
      }
      // The extremes are selected, not computed (±0 compare equal).
      expect(simd.min === plain.min).toBe(true);
      expect(simd.max === plain.max).toBe(true);
      // A sum of n doubles in any order: within 2·n·2⁻⁵³·Σ|v| (Higham §4.2), per pixel for the mean.
      const largest = largestMagnitude(image.data);
      expect(Math.abs(simd.mean - plain.mean)).toBeLessThanOrEqual(2 * n * 2 ** -53 * largest);
      expect(Math.abs(simd.stddev - plain.stddev)).toBeLessThanOrEqual(1e-9 * (largest + 1));
    }),
    RUNS,
  );
});

test('gauges over a region holding NaN: the mean is NaN on both engines and the extremes leave NaN out', () => {
  const image = sampleImage(40, 30, 'signed float', 3);
  image.data[15 * 40 + 7] = NaN;
  const spans = regionSpans(40, 30, undefined);
  const { plain, simd } = onBoth(() => ({ mean: measurePixels(image, 'mean', spans), min: measurePixels(image, 'min', spans), max: measurePixels(image, 'max', spans) }));
  expect(Number.isNaN(simd.mean) && Number.isNaN(plain.mean)).toBe(true);
  expect(simd.min).toBe(plain.min);
  expect(simd.max).toBe(plain.max);
  expect(Number.isNaN(simd.max)).toBe(false);
});
