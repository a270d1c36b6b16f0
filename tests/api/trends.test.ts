// Trends for supervisors (issue 7): p-chart of the defect fraction with run rules, Pareto of causes and the
// worst stations, each point and bar opening exactly the inspections behind it in the records list.
import request from 'supertest';
import { recordPageSchema } from '../../shared/api/records';
import { paretoSchema, pChartSchema, trendChoicesSchema } from '../../shared/api/trends';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';
import { SPOT_RULE, spotPhoto } from '../support/photos';

let t: TestApp;
let supervisor: { Authorization: string };
let ruleId: string;
let stationA: string;
let stationB: string;
let stationC: string;
let lineB: string;

type Row = { station: string; at: string; verdict: 'PASS' | 'FAIL' | 'RETAKE'; cause?: string; partType?: string };

// Station A, five days of October 2026: parts judged n and failed d per day (plus two RETAKEs a day).
const A_DAYS = [
  { day: '2026-10-01', n: 20, d: 2 },
  { day: '2026-10-02', n: 20, d: 1 },
  { day: '2026-10-03', n: 40, d: 4 },
  { day: '2026-10-04', n: 40, d: 14 },
  { day: '2026-10-05', n: 20, d: 2 },
];

function stationARows(): Row[] {
  return A_DAYS.flatMap(({ day, n, d }) => [
    // Every third failure is a spot count, the others a spot area; times spread from 06:00 to 21:59.
    ...Array.from({ length: n }, (_, i): Row => ({
      station: stationA,
      at: `${day}T${String(6 + (i % 16)).padStart(2, '0')}:${String((i * 7) % 60).padStart(2, '0')}:00Z`,
      verdict: i < d ? 'FAIL' : 'PASS',
      cause: i < d ? (i % 3 === 2 ? 'Spot count' : 'Spot area') : undefined,
    })),
    { station: stationA, at: `${day}T09:30:00Z`, verdict: 'RETAKE', cause: 'mean' },
    { station: stationA, at: `${day}T17:30:00Z`, verdict: 'RETAKE', cause: 'focus' },
  ]);
}

async function insertRows(rows: Row[]): Promise<void> {
  const [version] = await t.db.dataSource.query(`select id from rule_versions where rule_id = $1 and state = 'released'`, [ruleId]);
  const [operator] = await t.db.dataSource.query(`select id from users where username = 'tomas'`);
  await t.db.dataSource.query(
    `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, cause, quality, duration_ms, created_at)
     select 'sql-' || gen_random_uuid(), $1, $2, r.station, s.line_id, r.part_type, $3, repeat('a', 64), r.verdict, r.cause, '{}', 5, r.at
     from unnest($4::uuid[], $5::timestamptz[], $6::text[], $7::text[], $8::text[]) as r(station, at, verdict, cause, part_type)
     join stations s on s.id = r.station`,
    [version.id, ruleId, operator.id, rows.map((r) => r.station), rows.map((r) => r.at), rows.map((r) => r.verdict), rows.map((r) => r.cause ?? null), rows.map((r) => r.partType ?? 'plate')],
  );
}

/** How many inspections the records list shows for a query (all pages). */
async function recordCount(query: Record<string, string>): Promise<number> {
  let count = 0;
  let after: string | null = null;
  do {
    const res = await request(t.app)
      .get('/api/records/inspections')
      .query({ ...query, limit: '500', ...(after ? { after } : {}) })
      .set(supervisor);
    expect(res.status).toBe(200);
    const page = recordPageSchema.parse(res.body);
    count += page.items.length;
    after = page.next;
  } while (after);
  return count;
}

const judgedCount = async (query: Record<string, string>) => (await recordCount({ ...query, verdict: 'PASS' })) + (await recordCount({ ...query, verdict: 'FAIL' }));

