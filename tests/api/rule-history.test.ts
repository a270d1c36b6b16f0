// Rule history for auditors (issue 8): every version with its state changes, signatures, trials and
// what changed from the version before. 21 CFR 11.10(e) asks that record changes do not obscure what was
// recorded before (REFERENCES.md §10): the history shows every version and every change, with who and when.
import request from 'supertest';
import { ruleHistorySchema, type RuleHistory } from '../../shared/api/rule-history';
import { ruleDetailSchema } from '../../shared/api/rules';
import { confusionTable, trialFigures } from '../../shared/metrics/agreement';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

let t: TestApp;
let engineer: { Authorization: string };
let supervisor: { Authorization: string };
let auditor: { Authorization: string };
let ruleId: string;
let history: RuleHistory;

const DOCUMENT = {
  format: 'kernwright-rule/1',
  name: 'Gasket ring tear',
  steps: [
    { op: 'gaussian', sigma: 1.2 },
    { op: 'threshold', method: 'otsu' },
  ],
  gauges: [{ name: 'Tear area', measure: 'largest-blob-area', unit: 'px2', limits: { max: 500 } }],
};
const SECOND = {
  ...DOCUMENT,
  steps: [...DOCUMENT.steps, { op: 'open', radius: 1 }],
  gauges: [{ name: 'Tear area', measure: 'largest-blob-area', unit: 'px2', limits: { max: 350 } }],
};

// The worked example of REFERENCES.md §11 (Fawcett 2006 definitions; positive = defective):
// 1000 parts, 50 defective, TP 45, FN 5, FP 19, TN 931.
const WORKED_TABLE = confusionTable([
  ...Array.from({ length: 931 }, () => ({ label: 'good' as const, verdict: 'PASS' as const })),
  ...Array.from({ length: 19 }, () => ({ label: 'good' as const, verdict: 'FAIL' as const })),
  ...Array.from({ length: 45 }, () => ({ label: 'defective' as const, verdict: 'FAIL' as const })),
  ...Array.from({ length: 5 }, () => ({ label: 'defective' as const, verdict: 'PASS' as const })),
]);

/** A finished trial on exactly the version's current content, with the worked example's figures. */
async function recordDoneTrial(versionId: string, setName: string): Promise<void> {
  const q = (sql: string, p: unknown[]) => t.db.dataSource.query(sql, p);
  const [v] = await q('select content_hash, author_id from rule_versions where id = $1', [versionId]);
  const [set] = await q(`insert into reference_sets (name, part_type, created_by) values ($1, 'gasket', $2) returning id`, [setName, v.author_id]);
  const summary = { ...trialFigures(WORKED_TABLE), unlabelled: 0, medianMs: 12 };
  await q(
    `insert into trials (rule_version_id, reference_set_id, content_hash, state, total, processed, started_by, finished_at, summary)
     values ($1, $2, $3, 'done', 1000, 1000, $4, now(), $5)`,
    [versionId, set.id, v.content_hash, v.author_id, JSON.stringify(summary)],
  );
}

const ok = async (req: request.Test) => {
  const res = await req;
  if (res.status >= 300) throw new Error(`${res.status} ${JSON.stringify(res.body)}`);
  return res.body;
};

