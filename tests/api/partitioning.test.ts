// Inspections partitioned by month (issue 9). The PostgreSQL 15 behaviour relied on is the manual's,
// chapter 5.11 "Table Partitioning" and CREATE TABLE: a range partition holds FROM (inclusive) up to TO
// (exclusive); rows no partition accepts go to DEFAULT; a partition cannot be added while DEFAULT holds
// rows of its range (§5.11.2.2, hence the move); row triggers of the root are cloned to partitions,
// statement triggers are not; the planner leaves out partitions a WHERE clause on the key excludes
// (§5.11.4 "Partition Pruning").
//
// Where pruning helps: every read with a time range (the records list and CSV export with from/to, the
// trends' edge hours, the alert check's window, the attribute-agreement study) reads only its months'
// partitions. Reads by id or idempotency key alone visit one small index per partition.
import crypto from 'node:crypto';
import request from 'supertest';
import type { QueryRunner } from 'typeorm';
import { recordFiltersSchema, recordPageSchema } from '../../shared/api/records';
import { ensureInspectionMonths, ensureInspectionPartitions, partitionName } from '../../server/components/inspections/partitions';
import { RECORD_SELECT, whereClause } from '../../server/components/records/query';
import { PartitionInspectionsByMonth1796169997481 } from '../../server/db/migrations/1796169997481-PartitionInspectionsByMonth';
import { createTestApp, type TestApp } from '../support/app';
import { createTestDatabase } from '../support/db';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { releasedRule } from '../support/released-rule';

jest.setTimeout(60_000);

let t: TestApp;
let versionId: string;
let stationId: string;
let operatorId: string;

const q = (sql: string, params: unknown[] = []) => t.db.dataSource.query(sql, params);

/** One inspection stored through the root, as every writer does; returns its id. */
async function inspection(at: string, options: { key?: string; verdict?: string; cause?: string | null } = {}): Promise<string> {
  const [row] = await q(
    `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, cause, quality, duration_ms, created_at)
     select $1, v.id, v.rule_id, s.id, s.line_id, 'plate', $4, repeat('b', 64), $5, $6, '{}', 12, $2
     from rule_versions v, stations s where v.id = $3 and s.id = $7 returning id`,
    [options.key ?? `part-${crypto.randomUUID()}`, at, versionId, operatorId, options.verdict ?? 'PASS', options.cause ?? null, stationId],
  );
  return row.id;
}

const partitionOf = async (id: string): Promise<string> => (await q('select tableoid::regclass::text as p from inspections where id = $1', [id]))[0].p;

async function partitions(): Promise<string[]> {
  const rows = await q(`select c.relname from pg_inherits h join pg_class c on c.oid = h.inhrelid where h.inhparent = 'inspections'::regclass order by 1`);
  return rows.map((r: { relname: string }) => r.relname);
}

beforeAll(async () => {
  t = await createTestApp();
  const setup = await releasedRule(t, SPOT_RULE);
  versionId = setup.releasedId;
  stationId = setup.stationId;
  operatorId = (await t.createUser('tomas', ['operator'])).id;
  await t.createUser('kofi', ['auditor']);
  await ensureInspectionMonths(t.db.dataSource, new Date('2031-03-01T00:00:00Z'), new Date('2031-04-01T00:00:00Z'));
});
afterAll(() => t.close());

test('the migration leaves a DEFAULT partition, and this month and the next two are made once', async () => {
  expect(await partitions()).toContain('inspections_default');
  // A fixed "now" in November: the three months run over the turn of the year.
  const before = await partitions();
  const made = await ensureInspectionPartitions(t.db.dataSource, new Date('2031-11-15T12:00:00Z'));
  expect(made).toEqual(['inspections_y2031m11', 'inspections_y2031m12', 'inspections_y2032m01']);
  expect(await partitions()).toEqual([...before, ...made].sort());
  expect(await ensureInspectionPartitions(t.db.dataSource, new Date('2031-11-30T23:59:59Z'))).toEqual(made);
  expect((await partitions()).length).toBe(before.length + 3);
  const [bound] = await q(`select pg_get_expr(c.relpartbound, c.oid) as b from pg_class c where c.relname = 'inspections_y2031m12'`);
  expect(bound.b).toBe(`FOR VALUES FROM ('2031-12-01 00:00:00+00') TO ('2032-01-01 00:00:00+00')`);
});

