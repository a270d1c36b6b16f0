// p-chart of the defect fraction with control limits that vary with each subgroup's size
// (NIST/SEMATECH e-Handbook of Statistical Methods §6.3.3.2, "Proportions Control Charts").

/** Parts judged and parts failed in one subgroup (a day or a shift). */
export interface Subgroup {
  n: number;
  defectives: number;
}

export interface PChartLimits {
  p: number;
  /** Centre ± 3 sigma of this subgroup, LCL floored at 0 and UCL capped at 1. */
  ucl: number;
  lcl: number;
  /** sqrt(p̄(1 − p̄)/n) of this subgroup. */
  sigma: number;
  /** (p − p̄)/sigma, the point in sigma units; null when p̄ is 0 or 1 (no spread to measure against). */
  z: number | null;
}

export interface PChartResult<T extends Subgroup> {
  /** p̄ = Σ defectives / Σ n, or null when no part was judged. */
  center: number | null;
  /** The subgroups with n > 0, in the order given, each with its limits. */
  points: (T & PChartLimits)[];
}

/** Limits of every subgroup against the pooled fraction p̄; subgroups with n = 0 are left out. */
export function pChart<T extends Subgroup>(subgroups: readonly T[]): PChartResult<T> {
  const judged = subgroups.filter((s) => s.n > 0);
  for (const s of judged) {
    if (!Number.isInteger(s.n) || !Number.isInteger(s.defectives) || s.defectives < 0 || s.defectives > s.n)
      throw new RangeError(`A subgroup needs whole counts with 0 <= defectives <= n; got ${s.defectives} of ${s.n}`);
  }
  const total = judged.reduce((sum, s) => sum + s.n, 0);
  if (total === 0) return { center: null, points: [] };
  const center = judged.reduce((sum, s) => sum + s.defectives, 0) / total;
  const spread = center * (1 - center);
  return {
    center,
    points: judged.map((s) => {
      const p = s.defectives / s.n;
      const sigma = Math.sqrt(spread / s.n);
      return {
        ...s,
        p,
        ucl: Math.min(1, center + 3 * sigma),
        lcl: Math.max(0, center - 3 * sigma),
        sigma,
        z: sigma > 0 ? (p - center) / sigma : null,
      };
    }),
  };
}
