// The image quality gate, judged before the part: focus, exposure (clipping) and brightness.
import type { QualityLimits } from '../rules/schema';
import { borderIndex } from './border';
import { simdKernels } from './engine';
import { maxSampleValue, type BitDepth, type Image } from './image';

export interface QualityFigures {
  /** Population variance of the 4-neighbour Laplacian with the reflect border (variance of the Laplacian). */
  readonly focus: number;
  /** Share of pixels at the bit depth's maximum (255 or 65535). */
  readonly clipped: number;
  readonly mean: number;
}

/** The sums the figures come from: Σv, the number of v at the bit depth's maximum, Σlap and Σlap². */
export interface QualitySums {
  readonly sum: number;
  readonly clipped: number;
  readonly lapSum: number;
  readonly lapSquares: number;
}

export interface QualityJudgement extends QualityFigures {
  readonly pass: boolean;
  /** One sentence per failed check, in the engineer's words. */
  readonly problems: string[];
}

/**
 * Focus measure after Pech-Pacheco et al., "Diatom autofocusing in brightfield microscopy:
 * a comparative study", ICPR 2000 (variance of the Laplacian).
 * One pass over the image: mean, clipped count and the Laplacian's sum and sum of squares (the
 * Laplacian's mean is near 0, so the two sums do not cancel), computed in double precision.
 */
export function qualityFigures(input: Image, bitDepth: BitDepth): QualityFigures {
  const { width: w, height: h, data } = input;
  const n = w * h;
  const top = maxSampleValue(bitDepth);
  const simd = simdKernels();
  if (simd) {
    // The same per-pixel terms in double precision, summed in another order (last-digit differences only).
    const sums = simd.qualitySums(input, top);
    return qualityFromSums(sums, n);
  }
  let sum = 0;
  let clipped = 0;
  let lapSum = 0;
  let lapSquares = 0;
  for (let y = 0; y < h; y++) {
    // Reflect border: the row above row 0 is row 1, the column left of column 0 is column 1.
    const c = y * w;
    const up = borderIndex(y - 1, h, 'reflect') * w;
    const down = borderIndex(y + 1, h, 'reflect') * w;
    if (w === 1) {
      const v = data[c];
      const lap = data[up] + data[down] - 2 * v;
      sum += v;
      clipped += v >= top ? 1 : 0;
      lapSum += lap;
      lapSquares += lap * lap;
      continue;
    }
    const first = data[up] + data[down] + 2 * data[c + 1] - 4 * data[c];
    const last = data[up + w - 1] + data[down + w - 1] + 2 * data[c + w - 2] - 4 * data[c + w - 1];
    lapSum += first + last;
    lapSquares += first * first + last * last;
    const v0 = data[c];
    const vLast = data[c + w - 1];
    sum += v0 + vLast;
    clipped += (v0 >= top ? 1 : 0) + (vLast >= top ? 1 : 0);
    // Inner columns: the Laplacian and the centre's own sums from the same loads.
    let left = v0;
    let centre = data[c + 1];
    for (let x = 1; x < w - 1; x++) {
      const right = data[c + x + 1];
      const lap = data[up + x] + data[down + x] + left + right - 4 * centre;
      lapSum += lap;
      lapSquares += lap * lap;
      sum += centre;
      clipped += +(centre >= top);
      left = centre;
      centre = right;
    }
  }
  return qualityFromSums({ sum, clipped, lapSum, lapSquares }, n);
}

/** The figures from the sums over n pixels. */
export function qualityFromSums({ sum, clipped, lapSum, lapSquares }: QualitySums, n: number): QualityFigures {
  const lapMean = lapSum / n;
  return { focus: Math.max(0, lapSquares / n - lapMean * lapMean), clipped: clipped / n, mean: sum / n };
}

export function judgeQuality(figures: QualityFigures, limits: QualityLimits = {}): QualityJudgement {
  const problems: string[] = [];
  if (limits.minFocus !== undefined && !(figures.focus >= limits.minFocus)) {
    problems.push(`out of focus: focus ${round(figures.focus)} is below ${limits.minFocus}`);
  }
  if (limits.maxClipped !== undefined && !(figures.clipped <= limits.maxClipped)) {
    problems.push(`over-exposed: ${round(figures.clipped * 100)}% of pixels are clipped, at most ${round(limits.maxClipped * 100)}% allowed`);
  }
  if (limits.minMean !== undefined && !(figures.mean >= limits.minMean)) {
    problems.push(`too dark: mean ${round(figures.mean)} is below ${limits.minMean}`);
  }
  return { ...figures, pass: problems.length === 0, problems };
}

function round(v: number): number {
  return Math.round(v * 100) / 100;
}