test('each row lands in the partition of its month in UTC (FROM inclusive, TO exclusive)', async () => {
  expect(await partitionOf(await inspection('2031-03-01T00:00:00Z'))).toBe('inspections_y2031m03');
  expect(await partitionOf(await inspection('2031-03-31T23:59:59.999999Z'))).toBe('inspections_y2031m03');
  // 01:30 on 1 April in UTC+2 is still 31 March in UTC.
  expect(await partitionOf(await inspection('2031-04-01T01:30:00+02:00'))).toBe('inspections_y2031m03');
  expect(await partitionOf(await inspection('2031-04-01T00:00:00Z'))).toBe('inspections_y2031m04');
  expect(partitionName(new Date('2031-04-01T00:00:00Z'))).toBe('inspections_y2031m04');
});

test('an inspection through the API is stored in this month’s partition, its measurement keyed to it, and can be disputed', async () => {
  const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  const res = await request(t.app)
    .post('/api/inspections')
    .set(operator)
    .field('stationId', stationId)
    .field('ruleVersionId', versionId)
    .field('idempotencyKey', 'api-partition-0001')
    .attach('photo', await spotPhoto(1, 6), { filename: 'part.png', contentType: 'image/png' });
  expect(res.status).toBe(201);
  expect(await partitionOf(res.body.id)).toBe(partitionName(new Date(res.body.createdAt)));
  const [m] = await q(`select m.inspection_created_at = i.created_at as same from measurements m join inspections i on i.id = m.inspection_id where m.inspection_id = $1`, [res.body.id]);
  expect(m.same).toBe(true);
  expect((await request(t.app).post(`/api/inspections/${res.body.id}/dispute`).set(operator).send({ note: 'The mark wipes off' })).status).toBe(201);
  const [d] = await q(`select d.inspection_created_at = i.created_at as same from disputes d join inspections i on i.id = d.inspection_id where d.inspection_id = $1`, [res.body.id]);
  expect(d.same).toBe(true);
});

test('a month without a partition falls into DEFAULT, and moves out, counted once, when its partition is made', async () => {
  const id = await inspection('2099-05-10T08:15:00Z', { verdict: 'FAIL', cause: 'Spot area' });
  await q(`insert into measurements (inspection_id, inspection_created_at, position, gauge, value, unit, limit_max, pass) values ($1, '2099-05-10T08:15:00Z', 0, 'Spot area', 30, 'px2', 20, false)`, [id]);
  await q(`insert into disputes (inspection_id, raised_by, note) values ($1, $2, 'Dust on the lens')`, [id, operatorId]);
  expect(await partitionOf(id)).toBe('inspections_default');
  const hours = `select judged, failed from inspection_hours where hour = '2099-05-10T08:00:00Z'`;
  expect(await q(hours)).toEqual([{ judged: 1, failed: 1 }]);

  expect(await ensureInspectionMonths(t.db.dataSource, new Date('2099-05-20T00:00:00Z'), new Date('2099-05-20T00:00:00Z'))).toEqual(['inspections_y2099m05']);
  expect(await partitionOf(id)).toBe('inspections_y2099m05');
  expect(await q(`select count(*)::int as n from only inspections_default where created_at >= '2099-05-01' and created_at < '2099-06-01'`)).toEqual([{ n: 0 }]);
  // The hourly counts and the keys were kept when the row first came in; the move adds none.
  expect(await q(hours)).toEqual([{ judged: 1, failed: 1 }]);
  expect(await q(`select count(*)::int as n from inspection_keys where inspection_id = $1`, [id])).toEqual([{ n: 1 }]);
  // The references came back and are validated again.
  const refs = await q(`select conname, convalidated from pg_constraint where confrelid = 'inspections'::regclass and contype = 'f' and conparentid = 0 order by 1`);
  expect(refs).toEqual([
    { conname: 'FK_bf56baf957751a3b89ece9cde5b', convalidated: true },
    { conname: 'FK_d020b2d0f43153a34483654cb87', convalidated: true },
    { conname: 'FK_inspection_keys_inspection', convalidated: true },
  ]);
  await expect(q(`insert into measurements (inspection_id, inspection_created_at, position, gauge, value, unit, pass) values ($1, '2099-05-10T08:16:00Z', 1, 'x', 0, '', true)`, [id])).rejects.toThrow(/foreign key/);
  // The append-only guard is cloned onto the new partition too.
  await expect(q(`delete from inspections_y2099m05 where id = $1`, [id])).rejects.toThrow(/append-only/);
});

