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
  expect(rows[0].after).toBe('Median: 3×3 px');
});

test('a changed parameter is one changed step; a dropped step is removed under its former number', () => {
  const changed = stepRows(rule([GAUSSIAN, SOBEL, OTSU]), rule([{ ...GAUSSIAN, sigma: 2 }, SOBEL, OTSU]));
  expect(changed[0]).toEqual({ section: 'Steps', label: 'Step 1', before: 'Gaussian smoothing: sigma 1.2 px', after: 'Gaussian smoothing: sigma 2 px', change: 'changed' });
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
  expect(added?.after).toBe('measures: Largest blob area; unit: px²; limits: 20 to 350');
});

test('settings, measures, steps and regions read in the editor’s words, not the document’s codes', () => {
  const before = { ...rule([GAUSSIAN, OTSU]), input: { channel: 'luma' }, border: 'reflect' };
  const after = {
    ...rule([GAUSSIAN, OTSU]),
    input: { channel: 'green' },
    border: 'constant',
    gauges: [{ name: 'Edge area', measure: 'edge-fraction', step: 1, region: { shape: 'rect', x: 0.25, y: 0.1, w: 0.5, h: 0.8 }, limits: { max: 0.2 } }],
  };
  const rows = diffRuleDocuments(before, after);
  const byLabel = (label: string) => rows.find((r) => r.label === label);
  expect(byLabel('Photo channel')).toMatchObject({ before: 'Grey (luma, BT.601)', after: 'Green only', change: 'changed' });
  expect(byLabel('Beyond the edge')).toMatchObject({ before: 'Mirror', after: 'Black', change: 'changed' });
  expect(byLabel('Edge area · measures')).toMatchObject({ before: 'Largest blob area', after: 'Share of mask pixels' });
  expect(byLabel('Edge area · measured on')).toMatchObject({ before: 'the last step', after: 'Step 1' });
  expect(byLabel('Edge area · region')).toMatchObject({ before: 'Whole photo', after: 'Rectangle: 25 % from the left, 10 % from the top, 50 % wide, 80 % high' });
  expect(byLabel('Edge area · unit')).toMatchObject({ before: 'px²', after: '—' });
  const steps = rows.filter((r) => r.section === 'Steps').map((r) => r.after);
  expect(steps).toEqual(['Gaussian smoothing: sigma 1.2 px', 'Threshold: Otsu']);
  const words = rows.flatMap((r) => [r.before, r.after]).join(' ');
  for (const code of ['reflect', 'edge-fraction', 'largest-blob-area', 'px2', '"x"', 'shape']) expect(words).not.toContain(code);
});

test('a document part the schema does not know still reads, as its JSON', () => {
  const odd = { ...rule([{ op: 'unsharp', amount: 2 }]), border: 'wrap' };
  const rows = diffRuleDocuments(null, odd);
  expect(rows.find((r) => r.label === 'Step 1')?.after).toBe('unsharp: amount 2');
  expect(rows.find((r) => r.label === 'Beyond the edge')?.after).toBe('wrap');
});
