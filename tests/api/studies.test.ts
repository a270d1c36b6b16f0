// Agreement studies (issue 7): repeatability of one part photographed N times, and attribute agreement of
// the rule's verdicts with a qualified person's judgement (AIAG MSA, REFERENCES.md §9).
import crypto from 'node:crypto';
import request from 'supertest';
import { attributeAgreementSchema, repeatabilityStudyListSchema, repeatabilityStudySchema } from '../../shared/api/studies';
import type { UserEntity } from '../../server/components/auth/entities';
import { demoScale } from '../../server/seed/demo-plant';
import { DEMO_RULES } from '../../server/seed/rules';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';
import { runInNode } from '../support/in-node';

jest.setTimeout(180_000);

let t: TestApp;
let engineer: { Authorization: string };
let auditor: { Authorization: string };
let ruleId: string;
let versionId: string;
let stationId: string;
let otherRuleId: string;

const PHOTOS = 6;
const SEED = 77;

/** The same good washer photographed again and again, rendered in a plain Node process (see in-node.ts). */
async function photosOfOnePart(count: number): Promise<Buffer[]> {
  const photos = await runInNode<string[]>('tests/support/repeat-photos.ts', 'photosOfOnePart', ['washer', SEED, count]);
  return photos.map((p) => Buffer.from(p, 'base64'));
}

async function releasedRule(name: string, document: unknown, ines: UserEntity, mara: UserEntity): Promise<{ ruleId: string; versionId: string }> {
  const rule = await t.services.rules.create(ines, { name, partType: 'washer', smallestDefectMm: null, document });
  const version = rule.versions[0];
  const [set] = await t.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ($1, 'washer', $2) returning id`, [`set ${name}`, ines.id]);
  await t.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [version.id, set.id, version.contentHash, ines.id]);
  await t.services.rules.submit(ines, version.id, '');
  await t.services.rules.release(mara, version.id, { password: TEST_PASSWORD, meaning: 'approval', note: '' });
  return { ruleId: rule.id, versionId: version.id };
}

beforeAll(async () => {
  t = await createTestApp();
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('washer', 'Washer', 'washer')`);
  const ines = await t.createUser('ines', ['engineer']);
  const mara = await t.createUser('mara', ['supervisor']);
  await t.createUser('kofi', ['auditor']);
  await t.createUser('tomas', ['operator']);
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  const line = await t.services.stations.createLine(mara, { name: 'Line 2' });
  stationId = (await t.services.stations.createStation(mara, { lineId: line.id, name: 'Lathe 7 exit', cameraNote: '' })).id;
  await t.services.stations.calibrate(mara, stationId, { referenceLengthMm: 20, distancePx: 20 / demoScale('washer') });
  ({ ruleId, versionId } = await releasedRule('Washer rim and bore', DEMO_RULES.washer.released, ines, mara));
  ({ ruleId: otherRuleId } = await releasedRule('Washer other', { ...DEMO_RULES.washer.released, name: 'Other' }, ines, mara));
});
afterAll(() => t.close());

