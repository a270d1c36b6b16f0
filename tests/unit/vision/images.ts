// Test images generated from a seed: reproducible, textured, with edges and flat areas.
import { imageFromSamples, type Image } from '../../../shared/vision/image';

/** Deterministic pseudo-random generator (mulberry32). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Integer samples 0…maxValue: a bright disc and a step on a noisy background. */
export function partImage(width: number, height: number, maxValue: 255 | 65535, seed = 1): Image {
  const rand = seededRandom(seed);
  const samples = new Array<number>(width * height);
  const cx = width * 0.45;
  const cy = height * 0.55;
  const r = Math.min(width, height) * 0.3;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const inDisc = (x - cx) ** 2 + (y - cy) ** 2 < r * r;
      const base = inDisc ? 0.7 : x > width * 0.8 ? 0.45 : 0.2;
      const v = base + (rand() - 0.5) * 0.2;
      samples[y * width + x] = Math.max(0, Math.min(maxValue, Math.round(v * maxValue)));
    }
  }
  return imageFromSamples(width, height, samples);
}

/** A binary mask (0/1) with random specks and a few solid blocks. */
export function maskImage(width: number, height: number, seed = 2, density = 0.3): Image {
  const rand = seededRandom(seed);
  const samples = new Array<number>(width * height);
  for (let p = 0; p < samples.length; p++) samples[p] = rand() < density ? 1 : 0;
  for (let y = Math.floor(height / 4); y < Math.floor(height / 2); y++) {
    for (let x = Math.floor(width / 5); x < Math.floor(width / 2); x++) samples[y * width + x] = 1;
  }
  return imageFromSamples(width, height, samples);
}

/**
 * Samples whose sums cancel: 2⁵³ + 1 rounds to 2⁵³ in double precision, so adding in another order
 * changes a result by whole units, which the float32 store keeps (every sample is a float32 exactly).
 */
export function cancellingImage(width: number, height: number, seed: number): Image {
  const rand = seededRandom(seed);
  const values = [2 ** 53, -(2 ** 53), 2 ** 60, -(2 ** 60), 1, -1, 0.75, 3, 0];
  return imageFromSamples(width, height, Array.from({ length: width * height }, () => values[Math.floor(rand() * values.length)]));
}
