/**
 * How far a rule's verdicts agree with the demo truth: the 3x3 confusion matrix of truth label against
 * verdict. Terms after T. Fawcett, "An introduction to ROC analysis", Pattern Recognition Letters 27(8), 2006.
 */
import type { Verdict } from '../../../shared/vision/pipeline';
import type { Label } from '../../demo/types';

export const LABELS: readonly Label[] = ['good', 'defective', 'retake'];
export const VERDICTS: readonly Verdict[] = ['PASS', 'FAIL', 'RETAKE'];

/** The verdict a rule should give a photo with this truth label. */
export const EXPECTED_VERDICT: Readonly<Record<Label, Verdict>> = { good: 'PASS', defective: 'FAIL', retake: 'RETAKE' };

/** counts[label][verdict]: rows are the truth, columns the rule's verdict. */
export type ConfusionMatrix = Record<Label, Record<Verdict, number>>;

export function emptyConfusionMatrix(): ConfusionMatrix {
  const row = () => ({ PASS: 0, FAIL: 0, RETAKE: 0 });
  return { good: row(), defective: row(), retake: row() };
}

export function countVerdict(matrix: ConfusionMatrix, label: Label, verdict: Verdict): void {
  matrix[label][verdict]++;
}

export function totalCount(matrix: ConfusionMatrix): number {
  return LABELS.reduce((sum, label) => sum + VERDICTS.reduce((row, verdict) => row + matrix[label][verdict], 0), 0);
}

/** Share of photos whose verdict is the one their label calls for (accuracy over the diagonal). */
export function agreement(matrix: ConfusionMatrix): number {
  const total = totalCount(matrix);
  const agreeing = LABELS.reduce((sum, label) => sum + matrix[label][EXPECTED_VERDICT[label]], 0);
  return total === 0 ? Number.NaN : agreeing / total;
}

/** Good parts rejected over all good parts judged PASS or FAIL (false positives over negatives). */
export function falseRejectRate(matrix: ConfusionMatrix): number {
  const { PASS, FAIL } = matrix.good;
  return FAIL / (PASS + FAIL);
}

/** Defective parts passed over all defective parts judged PASS or FAIL (false negatives over positives). */
export function escapeRate(matrix: ConfusionMatrix): number {
  const { PASS, FAIL } = matrix.defective;
  return PASS / (PASS + FAIL);
}

/** The matrix as a small text table, truth down the side and verdicts across. */
export function formatConfusionMatrix(matrix: ConfusionMatrix): string {
  const cell = (text: string | number) => String(text).padStart(8);
  const lines = [`${'truth \\ verdict'.padEnd(16)}${VERDICTS.map(cell).join('')}`];
  for (const label of LABELS) lines.push(`${label.padEnd(16)}${VERDICTS.map((v) => cell(matrix[label][v])).join('')}`);
  return lines.join('\n');
}