describe('repeatability', () => {
  let study: ReturnType<typeof repeatabilityStudySchema.parse>;
  let photos: Buffer[];

  test('photos of one part give each verdict and the spread of every gauge', async () => {
    photos = await photosOfOnePart(PHOTOS);
    let post = request(t.app)
      .post('/api/studies/repeatability')
      .set(engineer)
      .field('ruleVersionId', versionId)
      .field('stationId', stationId)
      .field('partLabel', 'Washer tag W-0417')
      .field('knownLabel', 'good');
    for (const [i, photo] of photos.entries()) post = post.attach('photos', photo, { filename: `w-${i + 1}.png`, contentType: 'image/png' });
    const res = await post;
    expect(res.status).toBe(201);
    study = repeatabilityStudySchema.parse(res.body);
    expect(study).toMatchObject({ ruleName: 'Washer rim and bore', ruleVersionNumber: 1, stationName: 'Lathe 7 exit', partLabel: 'Washer tag W-0417', knownLabel: 'good', createdBy: 'Test ines', photos: PHOTOS });
    expect(study.results.map((r) => r.position)).toEqual([1, 2, 3, 4, 5, 6]);
    const verdicts = { PASS: 0, FAIL: 0, RETAKE: 0 };
    for (const r of study.results) verdicts[r.verdict] += 1;
    expect(study.verdicts).toEqual(verdicts);
    expect(study.consistent).toBe(verdicts.PASS === 0 || verdicts.FAIL === 0);
    expect(study.gauges.map((g) => g.gauge)).toEqual(['Washer area', 'Notch response', 'Lump response']);
  });

  test('mean, sample standard deviation and range equal a hand computation from the stored readings', async () => {
    const stored: { position: number; verdict: string; measurements: { name: string; value: number }[] }[] = await t.db.dataSource.query(
      'select position, verdict, measurements from repeatability_photos where study_id = $1 order by position',
      [study.id],
    );
    expect(stored.map((s) => [s.position, s.verdict])).toEqual(study.results.map((r) => [r.position, r.verdict]));
    const judged = stored.filter((s) => s.verdict !== 'RETAKE');
    for (const gauge of study.gauges) {
      const x = judged.map((s) => s.measurements.find((m) => m.name === gauge.gauge)!.value);
      // Textbook formulas: x̄ = Σx/n; s = sqrt(Σ(x − x̄)²/(n − 1)); R = max − min; 6s/(USL − LSL) (AIAG MSA 4th ed., from memory).
      const n = x.length;
      let sum = 0;
      for (const v of x) sum += v;
      const mean = sum / n;
      let squares = 0;
      for (const v of x) squares += (v - mean) * (v - mean);
      const s = Math.sqrt(squares / (n - 1));
      expect(gauge.n).toBe(n);
      expect(gauge.mean).toBeCloseTo(mean, 9);
      expect(gauge.standardDeviation).toBeCloseTo(s, 9);
      expect(gauge.range).toBeCloseTo(Math.max(...x) - Math.min(...x), 9);
      expect(gauge.standardDeviation).toBeGreaterThan(0); // the photos do differ
    }
    const area = study.gauges[0];
    expect(area).toMatchObject({ unit: 'mm2', limitMin: 479.1, limitMax: 480.2 });
    expect(area.shareOfTolerance).toBeCloseTo((6 * area.standardDeviation) / (480.2 - 479.1), 9);
    expect(study.gauges[1]).toMatchObject({ limitMin: null, shareOfTolerance: null });
  });

  test('the photos are kept by content and the study is append-only, with its audit event', async () => {
    const stored: { image_hash: string }[] = await t.db.dataSource.query('select image_hash from repeatability_photos where study_id = $1 order by position', [study.id]);
    expect(stored.map((s) => s.image_hash)).toEqual(photos.map((p) => crypto.createHash('sha256').update(p).digest('hex')));
    expect((await t.services.store.get(stored[0].image_hash)).equals(photos[0])).toBe(true);
    await expect(t.db.dataSource.query(`update repeatability_photos set verdict = 'PASS' where study_id = $1`, [study.id])).rejects.toThrow(/append-only/);
    await expect(t.db.dataSource.query('delete from repeatability_studies where id = $1', [study.id])).rejects.toThrow(/append-only/);
    const [event] = await t.db.dataSource.query(`select actor_name, details from audit_events where action = 'study.repeatability.create'`);
    expect(event).toMatchObject({ actor_name: 'ines', details: { part: 'Washer tag W-0417', photos: PHOTOS } });
  });

  test('studies are listed newest first and read one by one; auditors may read', async () => {
    const list = repeatabilityStudyListSchema.parse((await request(t.app).get('/api/studies/repeatability').set(auditor)).body);
    expect(list.items.map((s) => s.id)).toEqual([study.id]);
    const one = await request(t.app).get(`/api/studies/repeatability/${study.id}`).set(auditor);
    expect(one.body).toEqual(study);
    expect((await request(t.app).get(`/api/studies/repeatability/${crypto.randomUUID()}`).set(auditor)).status).toBe(404);
  });

  test('a study needs 2 to 50 photos that can be read; nothing is kept otherwise', async () => {
    const [{ before }] = await t.db.dataSource.query('select count(*)::int as before from repeatability_studies');
    const send = (files: Buffer[]) => {
      let post = request(t.app).post('/api/studies/repeatability').set(engineer).field('ruleVersionId', versionId).field('stationId', stationId).field('partLabel', 'W-1');
      for (const [i, f] of files.entries()) post = post.attach('photos', f, { filename: `p${i}.png`, contentType: 'image/png' });
      return post;
    };
    const one = await send(photos.slice(0, 1));
    expect(one.status).toBe(400);
    expect(one.body.error.details.issues[0].path).toBe('photos');
    const tooMany = await send(Array.from({ length: 51 }, () => photos[0]));
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.details.issues[0].path).toBe('photos');
    const notAnImage = await send([photos[0], Buffer.from('not a photo at all')]);
    expect(notAnImage.status).toBe(415);
    expect(notAnImage.body.error.details.issues[0].path).toBe('photos[1]');
    const noPart = await request(t.app).post('/api/studies/repeatability').set(engineer).field('ruleVersionId', versionId).field('stationId', stationId).attach('photos', photos[0], 'a.png').attach('photos', photos[1], 'b.png');
    expect(noPart.status).toBe(400);
    expect(noPart.body.error.details.issues[0].path).toBe('partLabel');
    const [{ after }] = await t.db.dataSource.query('select count(*)::int as after from repeatability_studies');
    expect(after).toBe(before);
  });

  test('auditors and operators cannot run a study', async () => {
    for (const who of [auditor, { Authorization: `Bearer ${await t.tokenFor('tomas')}` }]) {
      const res = await request(t.app).post('/api/studies/repeatability').set(who).field('partLabel', 'x');
      expect(res.status).toBe(403);
    }
    expect((await request(t.app).get('/api/studies/repeatability').set({ Authorization: `Bearer ${await t.tokenFor('tomas')}` })).status).toBe(403);
    expect((await request(t.app).get('/api/studies/repeatability')).status).toBe(401);
  });
});

