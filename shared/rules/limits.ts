// What makes a gauge's limits unusable, decided once for the rule document's schema (in the
// document's words, for the API and the rule command) and for the editor (in its field labels).
// A limit a measure can never reach makes the gauge pass or fail every part whatever it measures:
// counts, areas, lengths, shares and standard deviations are never negative, and a share of mask
// pixels is at most 1.

/** Measures whose values are never negative (and, for the share, at most 1). */
const NEVER_NEGATIVE: ReadonlySet<string> = new Set(['edge-fraction', 'blob-count', 'largest-blob-area', 'largest-blob-length', 'stddev']);
const SHARE = 'edge-fraction';

export type LimitBound = 'min' | 'max';

export interface LimitProblem {
  /** The limit at fault; null when neither is set. */
  bound: LimitBound | null;
  kind: 'missing' | 'crossed' | 'negative' | 'above-one';
}

export function limitProblems(measure: string, limits: { min?: number; max?: number }): LimitProblem[] {
  const { min, max } = limits;
  if (min === undefined && max === undefined) return [{ bound: null, kind: 'missing' }];
  const problems: LimitProblem[] = [];
  for (const bound of ['min', 'max'] as const) {
    const value = limits[bound];
    if (value === undefined || !Number.isFinite(value)) continue;
    if (NEVER_NEGATIVE.has(measure) && value < 0) problems.push({ bound, kind: 'negative' });
    else if (measure === SHARE && value > 1) problems.push({ bound, kind: 'above-one' });
  }
  if (problems.length === 0 && min !== undefined && max !== undefined && min > max) problems.push({ bound: 'min', kind: 'crossed' });
  return problems;
}

/** The problem in the rule document's words ("min", "max", the measure's code). */
export function documentLimitMessage(problem: LimitProblem, measure: string): string {
  switch (problem.kind) {
    case 'missing':
      return 'limits need "min", "max" or both';
    case 'crossed':
      return 'min must not exceed max';
    case 'negative':
      return `${problem.bound} must be at least 0: "${measure}" is never negative`;
    case 'above-one':
      return `${problem.bound} must be at most 1: "${measure}" is a share from 0 to 1`;
  }
}

const BOUND_LABELS: Record<LimitBound, string> = { min: 'Lowest allowed', max: 'Highest allowed' };

/** The problem in the editor's words: its field labels and the measure's name on screen. */
export function screenLimitMessage(problem: LimitProblem, measureLabel: string): string {
  switch (problem.kind) {
    case 'missing':
      return 'Set a lowest allowed value, a highest, or both.';
    case 'crossed':
      return 'Lowest allowed must not be above highest allowed.';
    case 'negative':
      return `${BOUND_LABELS[problem.bound!]} must be at least 0: ${measureLabel.toLowerCase()} is never negative.`;
    case 'above-one':
      return `${BOUND_LABELS[problem.bound!]} must be at most 1: ${measureLabel.toLowerCase()} is a fraction from 0 to 1.`;
  }
}
