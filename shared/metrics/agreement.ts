// Figures that say how well a rule's verdicts agree with labels (trials) or with people (agreement studies).
// Positive = defective part (T. Fawcett, "An introduction to ROC analysis", Pattern Recognition Letters 27(8), 2006).

export const TRUTH_LABELS = ['good', 'defective', 'retake'] as const;
export type TruthLabel = (typeof TRUTH_LABELS)[number];
export const VERDICT_VALUES = ['PASS', 'FAIL', 'RETAKE'] as const;
export type VerdictValue = (typeof VERDICT_VALUES)[number];

/** The verdict that agrees with each label. */
export const EXPECTED_VERDICT: Record<TruthLabel, VerdictValue> = { good: 'PASS', defective: 'FAIL', retake: 'RETAKE' };

/** Rows: label; columns: verdict. */
export type ConfusionTable = Record<TruthLabel, Record<VerdictValue, number>>;

export function emptyTable(): ConfusionTable {
  return {
    good: { PASS: 0, FAIL: 0, RETAKE: 0 },
    defective: { PASS: 0, FAIL: 0, RETAKE: 0 },
    retake: { PASS: 0, FAIL: 0, RETAKE: 0 },
  };
}

export function confusionTable(pairs: Iterable<{ label: TruthLabel; verdict: VerdictValue }>): ConfusionTable {
  const table = emptyTable();
  for (const { label, verdict } of pairs) table[label][verdict] += 1;
  return table;
}

export interface Proportion {
  count: number;
  of: number;
  /** count / of, or null when of = 0. */
  rate: number | null;
  /** 95 % Wilson score interval; null when of = 0. */
  low: number | null;
  high: number | null;
}

/** z for a two-sided 95 % interval: Φ⁻¹(0.975). */
export const Z_95 = 1.959963984540054;

/**
 * Wilson score interval for a binomial proportion (E. B. Wilson, "Probable inference, the law of
 * succession, and statistical inference", JASA 22(158):209–212, 1927).
 */
export function wilsonInterval(count: number, of: number, z = Z_95): Proportion {
  if (of === 0) return { count, of, rate: null, low: null, high: null };
  const p = count / of;
  const z2 = z * z;
  const centre = (p + z2 / (2 * of)) / (1 + z2 / of);
  const half = (z / (1 + z2 / of)) * Math.sqrt((p * (1 - p)) / of + z2 / (4 * of * of));
  return { count, of, rate: p, low: Math.max(0, centre - half), high: Math.min(1, centre + half) };
}

/**
 * Cohen's kappa for a square table of two raters' counts (J. Cohen, "A coefficient of agreement for
 * nominal scales", Educational and Psychological Measurement 20(1):37–46, 1960): (p_o − p_e)/(1 − p_e).
 */
export function cohensKappa(matrix: readonly (readonly number[])[]): number | null {
  const k = matrix.length;
  const n = matrix.reduce((sum, row) => sum + row.reduce((a, b) => a + b, 0), 0);
  if (n === 0) return null;
  let observed = 0;
  let expected = 0;
  for (let i = 0; i < k; i++) {
    observed += matrix[i][i];
    const rowTotal = matrix[i].reduce((a, b) => a + b, 0);
    const colTotal = matrix.reduce((a, row) => a + row[i], 0);
    expected += (rowTotal * colTotal) / n;
  }
  const po = observed / n;
  const pe = expected / n;
  if (pe === 1) return po === 1 ? 1 : null;
  return (po - pe) / (1 - pe);
}

export interface TrialFigures {
  table: ConfusionTable;
  images: number;
  /** Share of images whose verdict is the one their label expects. */
  agreement: Proportion;
  /** Good parts rejected: good → FAIL, of good parts judged PASS or FAIL. */
  falseRejectRate: Proportion;
  /** Defective parts passed: defective → PASS, of defective parts judged PASS or FAIL. */
  escapeRate: Proportion;
  /** Usable photos (good or defective) the quality gate sent back. */
  retakeRate: Proportion;
  /** Cohen's kappa of verdicts against labels over the 3×3 table. */
  kappa: number | null;
}

export function trialFigures(table: ConfusionTable): TrialFigures {
  const images = TRUTH_LABELS.reduce((sum, l) => sum + VERDICT_VALUES.reduce((s, v) => s + table[l][v], 0), 0);
  const agreeing = TRUTH_LABELS.reduce((sum, l) => sum + table[l][EXPECTED_VERDICT[l]], 0);
  const g = table.good;
  const d = table.defective;
  const usable = g.PASS + g.FAIL + g.RETAKE + d.PASS + d.FAIL + d.RETAKE;
  const matrix = TRUTH_LABELS.map((l) => VERDICT_VALUES.map((v) => table[l][v]));
  return {
    table,
    images,
    agreement: wilsonInterval(agreeing, images),
    falseRejectRate: wilsonInterval(g.FAIL, g.PASS + g.FAIL),
    escapeRate: wilsonInterval(d.PASS, d.PASS + d.FAIL),
    retakeRate: wilsonInterval(g.RETAKE + d.RETAKE, usable),
    kappa: cohensKappa(matrix),
  };
}
