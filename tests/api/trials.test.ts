import request from 'supertest';
import { trialSchema, sweepSchema } from '../../shared/api/trials';
import { JobQueue } from '../../server/lib/jobs';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { createTestApp, type TestApp } from '../support/app';

jest.setTimeout(60_000);

let t: TestApp;
let engineer: { Authorization: string };
let setId: string;
let versionId: string;

const photo = spotPhoto;
const RULE = SPOT_RULE;

async function upload(files: { name: string; bytes: Buffer }[], label: string) {
  let req = request(t.app).post(`/api/reference-sets/${setId}/images`).set(engineer).field('label', label);
  if (label === 'defective') req = req.field('defectKind', 'spot');
  for (const f of files) req = req.attach('photos', f.bytes, { filename: f.name, contentType: 'image/png' });
  const res = await req;
  expect(res.status).toBe(201);
}

beforeAll(async () => {
  t = await createTestApp();
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  await t.db.dataSource.query(`insert into defect_kinds (code, name) values ('spot', 'Bright spot')`);
  await t.createUser('ines', ['engineer']);
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  setId = (await request(t.app).post('/api/reference-sets').set(engineer).send({ name: 'Plates', partType: 'plate' })).body.id;
  // 6 good (one with a 4×4 speck that is still within limits), 4 defective (one too small to fail: an escape),
  // 2 retakes (too dark), 1 good photo that is too dark (a retake on a usable part).
  await upload(await Promise.all([0, 1, 2, 3, 4].map(async (i) => ({ name: `good-${i}.png`, bytes: await photo(i, 0) }))), 'good');
  await upload([{ name: 'good-speck.png', bytes: await photo(5, 4) }], 'good');
  await upload(await Promise.all([6, 7, 8].map(async (i) => ({ name: `bad-${i}.png`, bytes: await photo(i, 8) }))), 'defective');
  await upload([{ name: 'bad-small.png', bytes: await photo(9, 3) }], 'defective');
  await upload(await Promise.all([10, 11].map(async (i) => ({ name: `dark-${i}.png`, bytes: await photo(i, 0, 20) }))), 'retake');
  await upload([{ name: 'good-dark.png', bytes: await photo(12, 0, 20) }], 'good');
  const rule = await request(t.app).post('/api/rules').set(engineer).send({ name: 'Plate spots', partType: 'plate', document: RULE });
  versionId = rule.body.versions[0].id;
});
afterAll(() => t.close());

test('a trial judges every photo and reports the confusion table, rates with intervals and kappa', async () => {
  const res = await request(t.app).post('/api/trials').set(engineer).send({ ruleVersionId: versionId, referenceSetId: setId });
  expect(res.status).toBe(202);
  const trial = trialSchema.parse((await request(t.app).get(`/api/trials/${res.body.id}`).set(engineer)).body);
  expect(trial).toMatchObject({ state: 'done', total: 13, processed: 13 });
  const s = trial.summary!;
  expect(s.table).toEqual({
    good: { PASS: 6, FAIL: 0, RETAKE: 1 },
    defective: { PASS: 1, FAIL: 3, RETAKE: 0 },
    retake: { PASS: 0, FAIL: 0, RETAKE: 2 },
  });
  expect(s.falseRejectRate).toMatchObject({ count: 0, of: 6, rate: 0 });
  expect(s.escapeRate).toMatchObject({ count: 1, of: 4, rate: 0.25 });
  expect(s.escapeRate.low!).toBeLessThan(0.25);
  expect(s.agreement).toMatchObject({ count: 11, of: 13 });
  // Cohen's kappa of this 3×3 table, by hand: p_o = 11/13, p_e = (7·7 + 4·3 + 2·3)/169 = 67/169.
  expect(s.kappa!).toBeCloseTo((11 / 13 - 67 / 169) / (1 - 67 / 169), 10);
});

test('misjudged photos are listed with their measurements; the slowest can be sorted first', async () => {
  const [trial] = (await request(t.app).get(`/api/rule-versions/${versionId}/trials`).set(engineer)).body.items;
  const misjudged = (await request(t.app).get(`/api/trials/${trial.id}/results?outcome=misjudged`).set(engineer)).body;
  expect(misjudged.items.map((r: { fileName: string }) => r.fileName).sort()).toEqual(['bad-small.png', 'good-dark.png']);
  const small = misjudged.items.find((r: { fileName: string }) => r.fileName === 'bad-small.png');
  expect(small.measurements[0]).toMatchObject({ name: 'Spot area', value: 9, pass: true });
  const slowest = (await request(t.app).get(`/api/trials/${trial.id}/results?sort=slowest&limit=3`).set(engineer)).body.items;
  expect(slowest[0].durationMs).toBeGreaterThanOrEqual(slowest[2].durationMs);
});

