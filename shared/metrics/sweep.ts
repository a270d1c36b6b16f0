// Sweeping one gauge's limit over a trial's results: false reject rate against escape rate at each
// candidate limit (an ROC-style curve; T. Fawcett, Pattern Recognition Letters 27(8), 2006).
import type { TruthLabel } from './agreement';

export interface SweepInput {
  label: TruthLabel;
  /** The quality gate asked for a retake: the verdict stays RETAKE whatever the limit. */
  retake: boolean;
  /** The swept gauge's value on this image. */
  value: number;
  /** Whether every other gauge passed. */
  othersPass: boolean;
}

export interface SweepPoint {
  limit: number;
  falseRejects: number;
  escapes: number;
  falseRejectRate: number | null;
  escapeRate: number | null;
}

/** One point per distinct value (thinned to at most `maxPoints`), plus one that rejects everything. */
export function sweepLimit(inputs: readonly SweepInput[], bound: 'min' | 'max', maxPoints = 200): SweepPoint[] {
  const judged = inputs.filter((i) => !i.retake && (i.label === 'good' || i.label === 'defective') && Number.isFinite(i.value));
  const values = [...new Set(judged.map((i) => i.value))].sort((a, b) => a - b);
  if (values.length === 0) return [];
  const step = Math.max(1, Math.ceil(values.length / maxPoints));
  const candidates = values.filter((_, i) => i % step === 0 || i === values.length - 1);
  // A limit just past the extreme value, where the gauge rejects every judged part.
  const span = Math.max(Math.abs(values[values.length - 1] - values[0]), 1) * 1e-6;
  candidates.push(bound === 'max' ? values[0] - span : values[values.length - 1] + span);
  const good = judged.filter((i) => i.label === 'good');
  const defective = judged.filter((i) => i.label === 'defective');
  const fails = (i: SweepInput, limit: number) => !i.othersPass || (bound === 'max' ? i.value > limit : i.value < limit);
  return candidates
    .map((limit) => {
      const falseRejects = good.filter((i) => fails(i, limit)).length;
      const escapes = defective.filter((i) => !fails(i, limit)).length;
      return {
        limit,
        falseRejects,
        escapes,
        falseRejectRate: good.length ? falseRejects / good.length : null,
        escapeRate: defective.length ? escapes / defective.length : null,
      };
    })
    .sort((a, b) => a.limit - b.limit);
}
