// The plain engine's generated kernel loops (kernel-loops.ts) against its general loops: the same
// sums in the same order, so the same float32 bits, for direct kernels (zero taps, weights ±1 and ±2
// written without multiplication, rows of zeros) and symmetric separable kernels (radius 0 to 12,
// Gaussians), every border mode, 8- and 16-bit and signed float images of odd sizes, including images
// narrower than one iteration and shorter than one column loop. Outside references for the same code
// are in plain-separable.test.ts (the definition, term by term) and opencv-reference.test.ts
// (OpenCV.js filter2D and GaussianBlur), which run with the generated loops on.
import fc from 'fast-check';
import { correlateDirect, correlateSeparable } from '../../../shared/vision/convolve';
import { imageFromSamples, type Image } from '../../../shared/vision/image';
import { directRowLoop, kernelLoopsEnabled, MOST_GENERATED_TAPS, setKernelLoops, symmetricColumnLoop } from '../../../shared/vision/kernel-loops';
import { gaussianWeights, kernelFromMatrix } from '../../../shared/vision/kernels';
import { laplacianOfGaussian, laplacianOfGaussianSweep } from '../../../shared/vision/laplacian';
import { medianFilter } from '../../../shared/vision/median';
import { boxFilter } from '../../../shared/vision/smoothing';
import { thresholdAdaptiveMean } from '../../../shared/vision/threshold';
import { gaussianGradient } from '../../../shared/vision/smoothed-gradient';
import { bitsOf, borderMode, imageSize, onEngine, sampleImage, seed, type SampleKind } from './engines';
import { cancellingImage } from './images';

/** fn's output with the generated loops has the same float32 bits as with the general loops. */
function expectSameBits(fn: () => Image): void {
  const { generated, general } = generatedAndGeneral(fn);
  expect(bitsOf(generated)).toEqual(bitsOf(general));
}

/** fn with the generated loops, then with the general loops. */
function generatedAndGeneral(fn: () => Image): { generated: Image; general: Image } {
  const generated = onEngine('plain', fn);
  setKernelLoops(false);
  try {
    return { generated, general: onEngine('plain', fn) };
  } finally {
    setKernelLoops(true);
  }
}

/** cancellingImage's values, one per row: a vertical sum's order then shows through a horizontal pass of any weights. */
function cancellingRows(width: number, height: number, s: number): Image {
  const rows = cancellingImage(1, height, s).data;
  return imageFromSamples(width, height, Array.from({ length: width * height }, (_, i) => rows[Math.floor(i / width)]));
}

type TestKind = SampleKind | 'cancelling' | 'cancelling rows';
const imageKind = fc.constantFrom<TestKind>('8-bit', '16-bit', 'signed float', 'cancelling', 'cancelling', 'cancelling rows');

function testImage(width: number, height: number, kind: TestKind, s: number): Image {
  if (kind === 'cancelling') return cancellingImage(width, height, s);
  if (kind === 'cancelling rows') return cancellingRows(width, height, s);
  return sampleImage(width, height, kind, s);
}

/** Test images of those kinds at these sizes (width, height). */
const imagesOf = (sizes: fc.Arbitrary<readonly number[]>) => fc.tuple(sizes, imageKind, seed).map(([[w, h], kind, s]) => testImage(w, h, kind, s));
/** Any size, or tall enough for the column loops' twelve rows and the kernels' reach. */
const tallOrAny = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 1, max: 30 }), fc.integer({ min: 20, max: 70 })));

/** Weights the generated code writes differently (0, ±1, ±2) among ordinary ones. */
const weight = fc.oneof(fc.constantFrom(0, 0, 1, -1, 2, -2, -0), fc.integer({ min: -40, max: 40 }).map((v) => v / 8), fc.double({ min: -5, max: 5, noNaN: true }));

const directKernel = fc
  .tuple(fc.constantFrom(1, 3, 5, 7), fc.constantFrom(1, 3, 5, 7))
  .chain(([rows, cols]) => fc.array(fc.array(weight, { minLength: cols, maxLength: cols }), { minLength: rows, maxLength: rows }));

const symmetric = (radius: number) => fc.array(weight, { minLength: radius + 1, maxLength: radius + 1 }).map((half) => [...half.slice(1).reverse(), ...half]);

test('the generated loops are on where the runtime compiles code (Node does)', () => {
  expect(kernelLoopsEnabled()).toBe(true);
  expect(directRowLoop([1, 2, 1], 1, 3, true)).not.toBeNull();
  expect(symmetricColumnLoop([1, 2, 1])).not.toBeNull();
  // A weight that cannot be written as a literal, and kernels too large for them, keep the general loop.
  expect(directRowLoop([1, Infinity, 1], 1, 3, true)).toBeNull();
  expect(symmetricColumnLoop([NaN, 1, NaN])).toBeNull();
  expect(directRowLoop(new Array(MOST_GENERATED_TAPS + 2).fill(1), 1, MOST_GENERATED_TAPS + 2, true)).toBeNull();
});

test('generated direct correlation gives the general loop’s bits: zero taps, ±1, ±2, any size up to 7×7, divisor and offset', () => {
  fc.assert(
    fc.property(imagesOf(imageSize), borderMode, directKernel, fc.integer({ min: 1, max: 9 }), fc.constantFrom(0, -0, 0.5, -3), (image, border, matrix, divisor, offset) => {
      const kernel = kernelFromMatrix(matrix, divisor, offset);
      expectSameBits(() => correlateDirect(image, kernel, border));
    }),
    { numRuns: 300 },
  );
});

