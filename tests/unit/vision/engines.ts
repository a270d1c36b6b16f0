// Both engines under test: the plain TypeScript path (the reference) and the WebAssembly SIMD kernels.
import fc from 'fast-check';
import type { BorderMode } from '../../../shared/rules/schema';
import { engineChoice, setEngine, type EngineName } from '../../../shared/vision/engine';
import { imageFromSamples, type Image } from '../../../shared/vision/image';
import { seededRandom } from './images';

export const ENGINES: readonly EngineName[] = ['plain', 'simd'];

/** Runs the enclosing describe block's tests on one engine, then goes back to the default. */
export function useEngine(engine: EngineName): void {
  beforeAll(() => setEngine(engine));
  afterAll(() => setEngine('auto'));
}

export function onEngine<T>(engine: EngineName, fn: () => T): T {
  const before = engineChoice();
  setEngine(engine);
  try {
    return fn();
  } finally {
    setEngine(before);
  }
}

/** The same computation on both engines. */
export function onBoth<T>(fn: () => T): { plain: T; simd: T } {
  return { plain: onEngine('plain', fn), simd: onEngine('simd', fn) };
}

/** Unit roundoff of float32 (IEEE 754 binary32: 24-bit significand), u = 2⁻²⁴. */
export const FLOAT32_UNIT_ROUNDOFF = 2 ** -24;

/**
 * How far the two engines may differ on a float path. The plain engine sums in double precision and
 * rounds once to float32; the SIMD kernels round float32 weights and every product and sum. A sum of
 * n products computed in float32 lies within γₙ·Σ|wᵢ·xᵢ| of the exact sum, γₙ = n·u/(1 − n·u)
 * (N. J. Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., SIAM 2002, §3.1; from memory).
 * `operations` counts the products and sums on the longest chain, `magnitude` bounds Σ|wᵢ·xᵢ|
 * (the kernel's L1 norm times the largest |sample|); a few more roundings cover the weights,
 * the scale and the final store.
 */
export function float32Tolerance(operations: number, magnitude: number): number {
  const n = operations + 6;
  return ((n * FLOAT32_UNIT_ROUNDOFF) / (1 - n * FLOAT32_UNIT_ROUNDOFF)) * magnitude;
}

export function largestMagnitude(values: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < values.length; i++) if (Math.abs(values[i]) > m) m = Math.abs(values[i]);
  return m;
}

export function l1(values: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < values.length; i++) s += Math.abs(values[i]);
  return s;
}

/** Largest |a − b|, NaN when one is NaN and the other not. */
export function largestDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} vs ${b.length}`);
  let m = 0;
  for (let i = 0; i < a.length; i++) {
    if (Number.isNaN(a[i]) !== Number.isNaN(b[i])) return NaN;
    if (!Number.isNaN(a[i])) m = Math.max(m, Math.abs(a[i] - b[i]));
  }
  return m;
}

/** The float32 bit patterns, for bit-for-bit comparisons (−0 differs from +0, NaN equals itself). */
export function bitsOf(image: Image): number[] {
  return Array.from(new Uint32Array(image.data.slice().buffer));
}

export const borderMode = fc.constantFrom<BorderMode>('reflect', 'replicate', 'constant');

/** Odd sizes and the degenerate ones: 1×1, 1×N, N×1, 7×5, 33×17, and anything up to 40. */
export const imageSize = fc.oneof(
  fc.constantFrom([1, 1], [1, 9], [9, 1], [7, 5], [33, 17], [5, 33], [2, 3], [4, 4]),
  fc.tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 40 })),
);

export type SampleKind = '8-bit' | '16-bit' | 'signed float' | 'mask' | 'awkward';

/**
 * A reproducible image from a seed: 8- or 16-bit samples, signed floats, a 0/1 mask, or awkward
 * values for the comparison paths (NaN, −0, ±Infinity, exact ties).
 */
export function sampleImage(width: number, height: number, kind: SampleKind, seed: number): Image {
  const rand = seededRandom(seed);
  const awkward = [NaN, -0, 0, 1, -1, Infinity, -Infinity, 0.5, 255, 1e-30];
  const samples = Array.from({ length: width * height }, () => {
    switch (kind) {
      case '8-bit':
        return Math.floor(rand() * 256);
      case '16-bit':
        return Math.floor(rand() * 65536);
      case 'signed float':
        return (rand() - 0.5) * 2000;
      case 'mask':
        return rand() < 0.45 ? 1 : 0;
      case 'awkward':
        return rand() < 0.3 ? awkward[Math.floor(rand() * awkward.length)] : Math.round(rand() * 8) / 2;
    }
  });
  return imageFromSamples(width, height, samples);
}

export const sampleKind = fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float');
export const seed = fc.integer({ min: 1, max: 2 ** 31 - 1 });
