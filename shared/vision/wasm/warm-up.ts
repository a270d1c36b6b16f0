// Runs every kernel on a 512×512 image right after the module is instantiated. V8 first runs
// WebAssembly through its baseline compiler and moves a function to its optimising compiler once it
// has run for a while, so without this the first photo's steps run several times slower (measured in
// Chromium: 750 ms for the first 5 MP preview update, 60 ms for the next).
import { BT601_WEIGHTS } from '../image';
import { gaussianWeights, kernelFromMatrix } from '../kernels';
import type { SimdKernels } from './simd-kernels';

const SIDE = 512;

export function warmUp(kernels: SimdKernels): void {
  const a = kernels.takeImage(SIDE, SIDE);
  const b = kernels.takeImage(SIDE, SIDE);
  const c = kernels.takeImage(SIDE, SIDE);
  const data = a.data;
  for (let p = 0; p < data.length; p++) data[p] = ((p * 7919) % 251) + (p % SIDE > SIDE / 2 ? 60 : 0);
  const range = { min: NaN, max: NaN };
  for (const sigma of [0.5, 0.8, 1, 2]) kernels.separable(a, gaussianWeights(sigma), gaussianWeights(sigma), 'reflect', b);
  kernels.separable(a, [1, 2, 1], [-1, 0, 1], 'replicate', b);
  kernels.correlate2d(a, kernelFromMatrix([[0, 1, 0], [1, -4, 1], [0, 1, 0]]), 'reflect', b);
  // On whole numbers (a) a 5×5 kernel's sums go in 16 bits; on the smoothed image (b) in float32 (3×3
  // kernels always do, as the Laplacian above).
  const fiveByFive = kernelFromMatrix([[1, 2, 0, -1, 1], [0, 3, 1, -2, 0], [2, -1, 4, 0, 1], [1, 0, -2, 3, 0], [0, 1, 1, 0, 2]]);
  kernels.correlate2d(a, fiveByFive, 'reflect', b);
  kernels.separable(a, gaussianWeights(1), gaussianWeights(1), 'reflect', b);
  kernels.correlate2d(b, fiveByFive, 'reflect', c);
  // 11×11 (non-separable) is where the FFT in tiles takes over.
  kernels.correlate2d(a, kernelFromMatrix(Array.from({ length: 11 }, (_, j) => Array.from({ length: 11 }, (_, i) => ((i * 7 + j * 3) % 5) - 2))), 'reflect', b);
  kernels.laplacianOfGaussian(a, gaussianWeights(1.4), gaussianWeights(1.4), 'reflect', b);
  kernels.gradient(a, 1, 2, 'x', 'reflect', b);
  kernels.gradient(a, 1, 2, 'y', 'reflect', b);
  kernels.gradient(a, 1, 2, 'magnitude', 'reflect', b, range);
  kernels.smoothedGradient(a, gaussianWeights(1), gaussianWeights(1), 1, 2, 'magnitude', 'reflect', b, range);
  kernels.eightBitLevels(a);
  kernels.valueRange(b);
  kernels.histogram(b, range.min, 256 / (range.max - range.min));
  // Large photos count in pairs: that path too, on this small image.
  kernels.histogram(b, range.min, 256 / (range.max - range.min), false, true);
  kernels.thresholdAt(b, (range.min + range.max) / 2, false, c, { width: SIDE, height: SIDE, wordsPerRow: SIDE / 32, words: new Int32Array((SIDE / 32) * SIDE) });
  kernels.thresholdAt(b, (range.min + range.max) / 2, false, c);
  kernels.binaryMorphology(c, 'open', 1, 'reflect', b);
  kernels.box(a, 5, 'reflect', b);
  kernels.box(a, 15, 'replicate', c, { c: 5, flip: 0 });
  kernels.median(a, 3, 'reflect', b);
  kernels.median(a, 5, 'reflect', b);
  kernels.median(a, 7, 'reflect', b);
  kernels.extreme(a, 1, 'reflect', false, b);
  kernels.extreme(a, 2, 'reflect', true, b);
  kernels.nonZeroWords(c);
  kernels.countNonZero(c, new Int32Array(SIDE), new Int32Array(SIDE).fill(SIDE));
  kernels.qualitySums(a, 255);
  kernels.lumaRgb8(new Uint8Array(3 * SIDE * SIDE).fill(99), 3, BT601_WEIGHTS, b);
  kernels.lumaRgb8(new Uint8Array(4 * SIDE * SIDE).fill(99), 4, BT601_WEIGHTS, b);
  const bytes = Uint8Array.from({ length: 3 * SIDE * SIDE }, (_, p) => (p * 7919) % 251);
  kernels.photoWithQualitySums(bytes.subarray(0, SIDE * SIDE), 1, BT601_WEIGHTS, b);
  kernels.photoWithQualitySums(bytes, 3, BT601_WEIGHTS, b);
  for (const channels of [1, 3] as const) {
    const samples = bytes.subarray(0, channels * SIDE * SIDE);
    kernels.photoQualityAndSmoothedGradient(samples, channels, BT601_WEIGHTS, gaussianWeights(1), gaussianWeights(1), 1, 2, 'magnitude', 'reflect', b, range);
    kernels.photoQualityAndSeparable(samples, channels, BT601_WEIGHTS, [1, 4, 6, 4, 1], [1, 4, 6, 4, 1], 'reflect', 0, b);
  }
  // A grey photo's input keeps its bytes, which the direct kernels read (the float32 samples later).
  const grey = bytes.subarray(0, SIDE * SIDE);
  kernels.greyQualityLater(grey, c);
  kernels.correlate2d(c, kernelFromMatrix([[0, 1, 0], [1, -4, 1], [0, 1, 0]]), 'reflect', b);
  kernels.correlate2d(c, fiveByFive, 'reflect', b);
  c.settle();
  kernels.greyInput(grey, c);
  kernels.extreme(c, 1, 'reflect', false, a, true);
  kernels.extreme(a, 2, 'reflect', true, b);
  kernels.median(c, 3, 'reflect', b);
  kernels.median(c, 5, 'reflect', b);
  for (const image of [a, b, c]) {
    image.discard();
    kernels.heap.release(image.address);
  }
}
