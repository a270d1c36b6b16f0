// What changed between two rule documents: steps are paired by their longest common subsequence,
// so an inserted step does not make every later step look changed.
import fc from 'fast-check';
import { alignSteps, diffRuleDocuments } from '../../../shared/rules/diff';

const rule = (steps: object[], max = 500) => ({
  format: 'kernwright-rule/1',
  name: 'Bracket edge',
  steps,
  gauges: [{ name: 'Edge area', measure: 'largest-blob-area', unit: 'px2', limits: { max } }],
});
const GAUSSIAN = { op: 'gaussian', sigma: 1.2 };
const SOBEL = { op: 'gradient', operator: 'sobel', output: 'magnitude' };
const OTSU = { op: 'threshold', method: 'otsu' };
const MEDIAN = { op: 'median', size: 3 };

const stepRows = (before: object | null, after: object) => diffRuleDocuments(before, after).filter((r) => r.section === 'Steps');

test('the pairing keeps a longest common subsequence (CLRS 3rd ed. §15.4 example, from memory: ABCBDAB and BDCABA share 4)', () => {
  const pairs = alignSteps([...'ABCBDAB'], [...'BDCABA']);
  const kept = pairs.filter((p) => p.i !== null && p.j !== null && 'ABCBDAB'[p.i] === 'BDCABA'[p.j]);
  expect(kept).toHaveLength(4);
});

test('a step put in front shows as one added step; the steps after it are the same, renumbered', () => {
  const rows = stepRows(rule([GAUSSIAN, SOBEL, OTSU]), rule([MEDIAN, GAUSSIAN, SOBEL, OTSU]));
  expect(rows.map((r) => [r.label, r.change])).toEqual([
    ['Step 1', 'added'],
    ['Step 2 (was 1)', 'same'],
    ['Step 3 (was 2)', 'same'],
    ['Step 4 (was 3)', 'same'],
  ]);
  expect(rows[0].after).toBe('median: size 3');
});

test('a changed parameter is one changed step; a dropped step is removed under its former number', () => {
  const changed = stepRows(rule([GAUSSIAN, SOBEL, OTSU]), rule([{ ...GAUSSIAN, sigma: 2 }, SOBEL, OTSU]));
  expect(changed[0]).toEqual({ section: 'Steps', label: 'Step 1', before: 'gaussian: sigma 1.2', after: 'gaussian: sigma 2', change: 'changed' });
  expect(changed.slice(1).map((r) => r.change)).toEqual(['same', 'same']);
  const dropped = stepRows(rule([GAUSSIAN, SOBEL, OTSU]), rule([GAUSSIAN, OTSU]));
  expect(dropped.map((r) => [r.label, r.change])).toEqual([
    ['Step 1', 'same'],
    ['Former step 2', 'removed'],
    ['Step 2 (was 3)', 'same'],
  ]);
});

test('a first version (nothing before it) lists every step as added', () => {
  expect(stepRows(null, rule([GAUSSIAN, OTSU])).map((r) => r.change)).toEqual(['added', 'added']);
});

test('every step of both versions appears exactly once, in order on both sides', () => {
  const steps = fc.array(fc.constantFrom('a', 'b', 'c', 'd'), { maxLength: 8 });
  fc.assert(
    fc.property(steps, steps, (before, after) => {
      const pairs = alignSteps(before, after);
      const is = pairs.flatMap((p) => (p.i === null ? [] : [p.i]));
      const js = pairs.flatMap((p) => (p.j === null ? [] : [p.j]));
      expect(is).toEqual(before.map((_, k) => k));
      expect(js).toEqual(after.map((_, k) => k));
    }),
  );
});

test('identical pipelines pair every step with itself', () => {
  fc.assert(
    fc.property(fc.array(fc.constantFrom('a', 'b', 'c'), { maxLength: 10 }), (steps) => {
      expect(alignSteps(steps, steps)).toEqual(steps.map((_, k) => ({ i: k, j: k })));
    }),
  );
});

test('limits read as the other screens write them, and the quality gate under the editor’s names', () => {
  const before = { ...rule([GAUSSIAN, OTSU]), quality: { minFocus: 10 } };
  const after = { ...rule([GAUSSIAN, OTSU], 350), quality: { minFocus: 12 } };
  after.gauges = [{ ...after.gauges[0], limits: { min: 20, max: 350 } } as (typeof after.gauges)[number]];
  const rows = diffRuleDocuments(before, after);
  expect(rows.find((r) => r.label === 'Edge area · limits')).toMatchObject({ before: 'at most 500', after: '20 to 350', change: 'changed' });
  expect(rows.find((r) => r.label === 'Quality gate: lowest focus')).toMatchObject({ before: '10', after: '12', change: 'changed' });
  const added = diffRuleDocuments(null, after).find((r) => r.label === 'Edge area');
  expect(added?.after).toBe('measure: largest-blob-area; unit: px2; limits: 20 to 350');
});
