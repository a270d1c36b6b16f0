import fc from 'fast-check';
import { sampleBilinear, snapToEdge, strongestStep, type GreyImage } from '../../../components/stations/edgeSnap';
import { loadOpenCv } from '../vision/opencv';

/** A 1000×40 target photo: light board, dark block; each column's brightness from how much of it the block covers. */
function targetPhoto(left: number, right: number): GreyImage {
  const width = 1000;
  const height = 40;
  const light = 210;
  const dark = 40;
  const data = new Float32Array(width * height);
  for (let x = 0; x < width; x++) {
    // Share of pixel [x, x+1) inside [left, right): anti-aliasing by area coverage.
    const covered = Math.max(0, Math.min(x + 1, right) - Math.max(x, left));
    for (let y = 0; y < height; y++) data[y * width + x] = light + (dark - light) * covered;
  }
  return { width, height, data };
}

test('bilinear sampling matches OpenCV’s warpAffine with linear interpolation, whose pixel centres sit at whole coordinates (@techstark/opencv-js 4.5.2)', async () => {
  const { cv } = await loadOpenCv();
  const image: GreyImage = { width: 4, height: 3, data: Float32Array.from([10, 20, 30, 40, 50, 60, 70, 80, 90, 100, 110, 120]) };
  const src = cv.matFromArray(3, 4, cv.CV_32F, Array.from(image.data));
  const dst = new cv.Mat();
  try {
    // Fractions in 1/32 px: OpenCV interpolates from a table with 32 steps per pixel.
    for (const [x, y] of [
      [1.5, 1.5],
      [1.75, 1.25],
      [2.375, 2.875],
      [0.625, 0.5],
    ]) {
      // dst(0, 0) = src(x − 0.5, y − 0.5): ours puts pixel (i, j)'s centre at (i + 0.5, j + 0.5), OpenCV at (i, j).
      const shift = cv.matFromArray(2, 3, cv.CV_64F, [1, 0, x - 0.5, 0, 1, y - 0.5]);
      cv.warpAffine(src, dst, shift, new cv.Size(1, 1), cv.INTER_LINEAR | cv.WARP_INVERSE_MAP, cv.BORDER_REPLICATE);
      shift.delete();
      expect(sampleBilinear(image, x, y)).toBeCloseTo(dst.data32F[0], 3);
    }
  } finally {
    src.delete();
    dst.delete();
  }
});

// Three-point peak interpolation: the vertex of the parabola through the largest sample and its two
// neighbours (common practice for sub-pixel peaks; compared in R. B. Fisher and D. K. Naidu,
// "A comparison of algorithms for subpixel peak detection", 1996, from memory).
test('the step of a ramp whose slopes form a parabola is placed at the parabola’s vertex', () => {
  // Slopes |central differences| 5, 6, 4 at indices 3, 4, 5: by hand, the parabola through
  // (−1, 5), (0, 6), (1, 4) peaks at (5 − 4) / (2 (5 − 12 + 4)) = −1/6, so the step is at 4 − 1/6.
  const profile = [0, 0, 0, 6, 10, 18, 18, 18, 18];
  expect(strongestStep(profile, 1)).toBeCloseTo(4 - 1 / 6, 12);
});

test('a flat or noisy stretch has no step to snap to', () => {
  expect(strongestStep([100, 100, 100, 100, 100], 6)).toBeNull();
  expect(strongestStep([100, 103, 99, 102, 100, 101], 6)).toBeNull();
});

test('a sharp edge between two pixels is found at their shared border from any tap within reach (constructed photo)', () => {
  const photo = targetPhoto(300, 700);
  fc.assert(
    fc.property(fc.double({ min: -5, max: 5, noNaN: true }), fc.double({ min: 1, max: 39, noNaN: true }), (offset, y) => {
      const a = snapToEdge(photo, { x: 300 + offset, y }, { x: 700 - offset, y }, 8);
      const b = snapToEdge(photo, { x: 700 - offset, y }, { x: 300 + offset, y }, 8);
      expect(a!.x).toBeCloseTo(300, 6);
      expect(b!.x).toBeCloseTo(700, 6);
      expect(a!.y).toBeCloseTo(y, 12);
    }),
  );
});

test('an anti-aliased edge at a fractional position is found within a tenth of a pixel (constructed photo)', () => {
  for (const left of [300.25, 300.5, 300.8]) {
    const photo = targetPhoto(left, 700);
    for (const offset of [-3.7, -1, 0, 0.4, 2.2]) {
      const found = snapToEdge(photo, { x: 300 + offset, y: 20 }, { x: 700, y: 20 }, 8);
      expect(Math.abs(found!.x - left)).toBeLessThan(0.1);
    }
  }
});

test('a mark with no edge within reach stays unsnapped', () => {
  const photo = targetPhoto(300, 700);
  expect(snapToEdge(photo, { x: 500, y: 20 }, { x: 900, y: 20 }, 8)).toBeNull();
});
