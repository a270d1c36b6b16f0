/**
 * Retake photos must really be unusable. Focus is the variance of the Laplacian (J. L. Pech-Pacheco,
 * G. Cristobal, J. Chamorro-Martinez, J. Fernandez-Valdivia, "Diatom autofocusing in brightfield
 * microscopy: a comparative study", ICPR 2000), computed with OpenCV's cv.Laplacian (ksize 1, the
 * [0 1 0; 1 -4 1; 0 1 0] kernel) and cv.meanStdDev from @techstark/opencv-js 4.5.2, not with our own code.
 */
import sharp from 'sharp';
import { generateDataset, type ImageTruth } from '../../../server/demo';

interface Mat {
  delete(): void;
  doubleAt(row: number, col: number): number;
}
interface OpenCv {
  Mat: new () => Mat;
  CV_8UC1: number;
  CV_64F: number;
  matFromArray(rows: number, cols: number, type: number, data: ArrayLike<number>): Mat;
  Laplacian(src: Mat, dst: Mat, ddepth: number, ksize: number): void;
  meanStdDev(src: Mat, mean: Mat, stddev: Mat): void;
  onRuntimeInitialized?: () => void;
}
// eslint-disable-next-line @typescript-eslint/no-require-imports
const cv: OpenCv = require('@techstark/opencv-js');

/** The module is a thenable: wait for its runtime callback instead of awaiting it. */
function openCvReady(): Promise<void> {
  return new Promise((resolve) => {
    if (typeof (cv as unknown as { matFromArray?: unknown }).matFromArray === 'function' && cv.Mat) {
      try {
        new cv.Mat().delete();
        resolve();
        return;
      } catch {
        // not initialised yet
      }
    }
    cv.onRuntimeInitialized = () => resolve();
  });
}

interface Measured {
  truth: ImageTruth;
  focus: number;
  mean: number;
  clippedShare: number;
}

function measure(grey: Uint8Array, width: number, height: number): Omit<Measured, 'truth'> {
  const src = cv.matFromArray(height, width, cv.CV_8UC1, grey);
  const laplacian = new cv.Mat();
  const mean = new cv.Mat();
  const stddev = new cv.Mat();
  const meanOfInput = new cv.Mat();
  const stddevOfInput = new cv.Mat();
  try {
    cv.Laplacian(src, laplacian, cv.CV_64F, 1);
    cv.meanStdDev(laplacian, mean, stddev);
    cv.meanStdDev(src, meanOfInput, stddevOfInput);
    let clipped = 0;
    for (const value of grey) if (value === 255) clipped++;
    return {
      focus: stddev.doubleAt(0, 0) ** 2,
      mean: meanOfInput.doubleAt(0, 0),
      clippedShare: clipped / grey.length,
    };
  } finally {
    [src, laplacian, mean, stddev, meanOfInput, stddevOfInput].forEach((mat) => mat.delete());
  }
}

const byFamily = new Map<string, Measured[]>();

beforeAll(async () => {
  await openCvReady();
  for await (const image of generateDataset({
    count: 30,
    seed: 99,
    sizes: [{ width: 640, height: 480 }],
    retakeShare: 0.4,
    defectShare: 0.3,
    colourShare: 0,
    sixteenBitShare: 0,
    jpegShare: 0,
  })) {
    const { data, info } = await sharp(image.buffer).toColourspace('b-w').raw().toBuffer({ resolveWithObject: true });
    const measured = { truth: image.truth, ...measure(new Uint8Array(data), info.width, info.height) };
    byFamily.set(image.truth.family, [...(byFamily.get(image.truth.family) ?? []), measured]);
  }
}, 120_000);

const usable = (list: Measured[]) => list.filter((m) => m.truth.label !== 'retake');
const retakes = (list: Measured[], reason: string) => list.filter((m) => m.truth.retakeReason === reason);

describe.each(['bracket', 'washer', 'gasket'])('retake photos of the %s', (family) => {
  it('include every reason', () => {
    const list = byFamily.get(family) ?? [];
    for (const reason of ['blur', 'dark', 'clipped']) expect(retakes(list, reason).length).toBeGreaterThan(0);
  });

  it('blurred ones have a lower variance of the Laplacian than every usable photo', () => {
    const list = byFamily.get(family) ?? [];
    const sharpest = Math.max(...retakes(list, 'blur').map((m) => m.focus));
    const leastSharp = Math.min(...usable(list).map((m) => m.focus));
    console.log(`${family}: focus of blurred retakes <= ${sharpest.toFixed(1)}, of usable photos >= ${leastSharp.toFixed(1)}`);
    expect(sharpest).toBeLessThan(leastSharp);
  });

  it('too dark ones have a low mean brightness', () => {
    const list = byFamily.get(family) ?? [];
    const darkest = Math.min(...usable(list).map((m) => m.mean));
    for (const m of retakes(list, 'dark')) {
      // A minimum mean of 30 grey levels is the example quality gate of the rule format (DESIGN.md).
      expect(m.mean).toBeLessThan(30);
      expect(m.mean).toBeLessThan(darkest);
    }
  });

  it('clipped ones have a high share of saturated pixels, usable ones almost none', () => {
    const list = byFamily.get(family) ?? [];
    // 2 % clipped is the example quality gate of the rule format (DESIGN.md).
    for (const m of retakes(list, 'clipped')) expect(m.clippedShare).toBeGreaterThan(0.15);
    for (const m of usable(list)) expect(m.clippedShare).toBeLessThanOrEqual(0.02);
  });
});
