// The image quality gate, judged before the part: focus, exposure (clipping) and brightness.
import type { QualityLimits } from '../rules/schema';
import { createImage, maxSampleValue, type BitDepth, type Image } from './image';
import { laplacianRow } from './laplacian';

export interface QualityFigures {
  /** Population variance of the 4-neighbour Laplacian with the reflect border (variance of the Laplacian). */
  readonly focus: number;
  /** Share of pixels at the bit depth's maximum (255 or 65535). */
  readonly clipped: number;
  readonly mean: number;
}

export interface QualityJudgement extends QualityFigures {
  readonly pass: boolean;
  /** One sentence per failed check, in the engineer's words. */
  readonly problems: string[];
}

/**
 * Focus measure after Pech-Pacheco et al., "Diatom autofocusing in brightfield microscopy:
 * a comparative study", ICPR 2000 (variance of the Laplacian).
 */
export function qualityFigures(input: Image, bitDepth: BitDepth): QualityFigures {
  const { width: w, height: h, data } = input;
  const n = w * h;
  const top = maxSampleValue(bitDepth);
  let sum = 0;
  let clipped = 0;
  for (let p = 0; p < n; p++) {
    const v = data[p];
    sum += v;
    if (v >= top) clipped++;
  }
  // One Laplacian row at a time; the variance from the running sum and sum of squares
  // (the Laplacian's mean is near 0, so the two sums do not cancel).
  const rowImage = createImage(w, 1);
  const lap = rowImage.data;
  let lapSum = 0;
  let lapSquares = 0;
  for (let y = 0; y < h; y++) {
    laplacianRow(input, y, lap);
    for (let x = 0; x < w; x++) {
      const v = lap[x];
      lapSum += v;
      lapSquares += v * v;
    }
  }
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