beforeAll(async () => {
  t = await createTestApp();
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  const engineer = await t.createUser('ines', ['engineer']);
  const mara = await t.createUser('mara', ['supervisor']);
  const tomas = await t.createUser('tomas', ['operator']);
  await t.createUser('kofi', ['auditor']);
  supervisor = { Authorization: `Bearer ${await t.tokenFor('mara')}` };
  const { rules, stations, inspections } = t.services;
  const line1 = await stations.createLine(mara, { name: 'Line 1' });
  const line2 = await stations.createLine(mara, { name: 'Line 2' });
  lineB = line2.id;
  stationA = (await stations.createStation(mara, { lineId: line1.id, name: 'Press 1', cameraNote: '' })).id;
  stationB = (await stations.createStation(mara, { lineId: line2.id, name: 'Lathe 4', cameraNote: '' })).id;
  stationC = (await stations.createStation(mara, { lineId: line2.id, name: 'Lathe 5', cameraNote: '' })).id;
  const rule = await rules.create(engineer, { name: 'Plate spots', partType: 'plate', smallestDefectMm: null, document: SPOT_RULE });
  ruleId = rule.id;
  const versionId = rule.versions[0].id;
  const [set] = await t.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ('s', 'plate', $1) returning id`, [engineer.id]);
  await t.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [versionId, set.id, rule.versions[0].contentHash, engineer.id]);
  await rules.submit(engineer, versionId, '');
  await rules.release(mara, versionId, { password: TEST_PASSWORD, meaning: 'approval', note: '' });

  // Through the service, as an operator would: on 6 October at station B, 3 good parts, 1 with a spot, 1 too dark.
  const sides = [0, 0, 0, 5, 0];
  for (const [k, side] of sides.entries()) {
    await inspections.inspect(tomas, { stationId: stationB, ruleVersionId: versionId, idempotencyKey: `trend-${k}-abcdef` }, await spotPhoto(k, side, k === 4 ? 20 : 120), { at: new Date(Date.UTC(2026, 9, 6, 8 + k)) });
  }
  // By SQL (inserts only; the tables are append-only): station A's five days, and station B at one part a day with
  // another part type on 3 October.
  await insertRows([
    ...stationARows(),
    ...A_DAYS.map(({ day }, k): Row => ({ station: stationB, at: `${day}T10:00:00Z`, verdict: k % 2 ? 'PASS' : 'FAIL', cause: k % 2 ? undefined : 'Spot area' })),
    { station: stationB, at: '2026-10-03T11:00:00Z', verdict: 'FAIL', cause: 'Rim burr', partType: 'disc' },
  ]);
});
afterAll(() => t.close());

const A_RANGE = { from: '2026-10-01T00:00:00Z', to: '2026-10-06T00:00:00Z' };

test('the hourly counts kept by the database add up to the inspections, whether stored one by one or in bulk', async () => {
  const [rows] = await t.db.dataSource.query(`select (select count(*) from inspections)::int as inspections, (select sum(judged + retakes) from inspection_hours)::int as counted,
     (select count(*) from inspections where verdict = 'FAIL')::int as failed, (select sum(failures) from inspection_failure_hours)::int as failures`);
  expect(rows.counted).toBe(rows.inspections);
  expect(rows.failures).toBe(rows.failed);
});

describe('p-chart', () => {
  test('points, centre line and limits match a hand computation (NIST/SEMATECH e-Handbook §6.3.3.2)', async () => {
    const res = await request(t.app).get('/api/trends/p-chart').query({ ...A_RANGE, stationId: stationA }).set(supervisor);
    expect(res.status).toBe(200);
    const chart = pChartSchema.parse(res.body);
    expect(chart).toMatchObject({ bucket: 'day', runRules: 'western-electric' });
    // p̄ = 23/140; UCL_i = p̄ + 3·sqrt(p̄(1 − p̄)/n_i): 0.4128479 for n = 20, 0.3400457 for n = 40; LCL < 0 → 0 (worked by hand).
    expect(chart.center).toBeCloseTo(23 / 140, 12);
    expect(chart.points.map((p) => [p.label, p.n, p.defectives])).toEqual(A_DAYS.map((d) => [d.day, d.n, d.d]));
    expect(chart.points.map((p) => p.p)).toEqual(A_DAYS.map((d) => d.d / d.n));
    expect(chart.points.map((p) => p.ucl)).toEqual([0.4128479, 0.4128479, 0.3400457, 0.3400457, 0.4128479].map((v) => expect.closeTo(v, 6)));
    expect(chart.points.every((p) => p.lcl === 0)).toBe(true);
    expect(chart.points[0]).toMatchObject({ start: '2026-10-01T00:00:00.000Z', end: '2026-10-02T00:00:00.000Z' });
  });

  test('the day above its UCL is marked and listed with the rule that fired, in words', async () => {
    const chart = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ ...A_RANGE, stationId: stationA }).set(supervisor)).body);
    // 14/40 = 0.35 > 0.3400457: Western Electric rule 1 (REFERENCES.md §7).
    expect(chart.signals).toEqual([{ rule: 'WE1', pointIndex: 3, pointIndices: [3], description: '1 point beyond 3 sigma on the high side' }]);
    expect(chart.points.map((p) => p.signal)).toEqual([false, false, false, true, false]);
    const nelson = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ ...A_RANGE, stationId: stationA, runRules: 'nelson' }).set(supervisor)).body);
    expect(nelson.signals.map((s) => s.rule)).toEqual(['N1']);
  });

  test('tapping a point opens exactly its inspections in the records list', async () => {
    const chart = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ ...A_RANGE, stationId: stationA, ruleId }).set(supervisor)).body);
    for (const point of chart.points) {
      const query = { from: point.start, to: point.end, stationId: stationA, ruleId };
      expect(await recordCount({ ...query, verdict: 'FAIL' })).toBe(point.defectives);
      expect(await judgedCount(query)).toBe(point.n);
    }
  });

  test('a range that starts and ends inside an hour counts the same inspections as the records list', async () => {
    const range = { from: '2026-10-02T07:30:00Z', to: '2026-10-04T12:15:00Z' };
    const chart = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ ...range, stationId: stationA }).set(supervisor)).body);
    expect(chart.points[0].start).toBe(new Date(range.from).toISOString());
    expect(chart.points.at(-1)!.end).toBe(new Date(range.to).toISOString());
    // Parts photographed in the hour the range starts in, before and after its start, so the edge matters.
    expect(await judgedCount({ from: '2026-10-02T07:00:00Z', to: range.from, stationId: stationA })).toBeGreaterThan(0);
    expect(chart.points.reduce((sum, p) => sum + p.n, 0)).toBe(await judgedCount({ ...range, stationId: stationA }));
    expect(chart.points.reduce((sum, p) => sum + p.defectives, 0)).toBe(await recordCount({ ...range, stationId: stationA, verdict: 'FAIL' }));
  });

  test('per shift, subgroups start at the plant shift hours (06, 14, 22 UTC) and a night shift runs past midnight', async () => {
    await insertRows(
      ['2026-09-10T05:00:00Z', '2026-09-10T06:00:00Z', '2026-09-10T13:59:00Z', '2026-09-10T14:00:00Z', '2026-09-10T22:30:00Z', '2026-09-11T05:59:00Z'].map((at) => ({ station: stationC, at, verdict: 'PASS' })),
    );
    const chart = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ from: '2026-09-09T00:00:00Z', to: '2026-09-12T00:00:00Z', stationId: stationC, bucket: 'shift' }).set(supervisor)).body);
    expect(chart.points.map((p) => [p.label, p.start, p.end, p.n])).toEqual([
      ['2026-09-09 22:00', '2026-09-09T22:00:00.000Z', '2026-09-10T06:00:00.000Z', 1],
      ['2026-09-10 06:00', '2026-09-10T06:00:00.000Z', '2026-09-10T14:00:00.000Z', 2],
      ['2026-09-10 14:00', '2026-09-10T14:00:00.000Z', '2026-09-10T22:00:00.000Z', 1],
      ['2026-09-10 22:00', '2026-09-10T22:00:00.000Z', '2026-09-11T06:00:00.000Z', 2],
    ]);
    expect(chart.center).toBe(0);
  });

  test('RETAKEs are not parts judged: they stay out of n', async () => {
    const chart = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ from: '2026-10-06T00:00:00Z', to: '2026-10-07T00:00:00Z', stationId: stationB }).set(supervisor)).body);
    // Five parts photographed through the service: three good, one with a spot, one too dark to judge.
    expect(chart.points.map((p) => [p.n, p.defectives])).toEqual([[4, 1]]);
  });

  test('filters by line and part type', async () => {
    const byLine = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ ...A_RANGE, lineId: lineB }).set(supervisor)).body);
    // Line 2 holds station B only here: one part a day, failing on days 1, 3, 5, and the disc on 3 October.
    expect(byLine.points.map((p) => [p.label, p.n, p.defectives])).toEqual([
      ['2026-10-01', 1, 1],
      ['2026-10-02', 1, 0],
      ['2026-10-03', 2, 2],
      ['2026-10-04', 1, 0],
      ['2026-10-05', 1, 1],
    ]);
    const disc = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ ...A_RANGE, partType: 'disc' }).set(supervisor)).body);
    expect(disc.points.map((p) => [p.label, p.n, p.defectives])).toEqual([['2026-10-03', 1, 1]]);
    expect(await recordCount({ ...A_RANGE, partType: 'disc' })).toBe(1);
  });

  test('a range with nothing in it is an empty chart without a centre line', async () => {
    const chart = pChartSchema.parse((await request(t.app).get('/api/trends/p-chart').query({ from: '2025-01-01T00:00:00Z', to: '2025-02-01T00:00:00Z' }).set(supervisor)).body);
    expect(chart).toMatchObject({ center: null, points: [], signals: [] });
  });
});

describe('Pareto', () => {
  test('failures by cause, largest first with the running share, and the worst stations', async () => {
    const res = await request(t.app).get('/api/trends/pareto').query(A_RANGE).set(supervisor);
    expect(res.status).toBe(200);
    const pareto = paretoSchema.parse(res.body);
    // Station A: of each day's d failures, every third is a spot count: 0 + 0 + 1 + 4 + 0 = 5 of 23.
    // Station B: failures on days 1, 3, 5 (spot area) and the disc's rim burr.
    const spotCount = 5;
    const spotArea = 23 - spotCount + 3;
    expect(pareto.totalFailures).toBe(23 + 4);
    expect(pareto.bars).toEqual([
      { cause: 'Spot area', count: spotArea, cumulative: expect.closeTo(spotArea / 27, 12) },
      { cause: 'Spot count', count: spotCount, cumulative: expect.closeTo((spotArea + spotCount) / 27, 12) },
      { cause: 'Rim burr', count: 1, cumulative: expect.closeTo(1, 12) },
    ]);
    expect(pareto.topStations.map((s) => [s.stationName, s.lineName, s.n, s.defectives])).toEqual([
      ['Lathe 4', 'Line 2', 6, 4],
      ['Press 1', 'Line 1', 140, 23],
    ]);
  });

  test('tapping a bar or a station opens exactly its failed inspections', async () => {
    const pareto = paretoSchema.parse((await request(t.app).get('/api/trends/pareto').query({ ...A_RANGE, ruleId }).set(supervisor)).body);
    for (const bar of pareto.bars) expect(await recordCount({ ...A_RANGE, ruleId, verdict: 'FAIL', cause: bar.cause })).toBe(bar.count);
    for (const station of pareto.topStations) expect(await recordCount({ ...A_RANGE, ruleId, verdict: 'FAIL', stationId: station.stationId })).toBe(station.defectives);
  });
});

test('filter choices: rules that were released, lines with their stations, part types seen', async () => {
  const choices = trendChoicesSchema.parse((await request(t.app).get('/api/trends/choices').set(supervisor)).body);
  expect(choices.rules).toEqual([{ id: ruleId, name: 'Plate spots' }]);
  expect(choices.lines.map((l) => [l.name, l.stations.map((s) => s.name)])).toEqual([
    ['Line 1', ['Press 1']],
    ['Line 2', ['Lathe 4', 'Lathe 5']],
  ]);
  expect(choices.partTypes).toEqual(['disc', 'plate']);
});

test('supervisors, engineers and auditors see trends; operators do not; nobody without signing in', async () => {
  for (const [username, status] of [
    ['ines', 200],
    ['kofi', 200],
    ['tomas', 403],
  ] as const) {
    const auth = { Authorization: `Bearer ${await t.tokenFor(username)}` };
    expect((await request(t.app).get('/api/trends/p-chart').query(A_RANGE).set(auth)).status).toBe(status);
    expect((await request(t.app).get('/api/trends/pareto').query(A_RANGE).set(auth)).status).toBe(status);
  }
  expect((await request(t.app).get('/api/trends/choices')).status).toBe(401);
});

test('a range that ends before it starts, or an unknown filter, is refused with the field named', async () => {
  const backwards = await request(t.app).get('/api/trends/p-chart').query({ from: A_RANGE.to, to: A_RANGE.from }).set(supervisor);
  expect(backwards.status).toBe(400);
  expect(backwards.body.error.details.issues[0].path).toBe('to');
  const unknown = await request(t.app).get('/api/trends/pareto').query({ ...A_RANGE, bucket: 'day' }).set(supervisor);
  expect(unknown.status).toBe(400);
  const injected = await request(t.app).get('/api/trends/p-chart').query({ ...A_RANGE, stationId: "1' or '1'='1" }).set(supervisor);
  expect(injected.status).toBe(400);
});
