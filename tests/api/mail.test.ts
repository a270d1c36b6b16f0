// E-mail through the outbox to a stand-in SMTP server on loopback (issue 6).
import request from 'supertest';
import { startFakeSmtp } from '../../server/lib/fake-smtp';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';
import { SPOT_RULE } from '../support/photos';

let t: TestApp;
let smtp: Awaited<ReturnType<typeof startFakeSmtp>>;
let engineer: { Authorization: string };
let supervisor: { Authorization: string };

async function draftWithTrial(name: string): Promise<string> {
  const rule = await request(t.app).post('/api/rules').set(engineer).send({ name, partType: 'plate', document: SPOT_RULE });
  const v = rule.body.versions[0];
  const [set] = await t.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ($1, 'plate', $2) returning id`, [`set ${name}`, v.author.id]);
  await t.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [v.id, set.id, v.contentHash, v.author.id]);
  return v.id;
}

const subjects = () => smtp.received.map((m) => /^Subject: (.*)$/m.exec(m.raw)?.[1]);

beforeAll(async () => {
  smtp = await startFakeSmtp({ port: 0 });
  t = await createTestApp({ smtp: { host: '127.0.0.1', port: smtp.port, from: 'Kernwright <kw@test.example>' } });
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  await t.createUser('ines', ['engineer'], { email: 'ines@plant.example' });
  await t.createUser('mara', ['supervisor'], { email: 'mara@plant.example' });
  await t.createUser('otto', ['supervisor'], { email: 'otto@plant.example', active: false });
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  supervisor = { Authorization: `Bearer ${await t.tokenFor('mara')}` };
});
afterAll(async () => {
  await t.close();
  await smtp.close();
});

test('a submission e-mails the active supervisors, through the outbox', async () => {
  const id = await draftWithTrial('Plate spots');
  await request(t.app).post(`/api/rule-versions/${id}/submit`).set(engineer).send({ note: 'Ready' });
  const [pending] = await t.db.dataSource.query('select recipients, sent_at from outbox_messages');
  expect(pending).toMatchObject({ recipients: ['mara@plant.example'], sent_at: null });
  expect(await t.services.mail.flush()).toEqual({ sent: 1, waiting: 0 });
  expect(smtp.received[0].to).toEqual(['mara@plant.example']);
  expect(subjects()).toEqual(['Review requested: Plate spots, version 1']);
});

test('the author hears of the decision', async () => {
  const [{ id }] = await t.db.dataSource.query(`select id from rule_versions where state = 'in-review'`);
  await request(t.app).post(`/api/rule-versions/${id}/release`).set(supervisor).send({ password: TEST_PASSWORD, meaning: 'approval' });
  await t.services.mail.flush();
  expect(smtp.received.at(-1)!.to).toEqual(['ines@plant.example']);
  expect(subjects().at(-1)).toBe('Released: Plate spots, version 1');
});

test('while the mail server is down nothing is lost: the message waits and goes when it is back', async () => {
  const port = smtp.port;
  await smtp.close();
  const id = await draftWithTrial('Plate edges');
  await request(t.app).post(`/api/rule-versions/${id}/submit`).set(engineer).send({});
  await request(t.app).post(`/api/rule-versions/${id}/send-back`).set(supervisor).send({ note: 'Limit too loose' });
  expect(await t.services.mail.flush()).toEqual({ sent: 0, waiting: 2 });
  // The first attempt fails and is put off (a flush stops at the first failure: the server is down for all).
  const waiting = await t.db.dataSource.query('select attempts, last_error, next_attempt_at > now() as later from outbox_messages where sent_at is null order by created_at');
  expect(waiting).toHaveLength(2);
  expect(waiting[0]).toMatchObject({ attempts: 1, later: true, last_error: expect.stringMatching(/ECONNREFUSED|connect/i) });

  smtp = await startFakeSmtp({ port });
  await t.db.dataSource.query('update outbox_messages set next_attempt_at = now() where sent_at is null'); // the retry delay has passed
  expect(await t.services.mail.flush()).toEqual({ sent: 2, waiting: 0 });
  expect(subjects()).toEqual(['Review requested: Plate edges, version 1', 'Sent back: Plate edges, version 1']);
});
