// Alerts (issue 7): a background check records each run-rule signal or passed limit once, e-mails the
// subscribed supervisors once through the outbox, and keeps every alert; supervisors acknowledge with a note.
import request from 'supertest';
import { alertLimitListSchema, alertPageSchema, alertSchema } from '../../shared/api/alerts';
import { ALERT_CHECK_QUEUE } from '../../server/components/alerts/service';
import { JobQueue } from '../../server/lib/jobs';
import { startFakeSmtp } from '../../server/lib/fake-smtp';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';
import { SPOT_RULE } from '../support/photos';

let t: TestApp;
let smtp: Awaited<ReturnType<typeof startFakeSmtp>>;
let supervisor: { Authorization: string };
let auditor: { Authorization: string };
let ruleId: string;
const stations: Record<'drifting' | 'steady' | 'racing' | 'queued', string> = { drifting: '', steady: '', racing: '', queued: '' };

// A fixed "now" well in the past, so that the check the background worker runs at start sees none of it.
const NOW = new Date('2025-03-20T12:00:00Z');
const day = (k: number) => new Date(Date.UTC(2025, 2, 1 + k)); // k = 0 → 1 March 2025
// 50 parts a day for 19 days: 2 defective a day, then a drift over the last four days.
const DRIFT = [...Array(15).fill(2), 12, 14, 16, 18];

async function insertDays(stationId: string, defectives: number[], firstDay: Date, n = 50): Promise<void> {
  const rows = defectives.flatMap((d, k) =>
    Array.from({ length: n }, (_, i) => ({ at: new Date(firstDay.getTime() + k * 86_400_000 + (8 * 60 + i * 7) * 60_000).toISOString(), verdict: i < d ? 'FAIL' : 'PASS' })),
  );
  await t.db.dataSource.query(
    `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, cause, quality, duration_ms, created_at)
     select 'sql-' || gen_random_uuid(), v.id, v.rule_id, s.id, s.line_id, 'plate', u.id, repeat('a', 64), r.verdict, case when r.verdict = 'FAIL' then 'Spot area' end, '{}', 5, r.at
     from unnest($2::timestamptz[], $3::text[]) as r(at, verdict), rule_versions v, stations s, users u
     where v.rule_id = $1 and v.state = 'released' and s.id = $4 and u.username = 'tomas'`,
    [ruleId, rows.map((r) => r.at), rows.map((r) => r.verdict), stationId],
  );
}

