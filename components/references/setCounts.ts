// A reference set's photos counted the same way wherever a set is chosen (the preview, the trial),
// so that the numbers add up to the total everywhere.
import type { ReferenceSet } from '../../shared/api/references';

type Counts = ReferenceSet['counts'];

/** "60 photos: 34 good, 20 defective, 6 retake" (retake and unlabelled only when there are some). */
export function describeSetCounts(counts: Counts): string {
  const parts = [`${counts.good} good`, `${counts.defective} defective`];
  if (counts.retake > 0) parts.push(`${counts.retake} retake`);
  if (counts.unlabelled > 0) parts.push(`${counts.unlabelled} unlabelled`);
  return `${counts.total} photo${counts.total === 1 ? '' : 's'}: ${parts.join(', ')}`;
}
