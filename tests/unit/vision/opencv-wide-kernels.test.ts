// The direct path's unrolled and grouped kernel rows, the FFT in tiles that large kernels take,
// and the one-sweep Laplacian of Gaussian, against an outside reference: @techstark/opencv-js 4.5.2
// (OpenCV 4.5.1, WebAssembly) filter2D and sepFilter2D on CV_32F, every border mode.
import type { BorderMode } from '../../../shared/rules/schema';
import { correlate, correlateDirect } from '../../../shared/vision/convolve';
import { gaussianSecondDerivativeWeights, gaussianWeights, kernelFromMatrix } from '../../../shared/vision/kernels';
import { laplacianOfGaussian } from '../../../shared/vision/laplacian';
import { partImage } from './images';
import { CV_BORDER, loadOpenCv, matToFloat, maxAbsDiff, toMat32, type OpenCv } from './opencv';
import { ENGINES, useEngine } from './engines';

let cv: OpenCv;
beforeAll(async () => {
  ({ cv } = await loadOpenCv());
}, 30000);

const BORDERS: BorderMode[] = ['reflect', 'replicate', 'constant'];

/** A non-separable kernel with some zero weights: rows × cols. */
function kernelMatrix(rows: number, cols: number): number[][] {
  return Array.from({ length: rows }, (_, j) => Array.from({ length: cols }, (_, i) => ((i * 7 + j * 3) % 5) - 2 + (i === j ? 1 : 0)));
}

// Every check runs on both engines: the plain TypeScript path and the WebAssembly SIMD kernels.
describe.each(ENGINES)('on the %s engine', (engine) => {
  useEngine(engine);

  describe.each(BORDERS)('with the %s border', (border) => {
    test.each([
      [3, 1],
      [1, 3],
      [5, 7],
      [9, 9],
      [3, 11],
      [15, 15],
      [5, 17],
      // From 11×11 the SIMD engine correlates through the FFT in 128×128 tiles.
      [11, 11],
      [31, 31],
    ])('a %ix%i kernel matches OpenCV filter2D', (rows, cols) => {
      const image = partImage(41, 29, 65535, rows * 31 + cols);
      const matrix = kernelMatrix(rows, cols);
      const ours = correlateDirect(image, kernelFromMatrix(matrix, 3, 1.5), border);
      const src = toMat32(cv, image);
      const dst = new cv.Mat();
      const k = cv.matFromArray(rows, cols, cv.CV_32F, matrix.flat().map((v) => v / 3));
      // OpenCV 4.5.1 filter2D: correlation, dst = Σ kernel·src + delta.
      cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), 1.5, CV_BORDER[border]);
      const expected = matToFloat(cv, dst);
      [src, dst, k].forEach((m) => m.delete());
      const scale = expected.reduce((m, v) => Math.max(m, Math.abs(v)), 1);
      // Float32 results: agreement to a few float32 ulps of the largest value (OpenCV sums in float32).
      expect(maxAbsDiff(ours.data, expected)).toBeLessThanOrEqual(2e-6 * scale * 8);
    });
  });

  // The engine's choice: the FFT in 128×128 tiles from 11×11 weights on both engines.
  describe.each(BORDERS)('with the %s border, on an image of several FFT tiles', (border) => {
    test.each([
      [7, 7],
      [9, 9],
      [11, 13],
      [15, 15],
      [31, 31],
    ])('a %ix%i kernel matches OpenCV filter2D across tile edges', (rows, cols) => {
      const image = partImage(301, 257, 255, rows + cols);
      const matrix = kernelMatrix(rows, cols);
      const ours = correlate(image, kernelFromMatrix(matrix, 7, -2), border);
      const src = toMat32(cv, image);
      const dst = new cv.Mat();
      const k = cv.matFromArray(rows, cols, cv.CV_32F, matrix.flat().map((v) => v / 7));
      cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), -2, CV_BORDER[border]);
      const expected = matToFloat(cv, dst);
      [src, dst, k].forEach((m) => m.delete());
      const scale = expected.reduce((m, v) => Math.max(m, Math.abs(v)), 1);
      expect(maxAbsDiff(ours.data, expected)).toBeLessThanOrEqual(2e-6 * scale * 8);
    });
  });

  describe.each(BORDERS)('Laplacian of Gaussian with the %s border', (border) => {
    test.each([0.5, 1.4, 2.2])('sigma %p equals OpenCV sepFilter2D(g″ across, g down) + sepFilter2D(g across, g″ down)', (sigma) => {
      const image = partImage(37, 23, 255, 21);
      const ours = laplacianOfGaussian(image, sigma, border);
      const g = Array.from(gaussianWeights(sigma));
      const g2 = Array.from(gaussianSecondDerivativeWeights(sigma));
      const src = toMat32(cv, image);
      const across = new cv.Mat();
      const down = new cv.Mat();
      const sum = new cv.Mat();
      const kg = cv.matFromArray(1, g.length, cv.CV_32F, g);
      const kg2 = cv.matFromArray(1, g2.length, cv.CV_32F, g2);
      const anchor = new cv.Point(-1, -1);
      // sepFilter2D(src, dst, depth, kernelX, kernelY, anchor, delta, border): correlation, X along rows.
      cv.sepFilter2D(src, across, cv.CV_32F, kg2, kg, anchor, 0, CV_BORDER[border]);
      cv.sepFilter2D(src, down, cv.CV_32F, kg, kg2, anchor, 0, CV_BORDER[border]);
      cv.add(across, down, sum);
      const expected = matToFloat(cv, sum);
      [src, across, down, sum, kg, kg2].forEach((m) => m.delete());
      const scale = expected.reduce((m, v) => Math.max(m, Math.abs(v)), 1);
      // OpenCV sums in float32 with float32 weights; ours in double: a few float32 ulps of the largest value.
      expect(maxAbsDiff(ours.data, expected)).toBeLessThanOrEqual(1e-5 * scale);
    });
  });
});
