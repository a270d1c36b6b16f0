// Every invalid rule document is refused with the JSON path of the problem
// (DESIGN.md, "Rule file format, version 1": strict objects, unknown fields named).
import { validateRuleDocument } from '../../../shared/rules/schema';

const valid = {
  format: 'kernwright-rule/1',
  name: 'Washer rim burr',
  input: { channel: 'luma' },
  border: 'reflect',
  quality: { minFocus: 40, maxClipped: 0.02, minMean: 30 },
  steps: [
    { op: 'gaussian', sigma: 1.2 },
    { op: 'gradient', operator: 'sobel', output: 'magnitude' },
    { op: 'threshold', method: 'otsu' },
    { op: 'open', radius: 1 },
  ],
  gauges: [
    {
      name: 'Burr area',
      measure: 'largest-blob-area',
      region: { shape: 'rect', x: 0.1, y: 0.1, w: 0.8, h: 0.8 },
      unit: 'mm2',
      limits: { max: 0.5 },
    },
  ],
};

type Doc = Record<string, unknown>;
const withStep = (step: unknown): Doc => ({ ...valid, steps: [step] });
const withGauge = (gauge: Record<string, unknown>): Doc => ({ ...valid, gauges: [{ ...valid.gauges[0], ...gauge }] });

test('the example document of the design is valid, and defaults fill input and border', () => {
  const result = validateRuleDocument(valid);
  expect(result.ok).toBe(true);
  const minimal = validateRuleDocument({ format: 'kernwright-rule/1', name: 'x', steps: [], gauges: [] });
  expect(minimal.ok && minimal.rule.border).toBe('reflect');
  expect(minimal.ok && minimal.rule.input.channel).toBe('luma');
});

const refusals: [string, unknown, string][] = [
  ['an unknown top-level field', { ...valid, colour: 'red' }, 'colour'],
  ['an unknown field in a step', withStep({ op: 'gaussian', sigma: 1, size: 3 }), 'steps[0].size'],
  ['an unknown field in a region', withGauge({ region: { shape: 'rect', x: 0, y: 0, w: 1, h: 1, angle: 5 } }), 'gauges[0].region.angle'],
  ['a wrong format', { ...valid, format: 'kernwright-rule/2' }, 'format'],
  ['a missing name', { ...valid, name: undefined }, 'name'],
  ['a missing op', withStep({ sigma: 1 }), 'steps[0].op'],
  ['an unknown op', withStep({ op: 'blur', sigma: 1 }), 'steps[0].op'],
  ['an even kernel size', withStep({ op: 'kernel', matrix: [[1, 1], [1, 1]] }), 'steps[0].matrix'],
  ['an even kernel width', withStep({ op: 'kernel', matrix: [[1, 1], [1, 1], [1, 1]] }), 'steps[0].matrix[0]'],
  ['ragged kernel rows', withStep({ op: 'kernel', matrix: [[1, 2, 1], [1, 1], [1, 2, 1]] }), 'steps[0].matrix[1]'],
  ['a kernel too large', withStep({ op: 'kernel', matrix: Array(33).fill(Array(3).fill(1)) }), 'steps[0].matrix'],
  ['divisor 0', withStep({ op: 'kernel', matrix: [[1]], divisor: 0 }), 'steps[0].divisor'],
  ['a library kernel with a matrix', withStep({ op: 'kernel', kernel: 'sobel-x', matrix: [[1]] }), 'steps[0].matrix'],
  ['a kernel step with neither name nor matrix', withStep({ op: 'kernel' }), 'steps[0].kernel'],
  ['NaN in a kernel', withStep({ op: 'kernel', matrix: [[1, NaN, 1]] }), 'steps[0].matrix[0][1]'],
  ['sigma below 0.3', withStep({ op: 'gaussian', sigma: 0.2 }), 'steps[0].sigma'],
  ['sigma above 10', withStep({ op: 'log', sigma: 12 }), 'steps[0].sigma'],
  ['sigma NaN', withStep({ op: 'gaussian', sigma: NaN }), 'steps[0].sigma'],
  ['sigma as text', withStep({ op: 'gaussian', sigma: '1' }), 'steps[0].sigma'],
  ['an even box size', withStep({ op: 'box', size: 4 }), 'steps[0].size'],
  ['a median too large', withStep({ op: 'median', size: 17 }), 'steps[0].size'],
  ['an unknown gradient operator', withStep({ op: 'gradient', operator: 'roberts', output: 'x' }), 'steps[0].operator'],
  ['an unknown gradient output', withStep({ op: 'gradient', operator: 'sobel', output: 'angle' }), 'steps[0].output'],
  ['6 neighbours', withStep({ op: 'laplacian', neighbours: 6 }), 'steps[0].neighbours'],
  ['an unknown threshold method', withStep({ op: 'threshold', method: 'triangle' }), 'steps[0].method'],
  ['a fixed threshold without a value', withStep({ op: 'threshold', method: 'fixed' }), 'steps[0].value'],
  ['an even adaptive size', withStep({ op: 'threshold', method: 'adaptive-mean', size: 10, c: 2 }), 'steps[0].size'],
  ['radius 0', withStep({ op: 'erode', radius: 0 }), 'steps[0].radius'],
  ['a fractional radius', withStep({ op: 'close', radius: 1.5 }), 'steps[0].radius'],
  ['a bad border', { ...valid, border: 'wrap' }, 'border'],
  ['a bad channel', { ...valid, input: { channel: 'alpha' } }, 'input.channel'],
  ['maxClipped above 1', { ...valid, quality: { maxClipped: 2 } }, 'quality.maxClipped'],
  ['a bad gauge unit', withGauge({ unit: 'cm2' }), 'gauges[0].unit'],
  ['a length unit on an area', withGauge({ unit: 'mm' }), 'gauges[0].unit'],
  ['a unit on a unitless measure', withGauge({ measure: 'blob-count', unit: 'px' }), 'gauges[0].unit'],
  ['an unknown measure', withGauge({ measure: 'perimeter' }), 'gauges[0].measure'],
  ['empty limits', withGauge({ limits: {} }), 'gauges[0].limits'],
  ['min above max', withGauge({ limits: { min: 3, max: 1 } }), 'gauges[0].limits.min'],
  ['a step that does not exist', withGauge({ step: 9 }), 'gauges[0].step'],
  ['a rect past the right edge', withGauge({ region: { shape: 'rect', x: 0.5, y: 0, w: 0.6, h: 1 } }), 'gauges[0].region.w'],
  ['a circle without radius', withGauge({ region: { shape: 'circle', cx: 0.5, cy: 0.5 } }), 'gauges[0].region.r'],
  ['an unknown region shape', withGauge({ region: { shape: 'polygon' } }), 'gauges[0].region.shape'],
  ['two gauges with one name', { ...valid, gauges: [valid.gauges[0], valid.gauges[0]] }, 'gauges[1].name'],
  ['steps missing', { ...valid, steps: undefined }, 'steps'],
  ['a missing name (absent)', (({ name: _n, ...rest }) => rest)(valid), 'name'],
];

test.each(refusals.map(([label, document, path]) => [label, path, document] as const))('%s is refused at %s', (_label, path, document) => {
  const result = validateRuleDocument(document);
  expect(result.ok).toBe(false);
  if (!result.ok) {
    expect(result.issues.map((i) => i.path)).toContain(path);
    for (const issue of result.issues) expect(issue.message.length).toBeGreaterThan(0);
  }
});

test('something that is not an object is refused at the root', () => {
  for (const input of [null, 42, 'rule', []]) {
    const result = validateRuleDocument(input);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.issues[0].path).toBe('(root)');
  }
});
