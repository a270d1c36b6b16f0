// Attribute agreement of a pass/fail inspection with a qualified person's judgement, and the acceptance
// bands of the AIAG Measurement Systems Analysis manual (4th ed., 2010; REFERENCES.md §9).
import { cohensKappa } from './agreement';

export type Acceptance = 'acceptable' | 'marginal' | 'unacceptable';

/** Judged pairs, "defective" being the positive class; RETAKEs are counted apart. */
export interface AttributeCounts {
  defectiveFailed: number;
  defectivePassed: number;
  goodFailed: number;
  goodPassed: number;
  retakes: number;
}

export interface Figure {
  value: number | null;
  acceptance: Acceptance | null;
}

export interface AttributeFigures {
  /** Correct decisions / all decisions. */
  effectiveness: Figure;
  /** Defective parts passed / defective parts. */
  missRate: Figure;
  /** Good parts failed / good parts. */
  falseAlarmRate: Figure;
  kappa: Figure;
}

/** AIAG: effectiveness ≥ 90 % acceptable, ≥ 80 % marginal; miss rate ≤ 2 % / ≤ 5 %; false-alarm rate ≤ 5 % / ≤ 10 %. */
export const AIAG_BANDS = {
  effectiveness: { acceptable: 0.9, marginal: 0.8 },
  missRate: { acceptable: 0.02, marginal: 0.05 },
  falseAlarmRate: { acceptable: 0.05, marginal: 0.1 },
  /** Kappa ≥ 0.75 good agreement, < 0.40 poor (AIAG, as quoted in Minitab's help). */
  kappa: { acceptable: 0.75, marginal: 0.4 },
} as const;

/** A figure on a band's edge meets it, though floating point may put it a hair's breadth short (κ = 0.4 computes as 0.39999…). */
const EDGE = 1e-9;

const atLeast = (value: number | null, bands: { acceptable: number; marginal: number }): Figure => ({
  value,
  acceptance: value === null ? null : value >= bands.acceptable - EDGE ? 'acceptable' : value >= bands.marginal - EDGE ? 'marginal' : 'unacceptable',
});

const atMost = (value: number | null, bands: { acceptable: number; marginal: number }): Figure => ({
  value,
  acceptance: value === null ? null : value <= bands.acceptable + EDGE ? 'acceptable' : value <= bands.marginal + EDGE ? 'marginal' : 'unacceptable',
});

const share = (count: number, of: number) => (of === 0 ? null : count / of);

export function attributeFigures(c: AttributeCounts): AttributeFigures {
  const defective = c.defectiveFailed + c.defectivePassed;
  const good = c.goodFailed + c.goodPassed;
  return {
    effectiveness: atLeast(share(c.defectiveFailed + c.goodPassed, defective + good), AIAG_BANDS.effectiveness),
    missRate: atMost(share(c.defectivePassed, defective), AIAG_BANDS.missRate),
    falseAlarmRate: atMost(share(c.goodFailed, good), AIAG_BANDS.falseAlarmRate),
    kappa: atLeast(
      cohensKappa([
        [c.defectiveFailed, c.defectivePassed],
        [c.goodFailed, c.goodPassed],
      ]),
      AIAG_BANDS.kappa,
    ),
  };
}
