// Run rules for out-of-control signals on a control chart, checked on each point's distance from the
// centre line in sigma units. Western Electric: Statistical Quality Control Handbook (Western Electric
// Co., 1956); Nelson: L. S. Nelson, "The Shewhart Control Chart—Tests for Special Causes", Journal of
// Quality Technology 16(4):237–239, 1984. Zones: C within 1 sigma, B 1–2 sigma, A 2–3 sigma.
//
// On a p-chart the points are z_i = (p_i − p̄)/sqrt(p̄(1 − p̄)/n_i). The zone rules are then an
// approximation: the binomial distribution is skewed, so its limits are not symmetric about p̄ and
// the zones do not hold the shares of points that a normal distribution would put in them.
// Trend and alternation rules (Nelson 3 and 4) are read on the same z values, so a change in
// subgroup size alone does not look like a trend.

export type RunRuleSetName = 'western-electric' | 'nelson';

export interface RunRuleSignal {
  /** "WE1" … "WE4", "N1" … "N8". */
  rule: string;
  /** The point that completes the pattern. */
  pointIndex: number;
  /** Every point of the pattern. */
  pointIndices: number[];
  description: string;
}

/** A point's distance from the centre line in sigma units; null when there is no spread (p̄ is 0 or 1). */
type Z = number | null;

type Check = (z: readonly Z[], i: number) => Omit<RunRuleSignal, 'rule' | 'pointIndex'> | null;

const sideName = (side: number) => (side > 0 ? 'high' : 'low');

/** One point beyond `limit` sigma. */
function beyond(limit: number): Check {
  return (z, i) => {
    const v = z[i];
    if (v === null || Math.abs(v) <= limit) return null;
    return { pointIndices: [i], description: `1 point beyond ${limit} sigma on the ${sideName(v)} side` };
  };
}

/**
 * k of the last m points beyond `limit` sigma on the side of the point that completes the pattern
 * (that point is one of them). Near the start of the chart the window holds the points there are.
 */
function kOfM(k: number, m: number, limit: number): Check {
  return (z, i) => {
    const v = z[i];
    if (v === null || Math.abs(v) <= limit) return null;
    const side = Math.sign(v);
    const hits: number[] = [];
    for (let j = Math.max(0, i - m + 1); j <= i; j++) {
      const w = z[j];
      if (w !== null && side * w > limit) hits.push(j);
    }
    if (hits.length < k) return null;
    return { pointIndices: hits, description: `${k} of ${m} points beyond ${limit} sigma on the ${sideName(side)} side` };
  };
}

/** The last `length` points, all passing `test`. */
function lastRun(z: readonly Z[], i: number, length: number, test: (v: number, j: number) => boolean): number[] | null {
  if (i + 1 < length) return null;
  const indices: number[] = [];
  for (let j = i - length + 1; j <= i; j++) {
    const v = z[j];
    if (v === null || !test(v, j)) return null;
    indices.push(j);
  }
  return indices;
}

/** `length` points in a row on one side of the centre line (a point on the line breaks the run). */
function sameSide(length: number): Check {
  return (z, i) => {
    const v = z[i];
    if (v === null || v === 0) return null;
    const side = Math.sign(v);
    const run = lastRun(z, i, length, (w) => Math.sign(w) === side);
    return run && { pointIndices: run, description: `${length} points in a row ${side > 0 ? 'above' : 'below'} the centre line` };
  };
}

/** `length` points in a row, each higher (or each lower) than the one before. */
function trend(length: number): Check {
  return (z, i) => {
    for (const direction of [1, -1]) {
      const run = lastRun(z, i, length, (w, j) => j === i - length + 1 || (z[j - 1] !== null && direction * (w - (z[j - 1] as number)) > 0));
      if (run) return { pointIndices: run, description: `${length} points in a row steadily ${direction > 0 ? 'increasing' : 'decreasing'}` };
    }
    return null;
  };
}

/** `length` points in a row going up and down in turn. */
function alternating(length: number): Check {
  return (z, i) => {
    const first = i - length + 1;
    const step = (j: number) => (z[j] as number) - (z[j - 1] as number);
    const run = lastRun(z, i, length, (_, j) => j < first + 2 || (z[j - 2] !== null && z[j - 1] !== null && step(j) * step(j - 1) < 0));
    return run && { pointIndices: run, description: `${length} points in a row alternating up and down` };
  };
}

/** `length` points in a row within `limit` sigma of the centre line (either side). */
function hugging(length: number, limit: number): Check {
  return (z, i) => {
    const run = lastRun(z, i, length, (w) => Math.abs(w) < limit);
    return run && { pointIndices: run, description: `${length} points in a row within ${limit} sigma of the centre line` };
  };
}

/** `length` points in a row more than `limit` sigma from the centre line, on either side. */
function avoiding(length: number, limit: number): Check {
  return (z, i) => {
    const run = lastRun(z, i, length, (w) => Math.abs(w) > limit);
    return run && { pointIndices: run, description: `${length} points in a row beyond ${limit} sigma, on either side` };
  };
}

/** The rules of each set, with their wording in REFERENCES.md §7. */
export const RUN_RULES: Record<RunRuleSetName, readonly { rule: string; check: Check }[]> = {
  'western-electric': [
    { rule: 'WE1', check: beyond(3) },
    { rule: 'WE2', check: kOfM(2, 3, 2) },
    { rule: 'WE3', check: kOfM(4, 5, 1) },
    { rule: 'WE4', check: sameSide(8) },
  ],
  nelson: [
    { rule: 'N1', check: beyond(3) },
    { rule: 'N2', check: sameSide(9) },
    { rule: 'N3', check: trend(6) },
    { rule: 'N4', check: alternating(14) },
    { rule: 'N5', check: kOfM(2, 3, 2) },
    { rule: 'N6', check: kOfM(4, 5, 1) },
    { rule: 'N7', check: hugging(15, 1) },
    { rule: 'N8', check: avoiding(8, 1) },
  ],
};

/**
 * Every firing of the set's rules, in point order: a rule fires at each point that completes its
 * pattern, so a run of ten points above the centre line fires the 8-in-a-row rule at its 8th, 9th and
 * 10th point.
 */
export function runRuleSignals(z: readonly Z[], set: RunRuleSetName): RunRuleSignal[] {
  const signals: RunRuleSignal[] = [];
  for (let i = 0; i < z.length; i++) {
    for (const { rule, check } of RUN_RULES[set]) {
      const found = check(z, i);
      if (found) signals.push({ rule, pointIndex: i, ...found });
    }
  }
  return signals;
}
