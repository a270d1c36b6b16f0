// Published worked examples (../shared/REFERENCES.md) reproduced exactly by the engine.
import { labelBlobs } from '../../../shared/vision/blobs';
import { correlate } from '../../../shared/vision/convolve';
import { gradient } from '../../../shared/vision/gradient';
import { imageFromSamples } from '../../../shared/vision/image';
import { gaussianWeights, kernelFromMatrix } from '../../../shared/vision/kernels';
import { laplacian } from '../../../shared/vision/laplacian';
import { otsuBin, thresholdOtsu } from '../../../shared/vision/threshold';

describe('convolution and correlation (REFERENCES.md §1)', () => {
  // scipy.ndimage.convolve documentation example (docs.scipy.org, scipy.ndimage.convolve), mode='constant', cval=0.
  const a = imageFromSamples(4, 4, [1, 2, 0, 0, 5, 3, 0, 4, 0, 0, 0, 7, 9, 3, 0, 0]);
  const k = [[1, 1, 1], [1, 1, 0], [1, 0, 0]];

  test('a kernel step correlates: scipy.ndimage.correlate / OpenCV filter2D give [[1,8,5,0],[8,11,5,4],[8,17,10,11],[9,12,10,7]]', () => {
    const out = correlate(a, kernelFromMatrix(k), 'constant');
    expect(Array.from(out.data)).toEqual([1, 8, 5, 0, 8, 11, 5, 4, 8, 17, 10, 11, 9, 12, 10, 7]);
  });

  test('the kernel rotated by 180° gives the convolution of the scipy example: [[11,10,7,4],[10,3,11,11],[15,12,14,7],[12,3,7,0]]', () => {
    const rotated = k.map((row) => [...row].reverse()).reverse();
    const out = correlate(a, kernelFromMatrix(rotated), 'constant');
    expect(Array.from(out.data)).toEqual([11, 10, 7, 4, 10, 3, 11, 11, 15, 12, 14, 7, 12, 3, 7, 0]);
  });

  test('correlating a unit impulse gives the kernel rotated 180° (Gonzalez & Woods 3rd ed. §3.4.2, from memory; numbers from numpy)', () => {
    const f = imageFromSamples(8, 1, [0, 0, 0, 1, 0, 0, 0, 0]);
    const out = correlate(f, kernelFromMatrix([[1, 2, 3, 2, 8]]), 'constant');
    expect(Array.from(out.data)).toEqual([0, 8, 2, 3, 2, 1, 0, 0]);
  });

  test('Sobel x on a 5x5 impulse gives [1 0 -1; 2 0 -2; 1 0 -1] around the centre (OpenCV Sobel dx=1, REFERENCES §1)', () => {
    const impulse = imageFromSamples(5, 5, Array.from({ length: 25 }, (_, i) => (i === 12 ? 1 : 0)));
    const out = gradient(impulse, 'sobel', 'x', 'constant');
    const centre = [6, 7, 8, 11, 12, 13, 16, 17, 18].map((p) => out.data[p] + 0);
    expect(centre).toEqual([1, 0, -1, 2, 0, -2, 1, 0, -1]);
  });

  describe('ramp [[1,2,3],[4,5,6],[7,8,9]], centre pixel (OpenCV.js and cv2, REFERENCES §1)', () => {
    const ramp = imageFromSamples(3, 3, [1, 2, 3, 4, 5, 6, 7, 8, 9]);
    const centre = (img: { data: Float32Array }) => img.data[4];
    test.each([
      ['sobel', 8, 24],
      ['scharr', 32, 96],
      ['prewitt', 6, 18],
    ] as const)('%s: Gx = %d, Gy = %d', (operator, gx, gy) => {
      expect(centre(gradient(ramp, operator, 'x', 'reflect'))).toBe(gx);
      expect(centre(gradient(ramp, operator, 'y', 'reflect'))).toBe(gy);
    });
    test('Sobel L2 magnitude = sqrt(640) = 25.2982', () => {
      expect(centre(gradient(ramp, 'sobel', 'magnitude', 'reflect'))).toBeCloseTo(25.2982, 4);
    });
    test('4-neighbour Laplacian = 0 on a linear image', () => {
      expect(centre(laplacian(ramp, 4, 'reflect'))).toBe(0);
    });
  });
});