test('inspections stay append-only on the root and on every partition, and a partition takes no direct insert', async () => {
  const id = await inspection('2031-03-12T10:00:00Z');
  await expect(q(`update inspections set verdict = 'FAIL' where id = $1`, [id])).rejects.toThrow(/append-only/);
  await expect(q(`delete from inspections where id = $1`, [id])).rejects.toThrow(/append-only/);
  await expect(q(`update inspections_y2031m03 set verdict = 'FAIL' where id = $1`, [id])).rejects.toThrow(/append-only/);
  await expect(q(`delete from inspections_y2031m03 where id = $1`, [id])).rejects.toThrow(/append-only/);
  // The measurements' foreign key already stops a TRUNCATE; each partition's own trigger is the second guard.
  await expect(q(`truncate inspections_y2031m03`)).rejects.toThrow(/foreign key/);
  await expect(q(`truncate inspections_y2031m03 cascade`)).rejects.toThrow(/append-only/);
  const guards = await q(
    `select c.relname, array_agg(t.tgname::text order by t.tgname) as triggers from pg_inherits h join pg_class c on c.oid = h.inhrelid
     join pg_trigger t on t.tgrelid = c.oid and not t.tgisinternal where h.inhparent = 'inspections'::regclass group by 1`,
  );
  expect(guards.length).toBe((await partitions()).length);
  for (const { relname, triggers } of guards) expect(triggers).toEqual(['inspections_append_only', `${relname}_no_truncate`, `${relname}_through_root`]);
  await expect(q(`insert into inspections_y2031m03 select * from inspections where id = $1`, [id])).rejects.toThrow(/not into its partition/);
  await expect(q(`update inspection_keys set idempotency_key = 'other' where inspection_id = $1`, [id])).rejects.toThrow(/append-only/);
  expect(await partitionOf(id)).toBe('inspections_y2031m03');
});

test('the database refuses a measurement or a dispute of an inspection that does not exist', async () => {
  const missing = crypto.randomUUID();
  const measurement = `insert into measurements (inspection_id, inspection_created_at, position, gauge, value, unit, pass) values ($1, $2, 0, 'Spot area', 1, 'px2', true)`;
  await expect(q(measurement, [missing, '2031-03-12T10:00:00Z'])).rejects.toThrow(/FK_d020b2d0f43153a34483654cb87/);
  // An existing inspection named with another time is not that inspection.
  const id = await inspection('2031-03-13T10:00:00Z');
  await expect(q(measurement, [id, '2031-03-13T10:00:01Z'])).rejects.toThrow(/FK_d020b2d0f43153a34483654cb87/);
  await expect(q(`insert into measurements (inspection_id, position, gauge, value, unit, pass) values ($1, 0, 'Spot area', 1, 'px2', true)`, [missing])).rejects.toThrow(/does not exist/);
  await expect(q(`insert into disputes (inspection_id, inspection_created_at, raised_by, note) values ($1, '2031-03-12T10:00:00Z', $2, 'x')`, [missing, operatorId])).rejects.toThrow(/FK_bf56baf957751a3b89ece9cde5b/);
  await expect(q(`insert into disputes (inspection_id, raised_by, note) values ($1, $2, 'x')`, [missing, operatorId])).rejects.toThrow(/does not exist/);
});

test('a writer that names only the inspection’s id gets its time filled in, even in the statement that stores the inspection', async () => {
  const [row] = await q(
    `with i as (insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, quality, duration_ms, created_at)
                select 'same-statement', v.id, v.rule_id, s.id, s.line_id, 'plate', $2, repeat('b', 64), 'FAIL', '{}', 12, '2031-03-15T09:30:00.123456Z'
                from rule_versions v, stations s where v.id = $1 and s.id = $3 returning id)
     insert into disputes (inspection_id, raised_by, note) select id, $2, 'Burr is on the fixture' from i returning inspection_created_at = '2031-03-15T09:30:00.123456Z' as same`,
    [versionId, operatorId, stationId],
  );
  expect(row.same).toBe(true);
});

