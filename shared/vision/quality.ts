// The image quality gate, judged before the part: focus, exposure (clipping) and brightness.
import type { QualityLimits } from '../rules/schema';
import { maxSampleValue, type BitDepth, type Image } from './image';
import { laplacian } from './laplacian';

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
  const data = input.data;
  const n = data.length;
  const top = maxSampleValue(bitDepth);
  let sum = 0;
  let clipped = 0;
  for (let p = 0; p < n; p++) {
    const v = data[p];
    sum += v;
    if (v >= top) clipped++;
  }
  const lap = laplacian(input, 4, 'reflect').data;
  let lapSum = 0;
  for (let p = 0; p < n; p++) lapSum += lap[p];
  const lapMean = lapSum / n;
  let sq = 0;
  for (let p = 0; p < n; p++) {
    const d = lap[p] - lapMean;
    sq += d * d;
  }
  return { focus: sq / n, clipped: clipped / n, mean: sum / n };
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
