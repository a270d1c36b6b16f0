import request from 'supertest';
import { ruleDetailSchema, ruleVersionSchema, type RuleSummary } from '../../shared/api/rules';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

let t: TestApp;
let engineer: { Authorization: string };
let dualRole: { Authorization: string };
let supervisor: { Authorization: string };

const DOCUMENT = {
  format: 'kernwright-rule/1',
  name: 'Washer rim burr',
  steps: [
    { op: 'gaussian', sigma: 1.2 },
    { op: 'gradient', operator: 'sobel', output: 'magnitude' },
    { op: 'threshold', method: 'otsu' },
    { op: 'open', radius: 1 },
  ],
  gauges: [{ name: 'Burr area', measure: 'largest-blob-area', unit: 'px2', limits: { max: 500 } }],
};

beforeAll(async () => {
  t = await createTestApp();
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('washer-m16', 'Washer M16', 'washer')`);
  await t.createUser('ines', ['engineer']);
  await t.createUser('dual', ['engineer', 'supervisor']);
  await t.createUser('mara', ['supervisor']);
  await t.createUser('kofi', ['auditor']);
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  dualRole = { Authorization: `Bearer ${await t.tokenFor('dual')}` };
  supervisor = { Authorization: `Bearer ${await t.tokenFor('mara')}` };
});
afterAll(() => t.close());

/** A finished trial on exactly the version's current content (the trial runner is tested on its own). */
async function recordDoneTrial(versionId: string): Promise<void> {
  const [v] = await t.db.dataSource.query('select content_hash, author_id from rule_versions where id = $1', [versionId]);
  const [set] = await t.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ($1, 'washer-m16', $2) returning id`, [`set ${versionId} ${Math.random()}`, v.author_id]);
  await t.db.dataSource.query(
    `insert into trials (rule_version_id, reference_set_id, content_hash, state, total, processed, started_by, finished_at) values ($1, $2, $3, 'done', 0, 0, $4, now())`,
    [versionId, set.id, v.content_hash, v.author_id],
  );
}

async function createRule(name: string, auth = engineer) {
  const res = await request(t.app).post('/api/rules').set(auth).send({ name, partType: 'washer-m16', smallestDefectMm: 0.3, document: DOCUMENT });
  expect(res.status).toBe(201);
  return ruleDetailSchema.parse(res.body);
}

test('an engineer creates a rule whose first version is a draft with a content hash', async () => {
  const rule = await createRule('Washer rim burr');
  expect(rule.versions).toHaveLength(1);
  expect(rule.versions[0]).toMatchObject({ number: 1, state: 'draft', author: { name: 'Test ines' } });
  expect(rule.versions[0].contentHash).toMatch(/^[0-9a-f]{64}$/);
  expect(rule.latestVersion.state).toBe('draft');
  expect(rule.releasedVersion).toBeNull();
});

test('an invalid document is refused with the JSON path of each problem', async () => {
  const bad = { ...DOCUMENT, steps: [{ op: 'gaussian', sigma: 50 }, { op: 'kernel', kernel: 'no-such-kernel' }] };
  const res = await request(t.app).post('/api/rules').set(engineer).send({ name: 'Bad', partType: 'washer-m16', document: bad });
  expect(res.status).toBe(400);
  expect(res.body.error.details.issues[0].path).toBe('document.steps[0].sigma');
  const unknownKernel = await request(t.app).post('/api/rules').set(engineer).send({ name: 'Bad', partType: 'washer-m16', document: { ...DOCUMENT, steps: [{ op: 'kernel', kernel: 'no-such-kernel' }] } });
  expect(unknownKernel.status).toBe(400);
  expect(unknownKernel.body.error.details.issues[0]).toEqual({ path: 'document.steps[0].kernel', message: 'No kernel named "no-such-kernel" in the library' });
  const builtIn = await request(t.app).post('/api/rules').set(engineer).send({ name: 'Sobel only', partType: 'washer-m16', document: { ...DOCUMENT, steps: [{ op: 'kernel', kernel: 'sobel-x' }], gauges: [] } });
  expect(builtIn.status).toBe(201);
});