test('an idempotency key is unique across months', async () => {
  await inspection('2031-03-14T10:00:00Z', { key: 'station-7-part-42' });
  const refused = inspection('2031-04-14T10:00:00Z', { key: 'station-7-part-42' });
  await expect(refused).rejects.toMatchObject({ code: '23505' });
  expect(await q(`select count(*)::int as n from inspections where idempotency_key = 'station-7-part-42'`)).toEqual([{ n: 1 }]);
  expect(await q(`select count(*)::int as n from inspection_hours where hour = '2031-04-14T10:00:00Z'`)).toEqual([{ n: 0 }]);
});

test('the hourly counts are kept for rows of every partition, DEFAULT included', async () => {
  // Counted by hand: 2 PASS + 1 FAIL judged, 1 RETAKE not judged, in one hour of March and one of a month without partition.
  for (const hour of ['2031-03-20T14', '2088-01-20T14']) {
    await inspection(`${hour}:05:00Z`);
    await inspection(`${hour}:10:00Z`);
    await inspection(`${hour}:20:00Z`, { verdict: 'FAIL', cause: 'Spot area' });
    await inspection(`${hour}:30:00Z`, { verdict: 'RETAKE', cause: 'mean' });
    expect(await q(`select judged, failed, retakes from inspection_hours where hour = $1`, [`${hour}:00:00Z`])).toEqual([{ judged: 3, failed: 1, retakes: 1 }]);
    expect(await q(`select cause, failures from inspection_failure_hours where hour = $1`, [`${hour}:00:00Z`])).toEqual([{ cause: 'Spot area', failures: 1 }]);
  }
});

/** The partitions a plan reads inspections from. */
function scannedPartitions(plan: { 'Relation Name'?: string; Plans?: unknown[] }): string[] {
  const found = new Set<string>();
  const visit = (node: { 'Relation Name'?: string; Plans?: unknown[] }) => {
    if (node['Relation Name']?.startsWith('inspections_')) found.add(node['Relation Name']);
    (node.Plans as (typeof node)[] | undefined)?.forEach(visit);
  };
  visit(plan);
  return [...found].sort();
}

test('a date-ranged records query reads only the partitions of the months asked for (EXPLAIN)', async () => {
  const explain = async (from: string, to: string) => {
    const params: unknown[] = [];
    const where = whereClause(recordFiltersSchema.parse({ from, to }), params);
    params.push(51);
    const sql = `${RECORD_SELECT} where ${where} order by i.created_at desc, i.id desc limit $${params.length}`;
    const [{ 'QUERY PLAN': plan }] = await q(`explain (format json) ${sql}`, params);
    return scannedPartitions(plan[0].Plan);
  };
  expect(await explain('2031-03-05T00:00:00Z', '2031-03-20T00:00:00Z')).toEqual(['inspections_y2031m03']);
  expect(await explain('2031-03-25T00:00:00Z', '2031-04-05T00:00:00Z')).toEqual(['inspections_y2031m03', 'inspections_y2031m04']);
  // A range reaching past the partitions made so far includes DEFAULT, where such rows would be.
  expect(await explain('2031-04-25T00:00:00Z', '2031-05-05T00:00:00Z')).toEqual(['inspections_default', 'inspections_y2031m04']);

  const auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  const page = recordPageSchema.parse(
    (await request(t.app).get('/api/records/inspections').query({ from: '2031-03-31T00:00:00Z', to: '2031-04-02T00:00:00Z', order: 'oldest' }).set(auditor)).body,
  );
  expect(page.items.map((r) => r.createdAt)).toEqual(['2031-03-31T23:30:00.000Z', '2031-03-31T23:59:59.999Z', '2031-04-01T00:00:00.000Z']);
});

