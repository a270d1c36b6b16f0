import { serverTiming } from '../../../server/components/inspections/routes';
import { parseServerTiming, percentile } from '../../bench/latency';

// W3C Server Timing (www.w3.org/TR/server-timing), examples of the header's syntax (from memory):
// `miss, db;dur=53, app;dur=47.2` and `cache;desc="Cache Read";dur=23.2`.
test('the header syntax of the W3C Server Timing examples is read metric by metric', () => {
  expect(parseServerTiming('miss, db;dur=53, app;dur=47.2')).toEqual([
    { name: 'miss', ms: Number.NaN },
    { name: 'db', ms: 53 },
    { name: 'app', ms: 47.2 },
  ]);
  expect(parseServerTiming('cache;desc="Cache Read";dur=23.2')).toEqual([{ name: 'cache', description: 'Cache Read', ms: 23.2 }]);
});

test('a quoted description may hold commas and semicolons', () => {
  expect(parseServerTiming('pipeline;desc="queue, transfer; run";dur=12.5, store;dur=3')).toEqual([
    { name: 'pipeline', description: 'queue, transfer; run', ms: 12.5 },
    { name: 'store', ms: 3 },
  ]);
});

test('the inspection route’s header names every phase and each engine step with its duration', () => {
  const header = serverTiming(4.04, { lookup: 1.26, decode: 30, pipeline: 210, engine: 190.55, steps: [{ op: 'gaussian', ms: 40 }, { op: 'threshold', ms: 12.3 }], store: 5, evidence: 0, database: 8, reply: 2 });
  expect(parseServerTiming(header).map((m) => [m.name, m.ms, m.description ?? null])).toEqual([
    ['receive', 4, 'photo upload read'],
    ['lookup', 1.3, null],
    ['decode', 30, null],
    ['pipeline', 210, 'worker pool with queue and transfer'],
    ['engine', 190.6, 'inside the worker'],
    ['step-1', 40, 'gaussian'],
    ['step-2', 12.3, 'threshold'],
    ['store', 5, null],
    ['evidence', 0, null],
    ['database', 8, null],
    ['reply', 2, null],
  ]);
});

// Nearest-rank percentile, the smallest value with at least p % of the sample at or below it (one of the
// usual definitions, common practice; worked by hand): of 1..10, p10 is 1, p50 is 5, p95 and p99 are 10.
test('percentiles follow the nearest-rank method', () => {
  const values = [7, 3, 10, 1, 5, 9, 2, 8, 6, 4];
  expect([percentile(values, 10), percentile(values, 50), percentile(values, 95), percentile(values, 99)]).toEqual([1, 5, 10, 10]);
  expect(percentile([], 50)).toBeNaN();
});
