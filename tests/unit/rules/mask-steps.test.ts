// Which step outputs are 0/1 masks, for the gauge editor's caution on mask measures (DESIGN.md:
// edge fraction and blobs are of a mask's non-zero pixels; a threshold's output is a mask, and
// morphology works on masks).
import { outputsMask } from '../../../components/rules/stepCatalogue';
import type { Step } from '../../../shared/rules/schema';

const threshold: Step = { op: 'threshold', method: 'otsu' };
const log: Step = { op: 'log', sigma: 2 };
const open: Step = { op: 'open', radius: 1 };
const median: Step = { op: 'median', size: 3 };
const gaussian: Step = { op: 'gaussian', sigma: 1 };

test('the photo and value steps are not masks; a threshold is, and morphology and the median keep it one', () => {
  expect(outputsMask([])).toBe(false);
  expect(outputsMask([gaussian, log])).toBe(false);
  expect(outputsMask([log, threshold])).toBe(true);
  expect(outputsMask([threshold, open, median])).toBe(true);
  expect(outputsMask([threshold, gaussian])).toBe(false);
  expect(outputsMask([threshold, log, open])).toBe(false);
  expect(outputsMask([open])).toBe(false);
});
