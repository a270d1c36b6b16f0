// Loads the reference library once per test file: @techstark/opencv-js 4.5.2 (OpenCV 4.5.1 built
// for WebAssembly). The module object is a thenable, so wait on onRuntimeInitialized, never await it.
import type { Image } from '../../../shared/vision/image';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type OpenCv = any;

// Held in a wrapper: resolving a promise with the module itself would adopt its `then`.
let loading: Promise<{ cv: OpenCv }> | null = null;

/** Resolves to { cv }; never return or await `cv` itself from an async function. */
export function loadOpenCv(): Promise<{ cv: OpenCv }> {
  if (!loading) {
    loading = new Promise((resolve) => {
      // eslint-disable-next-line @typescript-eslint/no-require-imports
      const cv = require('@techstark/opencv-js');
      if (cv.Mat) resolve({ cv });
      else cv.onRuntimeInitialized = () => resolve({ cv });
    });
  }
  return loading;
}

/** A CV_32F Mat holding the image's samples (the caller deletes it). */
export function toMat32(cv: OpenCv, image: Image): OpenCv {
  const mat = new cv.Mat(image.height, image.width, cv.CV_32F);
  mat.data32F.set(image.data);
  return mat;
}

/** A CV_8U or CV_16U Mat from integer samples. */
export function toMatInt(cv: OpenCv, image: Image, bits: 8 | 16): OpenCv {
  const mat = new cv.Mat(image.height, image.width, bits === 8 ? cv.CV_8U : cv.CV_16U);
  (bits === 8 ? mat.data : mat.data16U).set(image.data);
  return mat;
}

export function matToFloat(cv: OpenCv, mat: OpenCv): Float32Array {
  const f = new cv.Mat();
  mat.convertTo(f, cv.CV_32F);
  const out = Float32Array.from(f.data32F);
  f.delete();
  return out;
}

export const CV_BORDER = { reflect: 4 /* BORDER_REFLECT_101 */, replicate: 1 /* BORDER_REPLICATE */, constant: 0 /* BORDER_CONSTANT */ } as const;

/** Largest absolute difference between two sample arrays of the same length. */
export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} vs ${b.length}`);
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}