describe('attribute agreement', () => {
  /** Inspections of a rule with resolved disputes: `pairs` of [verdict, judgement, how many]. */
  async function disputed(rule: string, pairs: [string, string | null, number][], at = '2026-06-15T10:00:00Z'): Promise<void> {
    const rows = pairs.flatMap(([verdict, judgement, n]) => Array.from({ length: n }, () => ({ verdict, judgement })));
    await t.db.dataSource.query(
      `with r as (select * from unnest($2::text[], $3::text[]) as r(verdict, judgement)),
            i as (insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, quality, duration_ms, created_at)
                  select 'agr-' || gen_random_uuid(), v.id, v.rule_id, s.id, s.line_id, 'washer', u.id, repeat('b', 64), r.verdict, '{}', 5, $4
                  from r, rule_versions v, stations s, users u where v.rule_id = $1 and s.id = $5 and u.username = 'tomas'
                  returning id, verdict)
       insert into disputes (inspection_id, raised_by, note, judgement, resolved_at, resolved_by)
       select i.id, u.id, 'Operator disagrees', j.judgement, case when j.judgement is null then null else now() end, case when j.judgement is null then null else u.id end
       from (select id, verdict, row_number() over (partition by verdict order by id) as k from i) i
       join (select verdict, judgement, row_number() over (partition by verdict order by judgement nulls last) as k from r) j on j.verdict = i.verdict and j.k = i.k
       join users u on u.username = 'mara'`,
      [rule, rows.map((r) => r.verdict), rows.map((r) => r.judgement), at, stationId],
    );
  }

  beforeAll(async () => {
    // The AIAG-style cross-tab of REFERENCES.md §9: [[44, 6], [3, 97]] (defective failed 44, defective passed 6,
    // good failed 3, good passed 97), plus two unusable photos, two disputes nobody has judged yet, and
    // disputes of another rule and of another month that the query must leave out.
    await disputed(ruleId, [
      ['FAIL', 'defective', 44],
      ['PASS', 'defective', 6],
      ['FAIL', 'good', 3],
      ['PASS', 'good', 97],
      ['RETAKE', 'good', 2],
      ['PASS', null, 2],
    ]);
    await disputed(otherRuleId, [['PASS', 'defective', 9]]);
    await disputed(ruleId, [['PASS', 'defective', 5]], '2026-08-01T10:00:00Z');
  });

  test('resolved disputes reproduce the AIAG worked numbers: kappa 0.8629, effectiveness 94 %', async () => {
    const res = await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'disputes', ruleId, from: '2026-06-01T00:00:00Z', to: '2026-07-01T00:00:00Z' }).set(auditor);
    expect(res.status).toBe(200);
    const agreement = attributeAgreementSchema.parse(res.body);
    expect(agreement.counts).toEqual({ defectiveFailed: 44, defectivePassed: 6, goodFailed: 3, goodPassed: 97, retakes: 2 });
    // REFERENCES.md §9: p_o = 0.94, p_e = 0.56222, κ = 0.8629 (AIAG reports 0.86; table from memory, κ recomputed).
    expect(agreement.kappa.value).toBeCloseTo(0.8629, 4);
    expect(agreement.kappa.acceptance).toBe('acceptable'); // ≥ 0.75 (AIAG, as quoted in Minitab's help)
    // AIAG bands (REFERENCES.md §9): effectiveness 141/150 = 94 % ≥ 90 % acceptable; miss rate 6/50 = 12 % > 5 %
    // unacceptable; false-alarm rate 3/100 = 3 % ≤ 5 % acceptable.
    expect(agreement.effectiveness).toEqual({ value: expect.closeTo(0.94, 12), acceptance: 'acceptable' });
    expect(agreement.missRate).toEqual({ value: expect.closeTo(0.12, 12), acceptance: 'unacceptable' });
    expect(agreement.falseAlarmRate).toEqual({ value: expect.closeTo(0.03, 12), acceptance: 'acceptable' });
  });

  test('without a date range every resolved dispute of the rule counts', async () => {
    const agreement = attributeAgreementSchema.parse((await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'disputes', ruleId }).set(auditor)).body);
    expect(agreement.counts.defectivePassed).toBe(6 + 5);
  });

  test("a finished trial's verdicts against the set's labels: the 2×2 worked example gives kappa 0.40", async () => {
    const [ines] = await t.db.dataSource.query(`select id from users where username = 'ines'`);
    const [set] = await t.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ('agreement set', 'washer', $1) returning id`, [ines.id]);
    // REFERENCES.md §9 (howcodex worked example): [[20, 5], [10, 15]] gives p_o = 0.70, p_e = 0.50, κ = 0.40.
    const rows: [string, string, number][] = [
      ['defective', 'FAIL', 20],
      ['defective', 'PASS', 5],
      ['good', 'FAIL', 10],
      ['good', 'PASS', 15],
      ['good', 'RETAKE', 3],
      ['retake', 'RETAKE', 2],
      ['unlabelled', 'PASS', 4],
    ];
    const flat = rows.flatMap(([label, verdict, n]) => Array.from({ length: n }, () => ({ label, verdict })));
    const [trial] = await t.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) select id, $2, content_hash, 'done', $3 from rule_versions where id = $1 returning id`, [versionId, set.id, ines.id]);
    await t.db.dataSource.query(
      `with r as (select label, verdict, row_number() over () as k from unnest($2::text[], $3::text[]) as r(label, verdict)),
            img as (insert into reference_images (set_id, content_hash, file_name, media_type, width, height, bit_depth, label, part_type, uploaded_by)
                    select $1, lpad(to_hex(k::int), 64, '0'), 'p' || k || '.png', 'image/png', 64, 48, 8, label, 'washer', $4 from r returning id, file_name)
       insert into trial_results (trial_id, image_id, verdict, label, agrees, measurements, quality, duration_ms)
       select $5, img.id, r.verdict, r.label, null, '[]', '{}', 1 from img join r on img.file_name = 'p' || r.k || '.png'`,
      [set.id, flat.map((f) => f.label), flat.map((f) => f.verdict), ines.id, trial.id],
    );
    const agreement = attributeAgreementSchema.parse((await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'trial', trialId: trial.id }).set(engineer)).body);
    expect(agreement.counts).toEqual({ defectiveFailed: 20, defectivePassed: 5, goodFailed: 10, goodPassed: 15, retakes: 3 });
    expect(agreement.kappa.value).toBeCloseTo(0.4, 12);
    expect(agreement.kappa.acceptance).toBe('marginal'); // between 0.40 and 0.75
    expect(agreement.effectiveness).toEqual({ value: expect.closeTo(0.7, 12), acceptance: 'unacceptable' });
    expect(agreement.falseAlarmRate).toEqual({ value: expect.closeTo(0.4, 12), acceptance: 'unacceptable' });
  });

  test('a trial that has not finished, or does not exist, has no agreement yet', async () => {
    const [ines] = await t.db.dataSource.query(`select id from users where username = 'ines'`);
    const [set] = await t.db.dataSource.query(`select id from reference_sets limit 1`);
    const [running] = await t.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) select id, $2, content_hash, 'running', $3 from rule_versions where id = $1 returning id`, [versionId, set.id, ines.id]);
    expect((await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'trial', trialId: running.id }).set(engineer)).status).toBe(409);
    expect((await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'trial', trialId: crypto.randomUUID() }).set(engineer)).status).toBe(404);
    expect((await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'disputes', ruleId: crypto.randomUUID() }).set(engineer)).status).toBe(404);
  });

  test('no judged pairs give no figures rather than made-up ones', async () => {
    const agreement = attributeAgreementSchema.parse(
      (await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'disputes', ruleId, from: '2020-01-01T00:00:00Z', to: '2020-02-01T00:00:00Z' }).set(engineer)).body,
    );
    expect(agreement).toMatchObject({ effectiveness: { value: null, acceptance: null }, kappa: { value: null, acceptance: null } });
  });

  test('the query names its source; operators may not ask', async () => {
    const res = await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'guess', ruleId }).set(engineer);
    expect(res.status).toBe(400);
    expect((await request(t.app).get('/api/studies/attribute-agreement').query({ source: 'disputes', ruleId }).set({ Authorization: `Bearer ${await t.tokenFor('tomas')}` })).status).toBe(403);
  });
});