test('sweeping the limit trades the 9 px² escape against the good part with a 16 px² speck', async () => {
  const [trial] = (await request(t.app).get(`/api/rule-versions/${versionId}/trials`).set(engineer)).body.items;
  const sweep = sweepSchema.parse((await request(t.app).get(`/api/trials/${trial.id}/sweep?gauge=Spot%20area`).set(engineer)).body);
  expect(sweep.current).toBe(20);
  const at = (limit: number) => sweep.points.find((p) => p.limit === limit)!;
  expect(at(0)).toMatchObject({ escapes: 0, falseRejects: 1 });
  expect(at(9)).toMatchObject({ escapes: 1, falseRejects: 1 });
  expect(at(16)).toMatchObject({ escapes: 1, falseRejects: 0, escapeRate: 0.25 });
  expect(at(64)).toMatchObject({ escapes: 4, falseRejects: 0 });
  // The first point lies below every value: every judged good part is rejected.
  expect(sweep.points[0]).toMatchObject({ escapes: 0, falseRejects: 6 });
  const unknown = await request(t.app).get(`/api/trials/${trial.id}/sweep?gauge=Nope`).set(engineer);
  expect(unknown.status).toBe(400);
});

test('a rule in mm needs a calibrated station', async () => {
  const mm = { ...RULE, gauges: [{ ...RULE.gauges[0], unit: 'mm2', limits: { max: 0.05 } }] };
  const rule = await request(t.app).post('/api/rules').set(engineer).send({ name: 'Plate spots mm', partType: 'plate', document: mm });
  const res = await request(t.app).post('/api/trials').set(engineer).send({ ruleVersionId: rule.body.versions[0].id, referenceSetId: setId });
  const trial = (await request(t.app).get(`/api/trials/${res.body.id}`).set(engineer)).body;
  expect(trial.state).toBe('failed');
  expect(trial.error).toMatch(/calibration|mm/i);
});

test('a trial queued in PostgreSQL survives the process that queued it and is run by the next one', async () => {
  const queued = await createTestApp({}, { queue: true });
  try {
    await queued.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
    await queued.createUser('ines', ['engineer']);
    const auth = { Authorization: `Bearer ${await queued.tokenFor('ines')}` };
    const set = (await request(queued.app).post('/api/reference-sets').set(auth).send({ name: 'Plates', partType: 'plate' })).body.id;
    await request(queued.app).post(`/api/reference-sets/${set}/images`).set(auth).field('label', 'good').attach('photos', await photo(1, 0), { filename: 'a.png', contentType: 'image/png' });
    const version = (await request(queued.app).post('/api/rules').set(auth).send({ name: 'Plate spots', partType: 'plate', document: RULE })).body.versions[0].id;

    // A second process's queue: it sends the job but has no worker, then goes away.
    const sender = await new JobQueue(queued.db.url).start();
    const trialsOfSender = { ...queued.services, trials: Object.create(queued.services.trials) };
    Object.assign(trialsOfSender.trials, { jobs: sender });
    const started = await trialsOfSender.trials.start((await queued.db.dataSource.query(`select * from users where username='ines'`))[0], { ruleVersionId: version, referenceSetId: set });
    expect(started.state).toBe('queued');
    await sender.stop();

    // The app's own worker (started with the queue) picks the job up from PostgreSQL.
    let trial = started;
    for (let i = 0; i < 100 && trial.state !== 'done'; i++) {
      await new Promise((r) => setTimeout(r, 200));
      trial = (await request(queued.app).get(`/api/trials/${started.id}`).set(auth)).body;
    }
    expect(trial).toMatchObject({ state: 'done', processed: 1 });
  } finally {
    await queued.close();
  }
});

test('operators cannot start or read trials', async () => {
  await t.createUser('tomas', ['operator']);
  const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  expect((await request(t.app).post('/api/trials').set(operator).send({ ruleVersionId: versionId, referenceSetId: setId })).status).toBe(403);
});
