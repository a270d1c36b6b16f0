// Adaptive-mean threshold and box filter against the reference library @techstark/opencv-js 4.5.2
// (OpenCV 4.5.1, WebAssembly). OpenCV's adaptiveThreshold only takes 8-bit images and rounds the
// mean to 8 bits, so the reference here is the rule format's own definition (DESIGN.md:
// mask = in > local mean − c) with the local mean from OpenCV's blur on CV_32F with the same border.
import type { BorderMode } from '../../../shared/rules/schema';
import type { Image } from '../../../shared/vision/image';
import { boxFilter } from '../../../shared/vision/smoothing';
import { thresholdAdaptiveMean } from '../../../shared/vision/threshold';
import { partImage } from './images';
import { CV_BORDER, loadOpenCv, matToFloat, maxAbsDiff, toMat32, type OpenCv } from './opencv';
import { ENGINES, useEngine } from './engines';

let cv: OpenCv;
beforeAll(async () => {
  ({ cv } = await loadOpenCv());
}, 30000);

function openCvBlur(image: Image, size: number, border: BorderMode): Float32Array {
  const src = toMat32(cv, image);
  const dst = new cv.Mat();
  cv.blur(src, dst, new cv.Size(size, size), new cv.Point(-1, -1), CV_BORDER[border]);
  const out = matToFloat(cv, dst);
  src.delete();
  dst.delete();
  return out;
}

const BORDERS: BorderMode[] = ['reflect', 'replicate', 'constant'];

// Every check runs on both engines: the plain TypeScript path and the WebAssembly SIMD kernels.
describe.each(ENGINES)('on the %s engine', (engine) => {
  useEngine(engine);

  describe.each(BORDERS)('with the %s border', (border) => {
    // Odd and even widths: the box filter's running sums go two columns at a time.
    test.each([
      [15, 41, 29],
      [5, 40, 17],
      [3, 2, 5],
    ])('box %i on a %ix%i image matches OpenCV blur', (size, w, h) => {
      const image = partImage(w, h, 255, size + w);
      const expected = openCvBlur(image, size, border);
      expect(maxAbsDiff(boxFilter(image, size, border).data, expected)).toBeLessThanOrEqual(255 * 1e-5);
    });

    test.each([
      [15, 5, false],
      [5, 2.5, true],
      [9, -3, false],
    ])('adaptive mean %i, c %d (invert %s) is in > OpenCV blur − c, except within float rounding of the tie', (size, c, invert) => {
      const image = partImage(53, 31, 255, size);
      const mean = openCvBlur(image, size, border);
      const mask = thresholdAdaptiveMean(image, size, c, border, invert).data;
      let checked = 0;
      for (let p = 0; p < mask.length; p++) {
        const margin = image.data[p] - (mean[p] - c);
        if (Math.abs(margin) < 1e-3) continue; // float32 means from two summation orders may straddle a tie
        expect(mask[p]).toBe((margin > 0) !== invert ? 1 : 0);
        checked++;
      }
      expect(checked).toBeGreaterThan(mask.length * 0.9);
    });
  });
});
