import { parse as parseCsv } from 'csv-parse/sync';
import request from 'supertest';
import { auditEventPageSchema, chainVerificationSchema } from '../../shared/api/audit';
import { chainHash, GENESIS_HASH, sha256Hex } from '../../server/components/audit/chain';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

let t: TestApp;
let auditor: { Authorization: string };
let admin: { Authorization: string };
beforeAll(async () => {
  t = await createTestApp();
  await t.createUser('kofi', ['auditor']);
  await t.createUser('priya', ['admin']);
  await t.createUser('ines', ['engineer']);
  auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  admin = { Authorization: `Bearer ${await t.tokenFor('priya')}` };
});
afterAll(() => t.close());

const events = async (query = '') => auditEventPageSchema.parse((await request(t.app).get(`/api/audit-events${query}`).set(auditor)).body);

test('SHA-256 matches the FIPS 180-4 example "abc"', () => {
  // NIST FIPS 180-4 / CSRC example values: SHA-256("abc").
  expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
});

test('sign-ins, refused sign-ins and user changes are recorded with who, what and when', async () => {
  await request(t.app).post('/api/auth/sign-in').send({ username: 'ines', password: 'wrong-password' });
  const created = await request(t.app)
    .post('/api/users')
    .set(admin)
    .send({ username: 'newbie', displayName: 'New Bie', password: TEST_PASSWORD, roles: ['operator'] });
  await request(t.app).patch(`/api/users/${created.body.id}`).set(admin).send({ roles: ['operator', 'engineer'], password: 'another-long-one' });

  const { items } = await events();
  const byAction = (action: string) => items.filter((e) => e.action === action);
  expect(byAction('sign-in').map((e) => e.actorName)).toEqual(expect.arrayContaining(['kofi', 'priya']));
  expect(byAction('sign-in.refused')[0]).toMatchObject({ actorName: 'ines', details: { reason: 'wrong password' } });
  expect(byAction('user.create')[0]).toMatchObject({ actorName: 'priya', entityId: created.body.id, beforeDigest: null });
  const update = byAction('user.update')[0];
  expect(update.details).toEqual({ changes: { roles: { from: ['operator'], to: ['operator', 'engineer'] }, password: 'changed' } });
  expect(update.beforeDigest).toMatch(/^[0-9a-f]{64}$/);
  expect(update.afterDigest).not.toBe(update.beforeDigest);
  expect(JSON.stringify(items)).not.toMatch(/another-long-one|passwordHash|\$2[aby]\$/);
  expect(Date.parse(update.occurredAt)).toBeLessThanOrEqual(Date.now());
});

test('each event links to the one before it and its hash covers its content', async () => {
  const { items } = await events('?limit=500');
  const ascending = [...items].reverse();
  expect(ascending[0].prevHash).toBe(GENESIS_HASH);
  for (let i = 1; i < ascending.length; i++) expect(ascending[i].prevHash).toBe(ascending[i - 1].hash);
  const { hash, prevHash, ...content } = ascending[1];
  expect(chainHash(prevHash, content)).toBe(hash);
});

test('the chain verifies on an untouched trail', async () => {
  const res = await request(t.app).get('/api/audit-events/verify').set(auditor);
  const result = chainVerificationSchema.parse(res.body);
  expect(result).toMatchObject({ ok: true, firstBroken: null });
  expect(result.checked).toBeGreaterThan(3);
});

test('the database refuses UPDATE, DELETE and TRUNCATE of audit events', async () => {
  await expect(t.db.dataSource.query(`update audit_events set actor_name = 'someone else'`)).rejects.toThrow(/append-only/);
  await expect(t.db.dataSource.query(`delete from audit_events`)).rejects.toThrow(/append-only/);
  await expect(t.db.dataSource.query(`truncate audit_events`)).rejects.toThrow(/append-only/);
});

test('pages go back in time with a keyset cursor', async () => {
  const first = await events('?limit=2');
  expect(first.items).toHaveLength(2);
  const second = await events(`?limit=2&before=${first.nextBefore}`);
  expect(BigInt(second.items[0].seq)).toBeLessThan(BigInt(first.items[1].seq));
});

test('the trail exports as CSV that parses back, and the export is itself recorded', async () => {
  const res = await request(t.app).get('/api/audit-events/export.csv').set(auditor);
  expect(res.status).toBe(200);
  const rows: Record<string, string>[] = parseCsv(res.text, { columns: true });
  const { items } = await events('?limit=500');
  expect(rows.length).toBeGreaterThanOrEqual(items.length - 1);
  const first = rows[0];
  expect(first.prev_hash).toBe(GENESIS_HASH);
  expect(JSON.parse(rows.find((r) => r.action === 'user.update')!.details)).toHaveProperty('changes');
  expect((await events('?action=export.audit-trail-csv')).items).toHaveLength(1);
});

test('only auditors and administrators read the trail', async () => {
  const engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  expect((await request(t.app).get('/api/audit-events').set(engineer)).status).toBe(403);
  expect((await request(t.app).get('/api/audit-events/verify').set(engineer)).status).toBe(403);
  expect((await request(t.app).get('/api/audit-events')).status).toBe(401);
  expect((await request(t.app).get('/api/audit-events').set(admin)).status).toBe(200);
});

test('an event altered behind the trigger is named by the verification', async () => {
  const { items } = await events('?limit=500');
  const victim = items[Math.floor(items.length / 2)];
  await t.db.dataSource.transaction(async (m) => {
    await m.query('alter table audit_events disable trigger audit_events_append_only');
    await m.query(`update audit_events set details = '{"reason":"edited"}' where seq = $1`, [victim.seq]);
    await m.query('alter table audit_events enable trigger audit_events_append_only');
  });
  const result = (await request(t.app).get('/api/audit-events/verify').set(auditor)).body;
  expect(result.ok).toBe(false);
  expect(result.firstBroken.seq).toBe(victim.seq);
  expect(result.firstBroken.reason).toMatch(/altered/);
});