/** Waits until the outbox worker (or a flush) has sent everything waiting. */
async function allSent(): Promise<void> {
  await t.services.mail.flush();
  for (let i = 0; i < 100; i++) {
    const [{ n }] = await t.db.dataSource.query('select count(*)::int as n from outbox_messages where sent_at is null');
    if (n === 0) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error('the outbox did not empty');
}

const outbox = () => t.db.dataSource.query(`select recipients, subject, body from outbox_messages order by created_at`) as Promise<{ recipients: string[]; subject: string; body: string }[]>;
const alertsAt = (stationId: string) =>
  t.db.dataSource.query(`select signal, period_start, kind from alerts where station_id = $1 order by period_start, signal`, [stationId]) as Promise<{ signal: string; period_start: Date; kind: string }[]>;

beforeAll(async () => {
  smtp = await startFakeSmtp({ port: 0 });
  t = await createTestApp({ smtp: { host: '127.0.0.1', port: smtp.port, from: 'Kernwright <kw@test.example>' } }, { queue: true });
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  const engineer = await t.createUser('ines', ['engineer']);
  const mara = await t.createUser('mara', ['supervisor'], { email: 'mara@plant.example' });
  await t.createUser('lena', ['supervisor', 'engineer'], { email: 'lena@plant.example' });
  await t.createUser('otto', ['supervisor'], { email: 'otto@plant.example' });
  await t.createUser('nils', ['supervisor'], { email: 'nils@plant.example', active: false });
  await t.createUser('kofi', ['auditor'], { email: 'kofi@plant.example' });
  await t.createUser('tomas', ['operator']);
  supervisor = { Authorization: `Bearer ${await t.tokenFor('mara')}` };
  auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  const line = await t.services.stations.createLine(mara, { name: 'Line 1' });
  for (const name of Object.keys(stations) as (keyof typeof stations)[])
    stations[name] = (await t.services.stations.createStation(mara, { lineId: line.id, name: `Press ${name}`, cameraNote: '' })).id;
  const rule = await t.services.rules.create(engineer, { name: 'Plate spots', partType: 'plate', smallestDefectMm: null, document: SPOT_RULE });
  ruleId = rule.id;
  const versionId = rule.versions[0].id;
  const [set] = await t.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ('s', 'plate', $1) returning id`, [engineer.id]);
  await t.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [versionId, set.id, rule.versions[0].contentHash, engineer.id]);
  await t.services.rules.submit(engineer, versionId, '');
  await t.services.rules.release(mara, versionId, { password: TEST_PASSWORD, meaning: 'approval', note: '' });
  await allSent(); // the release e-mail
  smtp.received.length = 0;
  await t.db.dataSource.query(`insert into alert_subscriptions (user_id, subscribed) select id, false from users where username = 'otto'`);
  await insertDays(stations.drifting, DRIFT, day(0));
  await insertDays(stations.steady, Array(19).fill(2), day(0));
}, 120_000);
afterAll(async () => {
  await t.close();
  await smtp.close();
});

describe('the check', () => {
  test('a drift raises one alert per signal, and one e-mail reaches each subscribed supervisor', async () => {
    const before = (await outbox()).length;
    const outcome = await t.services.alerts.check(NOW);
    // p̄ = 90/950, sigma = sqrt(p̄(1 − p̄)/50) = 0.041415, UCL = 0.21898 (NIST/SEMATECH e-Handbook §6.3.3.2, by hand);
    // z of the last four days 3.51, 4.47, 5.44, 6.41 and −1.32 before. Western Electric (REFERENCES.md §7):
    // rule 1 on each of the four days; rule 2 (2 of 3 beyond 2 sigma) from the second; rule 3 (4 of 5 beyond
    // 1 sigma) on the fourth. The low side ends before the latest day: no low-side alert.
    const expected = [
      ['WE1', 15],
      ['WE1', 16],
      ['WE2', 16],
      ['WE1', 17],
      ['WE2', 17],
      ['WE1', 18],
      ['WE2', 18],
      ['WE3', 18],
    ].map(([signal, k]) => ({ signal, period_start: day(k as number), kind: 'run-rule' }));
    expect(await alertsAt(stations.drifting)).toEqual(expected);
    expect(await alertsAt(stations.steady)).toEqual([]);
    expect(outcome).toEqual({ series: 2, raised: 8 });

    const mails = (await outbox()).slice(before);
    expect(mails).toHaveLength(1);
    expect(mails[0].recipients).toEqual(['lena@plant.example', 'mara@plant.example']); // otto unsubscribed, nils inactive, kofi no supervisor
    expect(mails[0].subject).toBe('Alert: Plate spots at Press drifting (Line 1), 8 new signals');
    expect(mails[0].body).toContain('WE1: 1 point beyond 3 sigma on the high side, ending 2025-03-19 (36.0 % defective, 18 of 50; centre line 9.5 % over the 19 days checked)');
    await allSent();
    expect(smtp.received.flatMap((m) => m.to).sort()).toEqual(['lena@plant.example', 'mara@plant.example']);
  });

  test('running the check again records and mails nothing more', async () => {
    const before = { mails: (await outbox()).length, alerts: (await alertsAt(stations.drifting)).length };
    expect(await t.services.alerts.check(NOW)).toEqual({ series: 2, raised: 0 });
    expect((await outbox()).length).toBe(before.mails);
    expect((await alertsAt(stations.drifting)).length).toBe(before.alerts);
  });

  test('two checks at once record each signal once and send one e-mail', async () => {
    await insertDays(stations.racing, DRIFT, day(0));
    const before = (await outbox()).length;
    const outcomes = await Promise.all([t.services.alerts.check(NOW), t.services.alerts.check(NOW)]);
    expect(outcomes.map((o) => o.raised).reduce((a, b) => a + b)).toBe(8);
    expect(await alertsAt(stations.racing)).toHaveLength(8);
    const mails = (await outbox()).slice(before);
    expect(mails.map((m) => m.subject)).toEqual(['Alert: Plate spots at Press racing (Line 1), 8 new signals']);
  });

  test("a supervisor's limit raises an alert for each day above it", async () => {
    const res = await request(t.app).post('/api/alert-limits').set(supervisor).send({ ruleId, stationId: stations.drifting, maxDefectFraction: 0.3 });
    expect(res.status).toBe(201);
    expect(await t.services.alerts.check(NOW)).toMatchObject({ raised: 2 });
    const limits = (await alertsAt(stations.drifting)).filter((a) => a.kind === 'limit');
    // 16/50 = 0.32 and 18/50 = 0.36 are above 0.30; 14/50 = 0.28 is not.
    expect(limits.map((a) => a.period_start)).toEqual([day(17), day(18)]);
    const [mail] = (await outbox()).slice(-1);
    expect(mail.body).toContain('Defect fraction 32.0 % (16 of 50) on 2025-03-18 is above the limit of 30.0 % set for this station');
  });

  test('the background worker runs the check when the queue hands it a job', async () => {
    // Real dates this time: the worker's check looks at the days up to now.
    const today = new Date();
    today.setUTCHours(0, 0, 0, 0);
    await insertDays(stations.queued, DRIFT, new Date(today.getTime() - 19 * 86_400_000));
    const sender = await new JobQueue(t.db.url).start();
    try {
      await sender.send(ALERT_CHECK_QUEUE, {});
      for (let i = 0; i < 120 && (await alertsAt(stations.queued)).length === 0; i++) await new Promise((r) => setTimeout(r, 500));
    } finally {
      await sender.stop();
    }
    expect((await alertsAt(stations.queued)).map((a) => a.signal)).toContain('WE1');
  });
});

describe('the alerts list and acknowledgement', () => {
  test('open alerts are listed newest first and page by keyset', async () => {
    const first = alertPageSchema.parse((await request(t.app).get('/api/alerts?limit=5').set(auditor)).body);
    expect(first.items).toHaveLength(5);
    expect(first.items[0]).toMatchObject({ ruleName: 'Plate spots', lineName: 'Line 1', acknowledgedAt: null });
    const rest = alertPageSchema.parse((await request(t.app).get(`/api/alerts?limit=200&after=${first.next}`).set(auditor)).body);
    const all = [...first.items, ...rest.items];
    const [{ n }] = await t.db.dataSource.query('select count(*)::int as n from alerts');
    expect(all).toHaveLength(n);
    expect(new Set(all.map((a) => a.id)).size).toBe(n);
    const keys = all.map((a) => [a.createdAt, a.id].join(' '));
    expect(keys).toEqual([...keys].sort().reverse());
    expect(rest.next).toBeNull();
  });

  test('a supervisor acknowledges an alert with a note; a second acknowledgement is refused', async () => {
    const [open] = alertPageSchema.parse((await request(t.app).get('/api/alerts?limit=1').set(supervisor)).body).items;
    const res = await request(t.app).post(`/api/alerts/${open.id}/acknowledge`).set(supervisor).send({ note: 'Deburr brush worn; replaced at 14:10' });
    expect(res.status).toBe(200);
    const acknowledged = alertSchema.parse(res.body);
    expect(acknowledged).toMatchObject({ acknowledgedBy: 'Test mara', acknowledgementNote: 'Deburr brush worn; replaced at 14:10' });
    expect(Date.parse(acknowledged.acknowledgedAt!)).toBeLessThanOrEqual(Date.now());
    const again = await request(t.app).post(`/api/alerts/${open.id}/acknowledge`).set(supervisor).send({ note: 'Once more' });
    expect(again.status).toBe(409);
    const [event] = await t.db.dataSource.query(`select actor_name, details from audit_events where action = 'alert.acknowledge'`);
    expect(event).toMatchObject({ actor_name: 'mara', details: { note: 'Deburr brush worn; replaced at 14:10' } });
    const acknowledgedList = alertPageSchema.parse((await request(t.app).get('/api/alerts?state=acknowledged').set(supervisor)).body);
    expect(acknowledgedList.items.map((a) => a.id)).toEqual([open.id]);
    const openList = alertPageSchema.parse((await request(t.app).get('/api/alerts?state=open&limit=200').set(supervisor)).body);
    expect(openList.items.map((a) => a.id)).not.toContain(open.id);
  });

  test('an acknowledgement needs a note', async () => {
    const [open] = alertPageSchema.parse((await request(t.app).get('/api/alerts?limit=1').set(supervisor)).body).items;
    const res = await request(t.app).post(`/api/alerts/${open.id}/acknowledge`).set(supervisor).send({ note: ' ' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.issues[0].path).toBe('note');
  });

  test('the database keeps every alert: no delete, and no change but the first acknowledgement', async () => {
    const [{ id }] = await t.db.dataSource.query(`select id from alerts where acknowledged_at is not null`);
    await expect(t.db.dataSource.query('delete from alerts where id = $1', [id])).rejects.toThrow(/cannot be deleted/);
    await expect(t.db.dataSource.query(`update alerts set acknowledgement_note = 'edited' where id = $1`, [id])).rejects.toThrow(/only be acknowledged, once/);
    await expect(t.db.dataSource.query(`update alerts set description = 'edited' where acknowledged_at is null`)).rejects.toThrow(/only be acknowledged, once/);
    await expect(t.db.dataSource.query('truncate alerts')).rejects.toThrow(/not allowed/);
  });
});

describe('limits and subscription', () => {
  test('limits are listed, one per rule and station, and removed', async () => {
    const list = alertLimitListSchema.parse((await request(t.app).get('/api/alert-limits').set(auditor)).body);
    expect(list.items).toEqual([expect.objectContaining({ ruleName: 'Plate spots', stationName: 'Press drifting', maxDefectFraction: 0.3, createdBy: 'Test mara' })]);
    const twice = await request(t.app).post('/api/alert-limits').set(supervisor).send({ ruleId, stationId: stations.drifting, maxDefectFraction: 0.2 });
    expect(twice.status).toBe(409);
    const everywhere = await request(t.app).post('/api/alert-limits').set(supervisor).send({ ruleId, maxDefectFraction: 0.25 });
    expect(everywhere.status).toBe(201);
    expect(everywhere.body).toMatchObject({ stationId: null, stationName: null });
    expect((await request(t.app).delete(`/api/alert-limits/${everywhere.body.id}`).set(supervisor)).status).toBe(204);
    expect((await request(t.app).delete(`/api/alert-limits/${everywhere.body.id}`).set(supervisor)).status).toBe(404);
    const actions = (await t.db.dataSource.query(`select action from audit_events where entity_type = 'alert-limit' order by seq`)).map((e: { action: string }) => e.action);
    expect(actions).toEqual(['alert-limit.create', 'alert-limit.create', 'alert-limit.delete']);
  });

  test('a limit is a fraction above 0 and at most 1', async () => {
    for (const maxDefectFraction of [0, 1.5, -0.1]) {
      const res = await request(t.app).post('/api/alert-limits').set(supervisor).send({ ruleId, maxDefectFraction });
      expect(res.status).toBe(400);
      expect(res.body.error.details.issues[0].path).toBe('maxDefectFraction');
    }
  });

  test('supervisors are subscribed until they turn alert e-mails off', async () => {
    expect((await request(t.app).get('/api/alerts/subscription').set(supervisor)).body).toEqual({ subscribed: true });
    const off = await request(t.app).put('/api/alerts/subscription').set(supervisor).send({ subscribed: false });
    expect(off.body).toEqual({ subscribed: false });
    expect((await request(t.app).get('/api/alerts/subscription').set(supervisor)).body).toEqual({ subscribed: false });
    await request(t.app).put('/api/alerts/subscription').set(supervisor).send({ subscribed: true });
    expect((await request(t.app).get('/api/alerts/subscription').set(auditor)).body).toEqual({ subscribed: false });
  });
});

test('auditors read alerts but change nothing; operators and engineers see none; nobody without signing in', async () => {
  const [{ id }] = await t.db.dataSource.query(`select id from alerts where acknowledged_at is null limit 1`);
  expect((await request(t.app).post(`/api/alerts/${id}/acknowledge`).set(auditor).send({ note: 'Seen it' })).status).toBe(403);
  expect((await request(t.app).post('/api/alert-limits').set(auditor).send({ ruleId, maxDefectFraction: 0.5 })).status).toBe(403);
  expect((await request(t.app).put('/api/alerts/subscription').set(auditor).send({ subscribed: true })).status).toBe(403);
  const [{ limitId }] = await t.db.dataSource.query(`select id as "limitId" from alert_limits limit 1`);
  expect((await request(t.app).delete(`/api/alert-limits/${limitId}`).set(auditor)).status).toBe(403);
  for (const username of ['tomas', 'ines']) {
    const auth = { Authorization: `Bearer ${await t.tokenFor(username)}` };
    expect((await request(t.app).get('/api/alerts').set(auth)).status).toBe(403);
    expect((await request(t.app).get('/api/alert-limits').set(auth)).status).toBe(403);
  }
  expect((await request(t.app).get('/api/alerts')).status).toBe(401);
});