beforeAll(async () => {
  t = await createTestApp();
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('gasket', 'Gasket ring', 'gasket')`);
  await t.createUser('ines', ['engineer']);
  await t.createUser('mara', ['supervisor']);
  await t.createUser('kofi', ['auditor']);
  await t.createUser('tomas', ['operator']);
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  supervisor = { Authorization: `Bearer ${await t.tokenFor('mara')}` };
  auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };

  // Version 1: drafted, tried, submitted, released with the meaning "approval".
  const rule = ruleDetailSchema.parse(await ok(request(t.app).post('/api/rules').set(engineer).send({ name: 'Gasket ring tear', partType: 'gasket', smallestDefectMm: null, document: DOCUMENT })));
  ruleId = rule.id;
  const v1 = rule.versions[0].id;
  await recordDoneTrial(v1, 'Gaskets, spring batch');
  await ok(request(t.app).post(`/api/rule-versions/${v1}/submit`).set(engineer).send({ note: 'First release' }));
  await ok(request(t.app).post(`/api/rule-versions/${v1}/release`).set(supervisor).send({ password: TEST_PASSWORD, meaning: 'approval', note: 'Matches drawing rev B' }));

  // Version 2: a tighter limit and one more step; sent back once, then released, which supersedes version 1.
  const v2 = (await ok(request(t.app).post(`/api/rules/${ruleId}/versions`).set(engineer).send({ fromVersionId: v1 }))).id as string;
  await ok(request(t.app).put(`/api/rule-versions/${v2}/document`).set(engineer).send({ document: SECOND }));
  await recordDoneTrial(v2, 'Gaskets, summer batch');
  await ok(request(t.app).post(`/api/rule-versions/${v2}/submit`).set(engineer).send({ note: 'Tighter tear limit' }));
  await ok(request(t.app).post(`/api/rule-versions/${v2}/send-back`).set(supervisor).send({ note: 'Explain the opening step' }));
  await ok(request(t.app).post(`/api/rule-versions/${v2}/submit`).set(engineer).send({ note: 'The opening removes single-pixel noise' }));
  await ok(request(t.app).post(`/api/rule-versions/${v2}/release`).set(supervisor).send({ password: TEST_PASSWORD, meaning: 'responsibility', note: '' }));

  const res = await request(t.app).get(`/api/rules/${ruleId}/history`).set(auditor);
  expect(res.status).toBe(200);
  history = ruleHistorySchema.parse(res.body);
});
afterAll(() => t.close());

test('every version is listed, newest first, with its state', () => {
  expect(history.rule).toMatchObject({ id: ruleId, name: 'Gasket ring tear', partType: 'gasket', createdBy: { name: 'Test ines' } });
  expect(history.versions.map((v) => [v.number, v.state])).toEqual([
    [2, 'released'],
    [1, 'superseded'],
  ]);
  expect(history.events.map((e) => e.label)).toEqual(['Rule created']);
});

test('state changes come from the audit trail in order, with who, when and the note or meaning', () => {
  const [v2, v1] = history.versions;
  expect(v1.events.map((e) => [e.action, e.actor.name])).toEqual([
    ['rule-version.create', 'Test ines'],
    ['rule-version.submit', 'Test ines'],
    ['rule-version.release', 'Test mara'],
    ['rule-version.supersede', 'Test mara'],
  ]);
  expect(v1.events[1].note).toBe('First release');
  expect(v1.events[2]).toMatchObject({ label: 'Released with a signature', meaning: 'approval', note: 'Matches drawing rev B' });
  expect(v2.events.map((e) => e.action)).toEqual([
    'rule-version.create',
    'rule-version.save',
    'rule-version.submit',
    'rule-version.send-back',
    'rule-version.submit',
    'rule-version.release',
  ]);
  expect(v2.events[0].fromVersion).toBe(1);
  expect(v2.events[3]).toMatchObject({ label: 'Sent back to draft', note: 'Explain the opening step', actor: { name: 'Test mara' } });
  const seqs = [...v1.events, ...v2.events].map((e) => BigInt(e.seq));
  const times = v2.events.map((e) => Date.parse(e.occurredAt));
  expect(times).toEqual([...times].sort((a, b) => a - b));
  expect(new Set(seqs).size).toBe(seqs.length);
});

test('each release shows its signature: printed name, date and time, meaning, still valid (21 CFR 11.50)', () => {
  const [v2, v1] = history.versions;
  expect(v1.signatures).toHaveLength(1);
  expect(v1.signatures[0]).toMatchObject({ signerName: 'Test mara', meaning: 'approval', valid: true, contentHash: v1.contentHash });
  expect(v2.signatures[0]).toMatchObject({ signerName: 'Test mara', meaning: 'responsibility', valid: true, contentHash: v2.contentHash });
  expect(Date.parse(v2.signatures[0].signedAt)).toBe(Date.parse(v2.releasedAt!));
});

test('trials carry their summary figures (REFERENCES.md §11 worked example: false reject 2.0 %, escape 10.0 %, kappa 0.77695)', () => {
  const [v2, v1] = history.versions;
  expect(v1.trials).toHaveLength(1);
  const trial = v1.trials[0];
  expect(trial).toMatchObject({ state: 'done', referenceSetName: 'Gaskets, spring batch', submitted: true, onCurrentContent: true, images: 1000, startedBy: { name: 'Test ines' } });
  expect(trial.falseRejectRate).toBeCloseTo(19 / 950, 10);
  expect(trial.escapeRate).toBeCloseTo(5 / 50, 10);
  expect(trial.agreement).toBeCloseTo(0.976, 10);
  expect(trial.kappa).toBeCloseTo(0.77695, 5);
  expect(v2.trials.map((x) => x.referenceSetName)).toEqual(['Gaskets, summer batch']);
});

test('a version shows only what differs from the version before; the first has nothing to compare', () => {
  const [v2, v1] = history.versions;
  expect(v1.changes).toBeNull();
  expect(v2.changes!.fromNumber).toBe(1);
  expect(v2.changes!.rows).toEqual([
    { section: 'Steps', label: 'Step 3', before: null, after: 'Open: radius 1 px', change: 'added' },
    { section: 'Gauges', label: 'Tear area · limits', before: 'at most 500', after: 'at most 350', change: 'changed' },
  ]);
});

test('printing a version’s report appears in its history', async () => {
  const v1 = history.versions[1];
  await request(t.app).get(`/api/records/rule-versions/${v1.id}/report.pdf`).set(auditor).expect(200);
  const again = ruleHistorySchema.parse((await request(t.app).get(`/api/rules/${ruleId}/history`).set(auditor)).body);
  const last = again.versions[1].events.at(-1)!;
  expect(last).toMatchObject({ action: 'export.rule-version-pdf', label: 'Report printed (PDF)', actor: { name: 'Test kofi' } });
});

test('engineers, supervisors and auditors read the history; operators may not; signing in comes first', async () => {
  expect((await request(t.app).get(`/api/rules/${ruleId}/history`).set(engineer)).status).toBe(200);
  expect((await request(t.app).get(`/api/rules/${ruleId}/history`).set(supervisor)).status).toBe(200);
  const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  expect((await request(t.app).get(`/api/rules/${ruleId}/history`).set(operator)).status).toBe(403);
  expect((await request(t.app).get(`/api/rules/${ruleId}/history`)).status).toBe(401);
});

test('an unknown rule is 404 and a malformed id is 400', async () => {
  expect((await request(t.app).get('/api/rules/00000000-0000-4000-8000-000000000000/history').set(auditor)).status).toBe(404);
  const bad = await request(t.app).get('/api/rules/not-an-id/history').set(auditor);
  expect(bad.status).toBe(400);
  expect(bad.body.error.code).toBe('validation_failed');
});