test('a draft cannot be submitted without a trial on its current content', async () => {
  const rule = await createRule('Needs a trial');
  const id = rule.versions[0].id;
  const none = await request(t.app).post(`/api/rule-versions/${id}/submit`).set(engineer).send({});
  expect(none.status).toBe(409);
  await recordDoneTrial(id);
  const edited = await request(t.app).put(`/api/rule-versions/${id}/document`).set(engineer).send({ document: { ...DOCUMENT, border: 'replicate' } });
  expect(edited.status).toBe(200);
  const stale = await request(t.app).post(`/api/rule-versions/${id}/submit`).set(engineer).send({});
  expect(stale.status).toBe(409);
  expect(stale.body.error.message).toMatch(/changed after its latest trial/);
  await recordDoneTrial(id);
  const ok = await request(t.app).post(`/api/rule-versions/${id}/submit`).set(engineer).send({ note: 'Tuned on 60 washers' });
  expect(ok.status).toBe(200);
  expect(ok.body).toMatchObject({ state: 'in-review', authorNote: 'Tuned on 60 washers' });
  const locked = await request(t.app).put(`/api/rule-versions/${id}/document`).set(engineer).send({ document: DOCUMENT });
  expect(locked.status).toBe(409);
});

describe('release', () => {
  let versionId: string;
  let ruleId: string;
  beforeAll(async () => {
    const rule = await createRule('Release me', dualRole);
    ruleId = rule.id;
    versionId = rule.versions[0].id;
    await recordDoneTrial(versionId);
    expect((await request(t.app).post(`/api/rule-versions/${versionId}/submit`).set(dualRole).send({})).status).toBe(200);
  });

  test('the author cannot release their own version, even holding the supervisor role', async () => {
    const res = await request(t.app).post(`/api/rule-versions/${versionId}/release`).set(dualRole).send({ password: TEST_PASSWORD, meaning: 'approval' });
    expect(res.status).toBe(403);
  });

  test('a wrong password signs nothing', async () => {
    const res = await request(t.app).post(`/api/rule-versions/${versionId}/release`).set(supervisor).send({ password: 'wrong-password', meaning: 'approval' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.issues[0].path).toBe('password');
    expect((await request(t.app).get(`/api/rule-versions/${versionId}`).set(supervisor)).body.state).toBe('in-review');
  });

  test('another supervisor releases it with a signature showing name, time and meaning, bound to the content', async () => {
    const res = await request(t.app).post(`/api/rule-versions/${versionId}/release`).set(supervisor).send({ password: TEST_PASSWORD, meaning: 'approval', note: 'Trial acceptable' });
    expect(res.status).toBe(200);
    const version = ruleVersionSchema.parse(res.body);
    expect(version).toMatchObject({ state: 'released', reviewer: { name: 'Test mara' }, reviewNote: 'Trial acceptable' });
    expect(version.signatures).toHaveLength(1);
    expect(version.signatures[0]).toMatchObject({ signerName: 'Test mara', meaning: 'approval', contentHash: version.contentHash, valid: true });
    expect(Date.parse(version.signatures[0].signedAt)).toBeLessThanOrEqual(Date.now());
  });

  test('a release keeps the submitted trial’s escapes with its audit event (the signer saw them in the app)', async () => {
    const rule = await createRule('Release with escapes', dualRole);
    const id = rule.versions[0].id;
    const [v] = await t.db.dataSource.query('select content_hash, author_id from rule_versions where id = $1', [id]);
    const [set] = await t.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ('escapes set', 'washer-m16', $1) returning id`, [v.author_id]);
    // 3 of 4 defective parts passed: an escape rate of 75 % (defective judged PASS ÷ labelled defective).
    const rate = (count: number, of: number) => ({ count, of, rate: count / of, low: null, high: null });
    const summary = { agreement: rate(7, 10), falseRejectRate: rate(0, 6), escapeRate: rate(3, 4) };
    await t.db.dataSource.query(
      `insert into trials (rule_version_id, reference_set_id, content_hash, state, total, processed, started_by, finished_at, summary) values ($1, $2, $3, 'done', 10, 10, $4, now(), $5)`,
      [id, set.id, v.content_hash, v.author_id, JSON.stringify(summary)],
    );
    expect((await request(t.app).post(`/api/rule-versions/${id}/submit`).set(dualRole).send({ note: 'Escapes explained' })).status).toBe(200);
    expect((await request(t.app).post(`/api/rule-versions/${id}/release`).set(supervisor).send({ password: TEST_PASSWORD, meaning: 'approval' })).status).toBe(200);
    const [event] = await t.db.dataSource.query(`select details from audit_events where action = 'rule-version.release' and entity_id = $1`, [id]);
    expect(event.details.trialCautions).toEqual(['In its trial the rule passed 3 of 4 defective parts (escape rate 75.0 %): released as it is, it would ship parts like them.']);
  });

  test('changing the released content behind the database’s back breaks the signature', async () => {
    await t.db.dataSource.transaction(async (m) => {
      await m.query('alter table rule_versions disable trigger rule_versions_frozen');
      await m.query(`update rule_versions set document = jsonb_set(document, '{gauges,0,limits,max}', '9999') where id = $1`, [versionId]);
      await m.query('alter table rule_versions enable trigger rule_versions_frozen');
    });
    const version = ruleVersionSchema.parse((await request(t.app).get(`/api/rule-versions/${versionId}`).set(supervisor)).body);
    expect(version.signatures[0].valid).toBe(false);
    await t.db.dataSource.transaction(async (m) => {
      await m.query('alter table rule_versions disable trigger rule_versions_frozen');
      await m.query(`update rule_versions set document = jsonb_set(document, '{gauges,0,limits,max}', '500') where id = $1`, [versionId]);
      await m.query('alter table rule_versions enable trigger rule_versions_frozen');
    });
    expect(ruleVersionSchema.parse((await request(t.app).get(`/api/rule-versions/${versionId}`).set(supervisor)).body).signatures[0].valid).toBe(true);
  });

  test('no route changes a released version; editing starts a new draft, and its release supersedes the old one', async () => {
    expect((await request(t.app).put(`/api/rule-versions/${versionId}/document`).set(engineer).send({ document: DOCUMENT })).status).toBe(409);
    const draft = await request(t.app).post(`/api/rules/${ruleId}/versions`).set(engineer).send({});
    expect(draft.status).toBe(201);
    expect(draft.body).toMatchObject({ number: 2, state: 'draft' });
    expect((await request(t.app).post(`/api/rules/${ruleId}/versions`).set(engineer).send({})).status).toBe(409);
    await request(t.app).put(`/api/rule-versions/${draft.body.id}/document`).set(engineer).send({ document: { ...DOCUMENT, border: 'constant' } });
    await recordDoneTrial(draft.body.id);
    await request(t.app).post(`/api/rule-versions/${draft.body.id}/submit`).set(engineer).send({});
    const released = await request(t.app).post(`/api/rule-versions/${draft.body.id}/release`).set(dualRole).send({ password: TEST_PASSWORD, meaning: 'responsibility' });
    expect(released.status).toBe(200);
    const rule = ruleDetailSchema.parse((await request(t.app).get(`/api/rules/${ruleId}`).set(engineer)).body);
    expect(rule.versions.map((v) => `${v.number}:${v.state}`)).toEqual(['2:released', '1:superseded']);
    expect(rule.releasedVersion?.number).toBe(2);
  });

  test('a supervisor withdraws a version with a reason', async () => {
    const rule = ruleDetailSchema.parse((await request(t.app).get(`/api/rules/${ruleId}`).set(engineer)).body);
    const res = await request(t.app).post(`/api/rule-versions/${rule.versions[0].id}/withdraw`).set(supervisor).send({ reason: 'Drawing revision C changed the rim tolerance' });
    expect(res.body).toMatchObject({ state: 'withdrawn', withdrawReason: 'Drawing revision C changed the rim tolerance' });
    expect((await request(t.app).post(`/api/rule-versions/${rule.versions[0].id}/withdraw`).set(supervisor).send({ reason: 'again' })).status).toBe(409);
  });
});

test('a supervisor sends a version back with a note; it becomes a draft again', async () => {
  const rule = await createRule('Send me back');
  const id = rule.versions[0].id;
  await recordDoneTrial(id);
  await request(t.app).post(`/api/rule-versions/${id}/submit`).set(engineer).send({});
  const res = await request(t.app).post(`/api/rule-versions/${id}/send-back`).set(supervisor).send({ note: 'Limit too loose for the M16 drawing' });
  expect(res.body).toMatchObject({ state: 'draft', reviewNote: 'Limit too loose for the M16 drawing' });
  // The rules list marks it, so that its engineer sees which drafts wait for their changes; a new rule's draft is not marked.
  const listed = (await request(t.app).get('/api/rules').query({ q: 'Send me back' }).set(engineer)).body.items;
  expect(listed.map((r: RuleSummary) => r.latestVersion)).toEqual([expect.objectContaining({ id, state: 'draft', sentBack: true })]);
  const fresh = await createRule('Never reviewed');
  const freshListed = (await request(t.app).get('/api/rules').query({ q: 'Never reviewed' }).set(engineer)).body.items;
  expect(freshListed.map((r: RuleSummary) => r.latestVersion)).toEqual([expect.objectContaining({ id: fresh.versions[0].id, sentBack: false })]);
  // Sent for review again, it is no longer marked.
  await recordDoneTrial(id);
  await request(t.app).post(`/api/rule-versions/${id}/submit`).set(engineer).send({});
  const resubmitted = (await request(t.app).get('/api/rules').query({ q: 'Send me back' }).set(engineer)).body.items;
  expect(resubmitted[0].latestVersion).toMatchObject({ state: 'in-review', sentBack: false });
});

test('roles: operators and auditors read rules but cannot write them; engineers cannot release', async () => {
  const auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  expect((await request(t.app).get('/api/rules').set(auditor)).status).toBe(200);
  expect((await request(t.app).post('/api/rules').set(auditor).send({ name: 'x', partType: 'washer-m16', document: DOCUMENT })).status).toBe(403);
  const rule = await createRule('Role check');
  expect((await request(t.app).put(`/api/rule-versions/${rule.versions[0].id}/document`).set(auditor).send({ document: DOCUMENT })).status).toBe(403);
  expect((await request(t.app).post(`/api/rule-versions/${rule.versions[0].id}/release`).set(engineer).send({ password: TEST_PASSWORD, meaning: 'approval' })).status).toBe(403);
  expect((await request(t.app).get('/api/rules')).status).toBe(401);
});

test('the list finds rules by name, part type and state', async () => {
  const all = (await request(t.app).get('/api/rules').set(engineer)).body;
  expect(all.total).toBeGreaterThan(3);
  const released = (await request(t.app).get('/api/rules?state=withdrawn').set(engineer)).body;
  expect(released.items.map((r: { name: string }) => r.name)).toEqual(['Release me']);
  const byName = (await request(t.app).get('/api/rules?q=send').set(engineer)).body;
  expect(byName.items.map((r: { name: string }) => r.name)).toEqual(['Send me back']);
});

test('the list narrows to the rules a person owns and shows each rule’s newest trial', async () => {
  const theirs = await createRule('Dual’s own rule', dualRole);
  const mine = await createRule('Ines’s trialled rule');
  const versionId = mine.versions[0].id;
  await recordDoneTrial(versionId);
  // A later trial with figures: 9 of 10 agree, 1 of 6 good parts rejected, 0 of 4 defectives passed.
  const [v] = await t.db.dataSource.query('select content_hash, author_id from rule_versions where id = $1', [versionId]);
  const [set] = await t.db.dataSource.query('select id from reference_sets order by created_at desc limit 1');
  const rate = (count: number, of: number) => ({ count, of, rate: count / of, low: null, high: null });
  const summary = { agreement: rate(9, 10), falseRejectRate: rate(1, 6), escapeRate: rate(0, 4) };
  await t.db.dataSource.query(
    `insert into trials (rule_version_id, reference_set_id, content_hash, state, total, processed, started_by, finished_at, summary, created_at)
     values ($1, $2, $3, 'done', 10, 10, $4, now(), $5, now() + interval '1 minute')`,
    [versionId, set.id, v.content_hash, v.author_id, JSON.stringify(summary)],
  );

  const own = (await request(t.app).get('/api/rules?owner=me&limit=200').set(dualRole)).body;
  const ownIds = own.items.map((r: { id: string }) => r.id);
  expect(ownIds).toContain(theirs.id);
  expect(ownIds).not.toContain(mine.id);
  const byId = (await request(t.app).get(`/api/rules?owner=${mine.createdBy.id}&q=trialled`).set(dualRole)).body;
  expect(byId.items.map((r: { id: string }) => r.id)).toEqual([mine.id]);
  expect(byId.items[0].lastTrial).toMatchObject({ versionNumber: 1, state: 'done', agreement: 0.9, falseRejectRate: 1 / 6, escapeRate: 0 });
  expect(own.items.find((r: { id: string }) => r.id === theirs.id).lastTrial).toBeNull();
  const bad = await request(t.app).get('/api/rules?owner=someone').set(engineer);
  expect(bad.status).toBe(400);
});