describe('Gaussian coefficients (REFERENCES.md §2, OpenCV getGaussianKernel with sigma > 0)', () => {
  test.each([
    [1.0, 1, [0.27406862, 0.45186275, 0.27406862]],
    [1.0, 2, [0.05448868, 0.24420135, 0.40261996, 0.24420135, 0.05448868]],
    [1.4, 2, [0.11020946, 0.23691201, 0.30575705, 0.23691201, 0.11020946]],
    [1.0, 3, [0.00443305, 0.05400558, 0.24203622, 0.39905027, 0.24203622, 0.05400558, 0.00443305]],
  ])('sigma %p, radius %p', (sigma, radius, expected) => {
    const w = gaussianWeights(sigma, radius);
    expect(w.length).toBe(expected.length);
    expected.forEach((v, i) => expect(w[i]).toBeCloseTo(v, 7));
  });

  test('sigma 1 with scipy.ndimage radius 4 (truncate 4.0) gives scipy gaussian_filter1d weights', () => {
    const w = gaussianWeights(1, 4);
    // scipy 1.17.1, REFERENCES §2.
    [1.33830625e-4, 4.43186162e-3, 5.39911274e-2, 2.41971446e-1, 3.98943469e-1].forEach((v, i) => expect(w[i]).toBeCloseTo(v, 9));
  });

  test('the default radius is ceil(3 sigma): sigma 1 → 7 taps, 0.3 → 3 taps, 1.2 → 9 taps (DESIGN.md rule format v1)', () => {
    expect(gaussianWeights(1).length).toBe(7);
    expect(gaussianWeights(0.3).length).toBe(3);
    expect(gaussianWeights(1.2).length).toBe(9);
  });
});

describe("Otsu's method (REFERENCES.md §3; Greensted's 6-level histogram, counts from memory, results from OpenCV and image-js)", () => {
  const counts = [8, 7, 2, 6, 9, 4];
  const levels = counts.flatMap((n, level) => Array<number>(n).fill(level));

  test('the histogram [8,7,2,6,9,4] gives threshold 2 (foreground = value > 2)', () => {
    expect(otsuBin(counts)).toBe(2);
  });

  test('a 36-pixel image with those levels: threshold 2 and 19 foreground pixels', () => {
    const { mask, threshold } = thresholdOtsu(imageFromSamples(6, 6, levels));
    expect(threshold).toBe(2);
    expect(mask.data.reduce((a, b) => a + b, 0)).toBe(19);
  });

  test('levels scaled by 50 give threshold 100, as OpenCV returns', () => {
    const { mask, threshold } = thresholdOtsu(imageFromSamples(6, 6, levels.map((v) => v * 50)));
    expect(threshold).toBe(100);
    expect(mask.data.reduce((a, b) => a + b, 0)).toBe(19);
  });

  test('a flat image gives an empty mask (DESIGN.md rule format v1)', () => {
    const { mask } = thresholdOtsu(imageFromSamples(3, 3, Array(9).fill(77)));
    expect(Array.from(mask.data)).toEqual(Array(9).fill(0));
  });
});

describe('connectivity (REFERENCES.md §6, counts from OpenCV.js connectedComponents)', () => {
  const rows = ['10001', '01010', '00000', '11001', '10011'];
  const mask = imageFromSamples(5, 5, rows.join('').split('').map(Number));

  test('8-connected: 4 objects (OpenCV returns 5 including the background)', () => {
    expect(labelBlobs(mask).blobs.length).toBe(4);
  });

  test('the diagonal pair in rows 1-2 joins the corner pixels into one blob of 3', () => {
    const areas = labelBlobs(mask).blobs.map((b) => b.area).sort();
    // 8-connected groups: {(0,0),(1,1)}, {(4,0),(3,1)}, {(0,3),(1,3),(0,4)}, {(4,3),(3,4),(4,4)}.
    expect(areas).toEqual([2, 2, 3, 3]);
  });
});
