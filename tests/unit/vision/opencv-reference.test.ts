// The engine, on both paths (plain TypeScript and WebAssembly SIMD), against an outside reference:
// @techstark/opencv-js 4.5.2 (OpenCV 4.5.1, WebAssembly).
// Images are generated here (odd sizes, 8- and 16-bit samples); float comparisons use CV_32F mats.
import type { BorderMode } from '../../../shared/rules/schema';
import { labelBlobs } from '../../../shared/vision/blobs';
import { correlate, correlateDirect } from '../../../shared/vision/convolve';
import { gradient } from '../../../shared/vision/gradient';
import { imageFromSamples, type Image, type RawPhoto } from '../../../shared/vision/image';
import { gaussianRadius, kernelFromMatrix } from '../../../shared/vision/kernels';
import { laplacian } from '../../../shared/vision/laplacian';
import { medianFilter } from '../../../shared/vision/median';
import { morphology } from '../../../shared/vision/morphology';
import { inputChannel } from '../../../shared/vision/photo-channel';
import { boxFilter, gaussianBlur } from '../../../shared/vision/smoothing';
import { thresholdOtsu } from '../../../shared/vision/threshold';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { maskImage, partImage } from './images';
import { CV_BORDER, loadOpenCv, matToFloat, maxAbsDiff, toMat32, toMatInt, type OpenCv } from './opencv';
import { ENGINES, useEngine } from './engines';

const BORDERS: BorderMode[] = ['reflect', 'replicate', 'constant'];
const DEPTHS: (255 | 65535)[] = [255, 65535];
const W = 37;
const H = 23;

let cv: OpenCv;
beforeAll(async () => {
  ({ cv } = await loadOpenCv());
}, 30000);

/** Float32 results agree to this share of the largest magnitude (float32 rounding, summation order). */
const RELATIVE_TOLERANCE = 2e-6;

function expectClose(actual: Float32Array, expected: Float32Array): void {
  let scale = 1;
  for (let i = 0; i < expected.length; i++) scale = Math.max(scale, Math.abs(expected[i]));
  expect(maxAbsDiff(actual, expected)).toBeLessThanOrEqual(RELATIVE_TOLERANCE * scale * 8);
}

function viaOpenCv(image: Image, run: (src: OpenCv, dst: OpenCv) => void, toMat: (cv: OpenCv, image: Image) => OpenCv = toMat32): Float32Array {
  const src = toMat(cv, image);
  const dst = new cv.Mat();
  run(src, dst);
  const out = matToFloat(cv, dst);
  src.delete();
  dst.delete();
  return out;
}

