// The demo plant seed (issue 4): through the app's own services, idempotent, rules tried and released
// by two people, history made by running the released rules.
import { createTestApp, type TestApp } from '../support/app';
import { runInNode } from '../support/in-node';

jest.setTimeout(600_000);
const OPTIONS = { referencePhotos: 9, historyDays: 2, perStationPerDay: 3 };
const seed = () => runInNode<{ seconds: number }>('tests/support/seed-in-node.ts', 'seedPlantInto', [t.db.url, t.config.imageDir, OPTIONS]);

let t: TestApp;
const counts = async () =>
  Object.fromEntries(
    await Promise.all(
      ['lines', 'stations', 'reference_sets', 'reference_images', 'rules', 'rule_versions', 'trials', 'inspections', 'measurements', 'signatures'].map(async (table) => {
        const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from ${table}`);
        return [table, n];
      }),
    ),
  );

beforeAll(async () => {
  t = await createTestApp();
  await seed();
}, 600_000);
afterAll(() => t.close());

test('the plant has two lines and four calibrated stations', async () => {
  const stations = await t.db.dataSource.query('select mm_per_px, calibrated_by from stations');
  expect(stations).toHaveLength(4);
  expect(stations.every((s: { mm_per_px: number; calibrated_by: string }) => s.mm_per_px > 0 && s.calibrated_by)).toBe(true);
  expect((await counts()).lines).toBe(2);
});

test('each family has a labelled reference set stored like an upload', async () => {
  const sets = await t.db.dataSource.query(`select s.name, count(i.*)::int as n, count(i.thumbnail_hash)::int as thumbs,
    count(*) filter (where i.label = 'defective')::int as defective from reference_sets s join reference_images i on i.set_id = s.id group by s.name`);
  expect(sets).toHaveLength(3);
  for (const set of sets) {
    expect(set.n).toBe(9);
    expect(set.thumbs).toBe(9);
    expect(set.defective).toBeGreaterThan(0);
  }
});

test('each family’s rule was tried on its reference set, submitted by the engineer and released by the supervisor', async () => {
  const rows = await t.db.dataSource.query(`select r.name, v.state, t.state as trial_state, t.summary, a.username as author, s.signer_name
    from rules r join rule_versions v on v.rule_id = r.id and v.number = 1
    join trials t on t.rule_version_id = v.id join users a on a.id = v.author_id join signatures s on s.rule_version_id = v.id`);
  expect(rows).toHaveLength(3);
  for (const row of rows) {
    expect(row).toMatchObject({ state: 'released', trial_state: 'done', author: 'engineer', signer_name: 'Mara Lindqvist' });
    expect(row.summary.images).toBe(9);
  }
  const versions = await t.db.dataSource.query(`select state, count(*)::int as n from rule_versions where number = 2 group by state order by state`);
  expect(versions).toEqual([{ state: 'draft', n: 1 }, { state: 'in-review', n: 1 }]);
});

test('the history was made by running the released rules: every inspection has its gauges measured', async () => {
  const [row] = await t.db.dataSource.query(`select count(*)::int as n, count(distinct i.station_id)::int as stations,
    bool_and(v.state = 'released') as released,
    count(distinct (i.created_at at time zone 'UTC')::date) >= 2 as spans_days
    from inspections i join rule_versions v on v.id = i.rule_version_id`);
  expect(row).toMatchObject({ n: 4 * 2 * 3, stations: 4, released: true, spans_days: true });
  const [missing] = await t.db.dataSource.query(`select count(*)::int as n from inspections i
    join rule_versions v on v.id = i.rule_version_id
    where (select count(*) from measurements m where m.inspection_id = i.id) <> jsonb_array_length(v.document->'gauges')`);
  expect(missing.n).toBe(0);
});

test('seeding again changes nothing', async () => {
  const before = await counts();
  await seed();
  expect(await counts()).toEqual(before);
});