test('generated separable passes give the general loops’ bits: symmetric kernels of radius 0 to 12, tall and short images', () => {
  fc.assert(
    fc.property(
      imagesOf(tallOrAny),
      borderMode,
      fc.integer({ min: 0, max: 12 }).chain(symmetric),
      fc.integer({ min: 0, max: 12 }).chain(symmetric),
      fc.constantFrom(0, 0.25, -2),
      (image, border, column, row, offset) => {
        expectSameBits(() => correlateSeparable(image, column, row, border, undefined, offset));
      },
    ),
    { numRuns: 300 },
  );
});

test('the Gaussians of the rule format (σ 0.5 to 5) and the Gaussian → Sobel sweep give the general loops’ bits', () => {
  fc.assert(
    fc.property(
      imagesOf(fc.tuple(fc.integer({ min: 1, max: 45 }), fc.integer({ min: 1, max: 60 }))),
      borderMode,
      fc.constantFrom(0.5, 0.8, 1, 1.4, 2, 3, 5),
      (image, border, sigma) => {
        const g = gaussianWeights(sigma);
        expectSameBits(() => correlateSeparable(image, g, g, border));
        expectSameBits(() => gaussianGradient(image, sigma, 'sobel', 'magnitude', border));
      },
    ),
    { numRuns: 150 },
  );
});

test('the generated running-histogram median gives the general loop’s values: 8- and 16-bit images, windows 5 to 11', () => {
  fc.assert(
    fc.property(imageSize, fc.constantFrom<SampleKind>('8-bit', '16-bit', 'mask'), seed, borderMode, fc.constantFrom(5, 7, 9, 11), ([w, h], kind, s, border, size) => {
      const image = sampleImage(w, h, kind, s);
      expectSameBits(() => medianFilter(image, size, border));
    }),
    { numRuns: 150 },
  );
});

test('the generated Laplacian-of-Gaussian sweep gives the general loops’ bits: symmetric g and g″ of radius 1 to 9, and the LoG of σ 0.5 to 3', () => {
  fc.assert(
    fc.property(
      imagesOf(tallOrAny),
      borderMode,
      fc.integer({ min: 1, max: 9 }).chain((r) => fc.tuple(symmetric(r), symmetric(r))),
      fc.constantFrom(0.5, 1, 1.4, 2, 3),
      (image, border, [g, g2], sigma) => {
        expectSameBits(() => laplacianOfGaussianSweep(image, Float64Array.from(g), Float64Array.from(g2), border));
        expectSameBits(() => laplacianOfGaussian(image, sigma, border));
      },
    ),
    { numRuns: 200 },
  );
});

test('the LoG sweep adds its vertical sums in the general loop’s order: 1 + 2⁶⁰ − 2⁶⁰ is 0 that way, 1 the other', () => {
  // Rows repeating −2⁶⁰, 2⁶⁰, 1, 0, 0: at each centre row 1 the pairs are 2⁶⁰ and −2⁶⁰, and the centre
  // term added first is lost in the first of them (double precision keeps 53 bits).
  const pattern = [-(2 ** 60), 2 ** 60, 1, 0, 0];
  const image = imageFromSamples(3, 40, Array.from({ length: 120 }, (_, i) => pattern[Math.floor(i / 3) % 5]));
  const g = Float64Array.of(1, 1, 1, 1, 1);
  const g2 = Float64Array.of(0, 0, 1, 0, 0);
  const { generated, general } = generatedAndGeneral(() => laplacianOfGaussianSweep(image, g, g2, 'reflect'));
  expect(bitsOf(generated)).toEqual(bitsOf(general));
  // Row 22 (pattern index 2, the 1): smooth 0, curve 1, so the output is 0 + 1 + 2·2·1 = 5.
  expect(general.data[22 * 3 + 1]).toBe(5);
});

test('the generated box-filter row gives the general loop’s bits: means and the adaptive-mean mask, windows 1 to 31', () => {
  fc.assert(
    fc.property(
      imagesOf(fc.oneof(imageSize, fc.tuple(fc.integer({ min: 20, max: 90 }), fc.integer({ min: 1, max: 12 })))),
      borderMode,
      fc.integer({ min: 0, max: 15 }).map((r) => 2 * r + 1),
      fc.constantFrom(0, 2.5, -4),
      fc.boolean(),
      (image, border, size, c, invert) => {
        expectSameBits(() => boxFilter(image, size, border));
        expectSameBits(() => thresholdAdaptiveMean(image, size, c, border, invert));
      },
    ),
    { numRuns: 200 },
  );
});

test('an offset of −0 counts as +0: a zero sum whose sign differs between the loops comes out +0 in both', () => {
  // Found by the property test above: 5e−324·(−1)/2 rounds to −0 in one loop and sums to +0 in the
  // other; −0 + −0 would keep the one sign and not the other.
  const image = imageFromSamples(1, 1, [-1]);
  const kernel = kernelFromMatrix([[0], [5e-324], [0], [0], [0]], 2, -0);
  expect(Object.is(kernel.offset, 0)).toBe(true);
  expectSameBits(() => correlateDirect(image, kernel, 'reflect'));
  expectSameBits(() => correlateSeparable(image, [0, 5e-324, 0], [1], 'reflect', undefined, -0));
});