// Every check runs on both engines: the plain TypeScript path and the WebAssembly SIMD kernels.
describe.each(ENGINES)('on the %s engine', (engine) => {
  useEngine(engine);

  describe.each(DEPTHS)('on %i-level samples', (maxValue) => {
    const image = partImage(W, H, maxValue, maxValue);

    describe.each(BORDERS)('with the %s border', (border) => {
      const cvBorder = CV_BORDER[border];

      test('a kernel step correlates as OpenCV filter2D does (non-separable 5x3 kernel, divisor and offset)', () => {
        const matrix = [[1, -2, 0], [3, 1, -1], [0, 2, 5], [-4, 1, 1], [2, 0, -3]];
        const divisor = 7;
        const offset = 3;
        const ours = correlate(image, kernelFromMatrix(matrix, divisor, offset), border);
        // OpenCV 4.5.1 filter2D: dst(x,y) = Σ kernel(x',y')·src(x+x'−ax, y+y'−ay) + delta (correlation).
        const expected = viaOpenCv(image, (src, dst) => {
          const k = cv.matFromArray(5, 3, cv.CV_32F, matrix.flat().map((v) => v / divisor));
          cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), offset, cvBorder);
          k.delete();
        });
        expectClose(ours.data, expected);
      });

      test('a separable kernel takes the two-pass path and still matches OpenCV filter2D', () => {
        const matrix = [[1, 2, 1], [2, 4, 2], [1, 2, 1], [0, 0, 0], [-1, -2, -1]];
        const ours = correlate(image, kernelFromMatrix(matrix, 16, 0), border);
        const expected = viaOpenCv(image, (src, dst) => {
          const k = cv.matFromArray(5, 3, cv.CV_32F, matrix.flat().map((v) => v / 16));
          cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), 0, cvBorder);
          k.delete();
        });
        expectClose(ours.data, expected);
      });

      test.each([0.5, 1, 1.7])('gaussian sigma %p matches OpenCV GaussianBlur with ksize 2*ceil(3s)+1', (sigma) => {
        const ours = gaussianBlur(image, sigma, border);
        const ksize = 2 * gaussianRadius(sigma) + 1;
        const expected = viaOpenCv(image, (src, dst) => cv.GaussianBlur(src, dst, new cv.Size(ksize, ksize), sigma, sigma, cvBorder));
        expectClose(ours.data, expected);
      });

      test.each([
        ['sobel', 'x'],
        ['sobel', 'y'],
        ['scharr', 'x'],
        ['scharr', 'y'],
      ] as const)('gradient %s %s matches OpenCV Sobel / Scharr (CV_32F, unscaled)', (operator, output) => {
        const ours = gradient(image, operator, output, border);
        const dx = output === 'x' ? 1 : 0;
        const expected = viaOpenCv(image, (src, dst) =>
          operator === 'sobel'
            ? cv.Sobel(src, dst, cv.CV_32F, dx, 1 - dx, 3, 1, 0, cvBorder)
            : cv.Scharr(src, dst, cv.CV_32F, dx, 1 - dx, 1, 0, cvBorder),
        );
        expectClose(ours.data, expected);
      });

      test('gradient magnitude equals sqrt(gx² + gy²) of OpenCV Sobel (cv.magnitude)', () => {
        const ours = gradient(image, 'sobel', 'magnitude', border);
        const expected = viaOpenCv(image, (src, dst) => {
          const gx = new cv.Mat();
          const gy = new cv.Mat();
          cv.Sobel(src, gx, cv.CV_32F, 1, 0, 3, 1, 0, cvBorder);
          cv.Sobel(src, gy, cv.CV_32F, 0, 1, 3, 1, 0, cvBorder);
          cv.magnitude(gx, gy, dst);
          gx.delete();
          gy.delete();
        });
        expectClose(ours.data, expected);
      });

      test('the 4-neighbour Laplacian matches OpenCV Laplacian with ksize=1', () => {
        const ours = laplacian(image, 4, border);
        const expected = viaOpenCv(image, (src, dst) => cv.Laplacian(src, dst, cv.CV_32F, 1, 1, 0, cvBorder));
        expectClose(ours.data, expected);
      });

      test('the 8-neighbour Laplacian matches OpenCV filter2D with [1 1 1; 1 -8 1; 1 1 1]', () => {
        const ours = laplacian(image, 8, border);
        const expected = viaOpenCv(image, (src, dst) => {
          const k = cv.matFromArray(3, 3, cv.CV_32F, [1, 1, 1, 1, -8, 1, 1, 1, 1]);
          cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), 0, cvBorder);
          k.delete();
        });
        expectClose(ours.data, expected);
      });

      test.each([3, 5, 9])('box size %i matches OpenCV blur', (size) => {
        const ours = boxFilter(image, size, border);
        const expected = viaOpenCv(image, (src, dst) => cv.blur(src, dst, new cv.Size(size, size), new cv.Point(-1, -1), cvBorder));
        expectClose(ours.data, expected);
      });

      test.each([1, 2])('erode, dilate, open and close with radius %i match OpenCV with a square element', (radius) => {
        const mask = maskImage(W, H, radius + maxValue);
        const side = 2 * radius + 1;
        for (const op of ['erode', 'dilate', 'open', 'close'] as const) {
          const ours = morphology(mask, op, radius, border);
          const expected = viaOpenCv(mask, (src, dst) => {
            const element = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(side, side));
            const anchor = new cv.Point(-1, -1);
            // BORDER_CONSTANT with value 0, stated explicitly (OpenCV's default border value is neutral).
            const value = new cv.Scalar(0, 0, 0, 0);
            if (op === 'erode') cv.erode(src, dst, element, anchor, 1, cvBorder, value);
            else if (op === 'dilate') cv.dilate(src, dst, element, anchor, 1, cvBorder, value);
            else cv.morphologyEx(src, dst, op === 'open' ? cv.MORPH_OPEN : cv.MORPH_CLOSE, element, anchor, 1, cvBorder, value);
            element.delete();
          });
          expect({ op, diff: maxAbsDiff(ours.data, expected) }).toEqual({ op, diff: 0 });
        }
      });
    });
  });

  describe('median', () => {
    // OpenCV medianBlur always replicates the edge, so the reflect and constant checks pad first
    // with copyMakeBorder and crop the result.
    function openCvMedian(image: Image, size: number, border: BorderMode, bits: 8 | 16): Float32Array {
      const r = (size - 1) >> 1;
      const src = toMatInt(cv, image, bits);
      const padded = new cv.Mat();
      cv.copyMakeBorder(src, padded, r, r, r, r, CV_BORDER[border], new cv.Scalar(0, 0, 0, 0));
      const dst = new cv.Mat();
      cv.medianBlur(padded, dst, size);
      const cropped = dst.roi(new cv.Rect(r, r, image.width, image.height));
      const out = matToFloat(cv, cropped);
      [src, padded, dst, cropped].forEach((m) => m.delete());
      return out;
    }

    test.each(BORDERS)('8-bit, sizes 3, 5 and 7, %s border: equal to OpenCV medianBlur', (border) => {
      const image = partImage(W, H, 255, 11);
      for (const size of [3, 5, 7]) {
        expect({ size, diff: maxAbsDiff(medianFilter(image, size, border).data, openCvMedian(image, size, border, 8)) }).toEqual({ size, diff: 0 });
      }
    });

    test.each(BORDERS)('16-bit, sizes 3 and 5, %s border: equal to OpenCV medianBlur', (border) => {
      const image = partImage(W, H, 65535, 12);
      for (const size of [3, 5]) {
        expect({ size, diff: maxAbsDiff(medianFilter(image, size, border).data, openCvMedian(image, size, border, 16)) }).toEqual({ size, diff: 0 });
      }
    });

    test('non-integer samples take the selection path and agree with OpenCV medianBlur on CV_32F (size 5)', () => {
      const image = partImage(W, H, 255, 13);
      const scaled = imageFromSamples(W, H, Array.from(image.data, (v) => v / 3));
      const src = toMat32(cv, scaled);
      const dst = new cv.Mat();
      cv.medianBlur(src, dst, 5);
      const expected = matToFloat(cv, dst);
      src.delete();
      dst.delete();
      expect(maxAbsDiff(medianFilter(scaled, 5, 'replicate').data, expected)).toBe(0);
    });
  });

  describe('Otsu threshold', () => {
    test.each([1, 2, 3, 4])('on 8-bit image %i: same threshold and mask as OpenCV threshold(THRESH_BINARY | THRESH_OTSU)', (seed) => {
      const image = partImage(61, 47, 255, seed);
      const ours = thresholdOtsu(image);
      const src = toMatInt(cv, image, 8);
      const dst = new cv.Mat();
      const t = cv.threshold(src, dst, 0, 1, cv.THRESH_BINARY | cv.THRESH_OTSU);
      const expected = matToFloat(cv, dst);
      src.delete();
      dst.delete();
      expect(ours.threshold).toBe(t);
      expect(maxAbsDiff(ours.mask.data, expected)).toBe(0);
    });
  });

  describe('connected components', () => {
    test.each([1, 2, 3])('8-connected blobs of random mask %i: same count, areas and boxes as OpenCV connectedComponentsWithStats', (seed) => {
      const mask = maskImage(53, 41, seed, 0.35);
      const ours = labelBlobs(mask).blobs.map((b) => [b.area, b.minX, b.minY, b.maxX - b.minX + 1, b.maxY - b.minY + 1]);
      const src = toMatInt(cv, mask, 8);
      const labels = new cv.Mat();
      const stats = new cv.Mat();
      const centroids = new cv.Mat();
      const n = cv.connectedComponentsWithStats(src, labels, stats, centroids, 8, cv.CV_32S);
      const theirs: number[][] = [];
      // Row 0 is the background; columns: left, top, width, height, area.
      for (let i = 1; i < n; i++) {
        const s = stats.data32S.subarray(i * 5, i * 5 + 5);
        theirs.push([s[4], s[0], s[1], s[2], s[3]]);
      }
      [src, labels, stats, centroids].forEach((m) => m.delete());
      const order = (a: number[], b: number[]) => a[2] - b[2] || a[1] - b[1] || a[0] - b[0];
      expect(ours.length).toBe(n - 1);
      expect([...ours].sort(order)).toEqual([...theirs].sort(order));
    });
  });

  describe('the direct path', () => {
    test('agrees with OpenCV filter2D for a 7x7 non-separable kernel on a 16-bit image', () => {
      const image = partImage(W, H, 65535, 5);
      const matrix = Array.from({ length: 7 }, (_, j) => Array.from({ length: 7 }, (_, i) => ((i * 7 + j * 3) % 5) - 2));
      const ours = correlateDirect(image, kernelFromMatrix(matrix), 'reflect');
      const expected = viaOpenCv(image, (src, dst) => {
        const k = cv.matFromArray(7, 7, cv.CV_32F, matrix.flat());
        cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), 0, CV_BORDER.reflect);
        k.delete();
      });
      expectClose(ours.data, expected);
    });
  });

  // The rule runner's input image of an 8-bit grey photo: on the SIMD engine it keeps the photo's
  // bytes, which the direct kernels read instead of its float32 samples.
  describe.each(BORDERS)('from an 8-bit grey photo, with the %s border', (border) => {
    const samples = Uint8Array.from(partImage(W, H, 255, 7).data);
    const photo: RawPhoto = { width: W, height: H, channels: 1, bitDepth: 8, samples };
    const fromBytes = (run: (src: OpenCv, dst: OpenCv) => void) => viaOpenCv(imageFromSamples(W, H, samples), run, (cv, image) => toMatInt(cv, image, 8));
    const runOnInput = <T>(fn: (input: Image, out: Image) => T): T => {
      const workspace = new ImageWorkspace();
      const input = inputChannel(photo, 'luma', workspace.take(W, H));
      const result = fn(input, workspace.take(W, H));
      workspace.dispose();
      return result;
    };

    test('the 4- and 8-neighbour Laplacians match OpenCV Laplacian and filter2D on the 8-bit Mat (CV_8U in, CV_32F out)', () => {
      const ours = runOnInput((input, out) => [laplacian(input, 4, border, out).data.slice(), laplacian(input, 8, border, out).data.slice()]);
      expectClose(ours[0], fromBytes((src, dst) => cv.Laplacian(src, dst, cv.CV_32F, 1, 1, 0, CV_BORDER[border])));
      const k = cv.matFromArray(3, 3, cv.CV_32F, [1, 1, 1, 1, -8, 1, 1, 1, 1]);
      expectClose(ours[1], fromBytes((src, dst) => cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), 0, CV_BORDER[border])));
      k.delete();
    });

    test('erosion, dilation, opening and closing (5x5 square) match OpenCV on the 8-bit Mat, to the level', () => {
      for (const op of ['erode', 'dilate', 'open', 'close'] as const) {
        const ours = runOnInput((input, out) => morphology(input, op, 2, border, out).data.slice());
        const expected = fromBytes((src, dst) => {
          const element = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(5, 5));
          const anchor = new cv.Point(-1, -1);
          // BORDER_CONSTANT with value 0, stated explicitly (OpenCV's default border value is neutral).
          const value = new cv.Scalar(0, 0, 0, 0);
          if (op === 'erode') cv.erode(src, dst, element, anchor, 1, CV_BORDER[border], value);
          else if (op === 'dilate') cv.dilate(src, dst, element, anchor, 1, CV_BORDER[border], value);
          else cv.morphologyEx(src, dst, op === 'open' ? cv.MORPH_OPEN : cv.MORPH_CLOSE, element, anchor, 1, CV_BORDER[border], value);
          element.delete();
        });
        expect({ op, diff: maxAbsDiff(ours, expected) }).toEqual({ op, diff: 0 });
      }
    });

    test('a non-separable 5x5 kernel of whole numbers matches OpenCV filter2D on the 8-bit Mat', () => {
      const matrix = [[1, 2, 0, -1, 1], [0, 3, 1, -2, 0], [2, -1, 4, 0, 1], [1, 0, -2, 3, 0], [0, 1, 1, 0, 2]];
      const ours = runOnInput((input, out) => correlateDirect(input, kernelFromMatrix(matrix), border, out).data.slice());
      const k = cv.matFromArray(5, 5, cv.CV_32F, matrix.flat());
      expectClose(ours, fromBytes((src, dst) => cv.filter2D(src, dst, cv.CV_32F, k, new cv.Point(-1, -1), 0, CV_BORDER[border])));
      k.delete();
    });
  });
});