describe('the migration, down and up again on a database with inspections', () => {
  const migration = new PartitionInspectionsByMonth1796169997481();
  const inTransaction = async (runner: QueryRunner, step: (r: QueryRunner) => Promise<void>) => {
    await runner.startTransaction();
    try {
      await step(runner);
      await runner.commitTransaction();
    } catch (err) {
      await runner.rollbackTransaction();
      throw err;
    }
  };

  test('keeps every row, its measurements, keys and hourly counts, and leaves TypeORM nothing to change', async () => {
    const db = await createTestDatabase();
    const dq = (sql: string, params: unknown[] = []) => db.dataSource.query(sql, params);
    try {
      const [user] = await dq(`insert into users (username, display_name, password_hash, roles) values ('ines', 'Ines', 'h', '{engineer,operator}') returning id`);
      const [rule] = await dq(`insert into rules (name, part_type, created_by) values ('Washer rim burr', 'washer', $1) returning id`, [user.id]);
      const [version] = await dq(`insert into rule_versions (rule_id, number, state, document, content_hash, author_id, edited_at) values ($1, 1, 'draft', '{}', repeat('a', 64), $2, now()) returning id`, [rule.id, user.id]);
      const [line] = await dq(`insert into lines (name) values ('Line 1') returning id`);
      const [station] = await dq(`insert into stations (line_id, name) values ($1, 'Station A') returning id`, [line.id]);
      // Nine inspections a week apart from 22 May 2031 (three months without partitions: DEFAULT) and one in 2099.
      await dq(
        `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, quality, duration_ms, created_at)
         select 'm-' || g, $1, $2, $3, $4, 'washer', $5, repeat('b', 64), case when g % 3 = 0 then 'FAIL' else 'PASS' end, '{}', 9,
                case when g = 10 then timestamptz '2099-01-01T00:00:00Z' else timestamptz '2031-05-15T06:00:00Z' + g * interval '7 days' end
         from generate_series(1, 10) g`,
        [version.id, rule.id, station.id, line.id, user.id],
      );
      await dq(`insert into measurements (inspection_id, position, gauge, value, unit, pass) select id, 0, 'Burr area', 0.1, 'mm2', true from inspections`);
      await dq(`insert into disputes (inspection_id, raised_by, note) select id, $1, 'Looks fine' from inspections where verdict = 'FAIL'`, [user.id]);
      const snapshot = async () => ({
        inspections: await dq(`select id, idempotency_key, verdict, created_at from inspections order by id`),
        measurements: await dq(`select inspection_id, value from measurements order by inspection_id`),
        disputes: await dq(`select inspection_id, note from disputes order by inspection_id`),
        hours: await dq(`select hour, judged, failed from inspection_hours order by hour`),
      });
      const before = await snapshot();
      expect(before.inspections).toHaveLength(10);

      const runner = db.dataSource.createQueryRunner();
      try {
        await inTransaction(runner, (r) => migration.down(r));
        expect(await dq(`select relkind from pg_class where relname = 'inspections'`)).toEqual([{ relkind: 'r' }]);
        expect(await snapshot()).toEqual(before);
        const copy = `idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, quality, duration_ms`;
        await expect(dq(`insert into inspections (${copy}) select ${copy} from inspections limit 1`)).rejects.toThrow(/UQ_dbc0dee7821137daa40e2bf28ff/);

        await inTransaction(runner, (r) => migration.up(r));
      } finally {
        await runner.release();
      }
      expect(await dq(`select relkind from pg_class where relname = 'inspections'`)).toEqual([{ relkind: 'p' }]);
      expect(await snapshot()).toEqual(before);
      // Every month with rows got its partition, so DEFAULT is empty.
      const placed = await dq(`select tableoid::regclass::text as p, count(*)::int as n from inspections group by 1 order by 1`);
      expect(placed).toEqual([
        { p: 'inspections_y2031m05', n: 2 },
        { p: 'inspections_y2031m06', n: 4 },
        { p: 'inspections_y2031m07', n: 3 },
        { p: 'inspections_y2099m01', n: 1 },
      ]);
      expect(await dq(`select count(*)::int as n from measurements m join inspections i on i.id = m.inspection_id and i.created_at = m.inspection_created_at`)).toEqual([{ n: 10 }]);
      expect(await dq(`select count(*)::int as n from inspection_keys`)).toEqual([{ n: 10 }]);
      const pending = await db.dataSource.driver.createSchemaBuilder().log();
      expect(pending.upQueries.map((x) => x.query)).toEqual([]);
    } finally {
      await db.drop();
    }
  });
});
