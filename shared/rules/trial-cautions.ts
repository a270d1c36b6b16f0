// What a trial's figures say against releasing its rule as it is: shown where the rule is submitted
// and released (a wrong PASS ships a bad part), and kept with the release's audit event.
import type { TrialSummary } from '../api/trials';

const percent = (rate: number) => `${(rate * 100).toFixed(1)} %`;
const parts = (n: number) => `${n} defective part${n === 1 ? '' : 's'}`;

/** Plain-language cautions from a finished trial's summary; none when the trial gives no cause. */
export function trialCautions(summary: Pick<TrialSummary, 'escapeRate'>): string[] {
  const { count, of, rate } = summary.escapeRate;
  if (of === 0) return ['The trial had no photos labelled defective: it cannot show that the rule catches a defect.'];
  if (count === 0) return [];
  return [`In its trial the rule passed ${count} of ${parts(of)} (escape rate ${percent(rate ?? count / of)}): released as it is, it would ship parts like them.`];
}
