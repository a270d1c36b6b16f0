// A gauge's limits must be reachable by its measure: the rule document's schema refuses limits that
// would pass or fail every part whatever it measures, and the editor says the same in its field
// labels. Facts of the trade (common practice): counts, areas, lengths and standard deviations are
// never negative, and a share is a fraction from 0 to 1; grey-level figures (mean, lowest, highest)
// may be negative after a derivative step (a Laplacian or a one-direction gradient).
import { limitProblems, screenLimitMessage } from '../../../shared/rules/limits';
import { validateRuleDocument } from '../../../shared/rules/schema';

const rule = (gauge: Record<string, unknown>) => ({
  format: 'kernwright-rule/1',
  name: 'Limits check',
  steps: [{ op: 'threshold', method: 'otsu' }],
  gauges: [{ name: 'Gauge', ...gauge }],
});
const issuesOf = (gauge: Record<string, unknown>) => {
  const result = validateRuleDocument(rule(gauge));
  return result.ok ? [] : result.issues;
};

test.each([
  ['largest-blob-area', { min: -5, max: 100 }, 'gauges[0].limits.min', 'min must be at least 0: "largest-blob-area" is never negative'],
  ['blob-count', { max: -1 }, 'gauges[0].limits.max', 'max must be at least 0: "blob-count" is never negative'],
  ['largest-blob-length', { min: -0.5 }, 'gauges[0].limits.min', 'min must be at least 0: "largest-blob-length" is never negative'],
  ['stddev', { min: -1, max: 3 }, 'gauges[0].limits.min', 'min must be at least 0: "stddev" is never negative'],
  ['edge-fraction', { min: 1.5 }, 'gauges[0].limits.min', 'min must be at most 1: "edge-fraction" is a share from 0 to 1'],
  ['edge-fraction', { max: -0.1 }, 'gauges[0].limits.max', 'max must be at least 0: "edge-fraction" is never negative'],
  ['mean', {}, 'gauges[0].limits', 'limits need "min", "max" or both'],
  ['mean', { min: 5, max: 4 }, 'gauges[0].limits.min', 'min must not exceed max'],
])('%s with limits %j is refused at %s', (measure, limits, path, message) => {
  expect(issuesOf({ measure, limits })).toEqual([{ path, message }]);
});

test.each([
  ['mean', { min: -20, max: -2 }],
  ['min', { min: -300 }],
  ['max', { max: -1 }],
  ['largest-blob-area', { min: 0, max: 0 }],
  ['edge-fraction', { min: 0, max: 1 }],
  ['blob-count', { max: 0 }],
])('%s with limits %j is accepted', (measure, limits) => {
  expect(issuesOf({ measure, limits })).toEqual([]);
});

test('an unreachable limit is reported before a crossed pair, once per limit', () => {
  expect(limitProblems('largest-blob-area', { min: -5, max: -10 })).toEqual([
    { bound: 'min', kind: 'negative' },
    { bound: 'max', kind: 'negative' },
  ]);
});

test('the editor says each problem with its field labels and the measure’s name', () => {
  const say = (measure: string, label: string, limits: { min?: number; max?: number }) => limitProblems(measure, limits).map((p) => screenLimitMessage(p, label));
  expect(say('largest-blob-area', 'Largest blob area', { min: -5 })).toEqual(['Lowest allowed must be at least 0: largest blob area is never negative.']);
  expect(say('edge-fraction', 'Share of mask pixels', { max: 2 })).toEqual(['Highest allowed must be at most 1: share of mask pixels is a fraction from 0 to 1.']);
  expect(say('mean', 'Mean value', { min: 3, max: 1 })).toEqual(['Lowest allowed must not be above highest allowed.']);
  expect(say('mean', 'Mean value', {})).toEqual(['Set a lowest allowed value, a highest, or both.']);
});
