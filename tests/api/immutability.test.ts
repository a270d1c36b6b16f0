// The database itself refuses changes to records that must not change (issue 6 and 8; 21 CFR 11.10(e)
// asks that record changes do not obscure what was recorded before).
import { createTestDatabase, type TestDatabase } from '../support/db';

let db: TestDatabase;
let versionId: string;
let inspectionId: string;

beforeAll(async () => {
  db = await createTestDatabase();
  const q = (sql: string, params: unknown[] = []) => db.dataSource.query(sql, params);
  const [user] = await q(`insert into users (username, display_name, password_hash, roles) values ('ines', 'Ines', 'h', '{engineer}') returning id`);
  const [rule] = await q(`insert into rules (name, part_type, created_by) values ('Washer rim burr', 'washer-m8', $1) returning id`, [user.id]);
  const [version] = await q(
    `insert into rule_versions (rule_id, number, state, document, content_hash, author_id, edited_at)
     values ($1, 1, 'draft', '{"steps":[]}', repeat('a', 64), $2, now()) returning id`,
    [rule.id, user.id],
  );
  versionId = version.id;
  const [line] = await q(`insert into lines (name) values ('Line 1') returning id`);
  const [station] = await q(`insert into stations (line_id, name) values ($1, 'Station A') returning id`, [line.id]);
  await q(`update rule_versions set state = 'released', released_at = now() where id = $1`, [versionId]);
  const [inspection] = await q(
    `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, quality, duration_ms)
     values ('k1', $1, $2, $3, $4, 'washer-m8', $5, repeat('b', 64), 'PASS', '{}', 12) returning id`,
    [versionId, rule.id, station.id, line.id, user.id],
  );
  inspectionId = inspection.id;
  await q(`insert into measurements (inspection_id, position, gauge, value, unit, limit_max, pass) values ($1, 0, 'Burr area', 0.1, 'mm2', 0.5, true)`, [inspectionId]);
});
afterAll(() => db.drop());

const q = (sql: string, params: unknown[] = []) => db.dataSource.query(sql, params);

test('a draft may change, a released version’s document may not', async () => {
  await expect(q(`update rule_versions set document = '{"steps":[1]}' where id = $1`, [versionId])).rejects.toThrow(/frozen/);
  await expect(q(`update rule_versions set content_hash = repeat('c', 64) where id = $1`, [versionId])).rejects.toThrow(/frozen/);
});

test('a released version cannot go back to draft or be deleted', async () => {
  await expect(q(`update rule_versions set state = 'draft' where id = $1`, [versionId])).rejects.toThrow(/cannot go from released to draft/);
  await expect(q(`delete from rule_versions where id = $1`, [versionId])).rejects.toThrow(/cannot be deleted/);
});

test('inspections and measurements cannot be changed or removed', async () => {
  await expect(q(`update inspections set verdict = 'FAIL' where id = $1`, [inspectionId])).rejects.toThrow(/append-only/);
  await expect(q(`delete from inspections where id = $1`, [inspectionId])).rejects.toThrow(/append-only/);
  await expect(q(`update measurements set value = 0 where inspection_id = $1`, [inspectionId])).rejects.toThrow(/append-only/);
  await expect(q(`truncate measurements`)).rejects.toThrow(/append-only/);
});

test('a released version may be superseded and then withdrawn, and then nothing more', async () => {
  await q(`update rule_versions set state = 'superseded', ended_at = now() where id = $1`, [versionId]);
  await q(`update rule_versions set state = 'withdrawn', withdraw_reason = 'Drawing revision C' where id = $1`, [versionId]);
  await expect(q(`update rule_versions set withdraw_reason = 'changed my mind' where id = $1`, [versionId])).rejects.toThrow(/withdrawn/);
});
