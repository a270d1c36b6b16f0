import sharp from 'sharp';
import request from 'supertest';
import { inspectionSchema } from '../../shared/api/inspections';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

jest.setTimeout(60_000);

let t: TestApp;
let operator: { Authorization: string };
let stationId: string;
let releasedId: string;
let draftId: string;

const photo = spotPhoto;
const RULE = { ...SPOT_RULE, gauges: [{ ...SPOT_RULE.gauges[0], unit: 'mm2', limits: { max: 0.02 } }] };

beforeAll(async () => {
  t = await createTestApp();
  const q = (sql: string, p: unknown[] = []) => t.db.dataSource.query(sql, p);
  await q(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  const engineer = await t.createUser('ines', ['engineer']);
  const supervisor = await t.createUser('mara', ['supervisor']);
  await t.createUser('tomas', ['operator']);
  await t.createUser('kofi', ['auditor']);
  operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  const { rules, stations } = t.services;
  const line = await stations.createLine(supervisor, { name: 'Line 1' });
  const station = await stations.createStation(supervisor, { lineId: line.id, name: 'Press 1', cameraNote: '' });
  // 0.05 mm/px, for photos of the spot photos' 64×48 px.
  stationId = (await stations.calibrate(supervisor, station.id, { referenceLengthMm: 10, distancePx: 200, photoWidthPx: 64, photoHeightPx: 48 })).id;
  const rule = await rules.create(engineer, { name: 'Plate spots', partType: 'plate', smallestDefectMm: null, document: RULE });
  releasedId = rule.versions[0].id;
  const [v] = await q('select content_hash from rule_versions where id = $1', [releasedId]);
  const [set] = await q(`insert into reference_sets (name, part_type, created_by) values ('s', 'plate', $1) returning id`, [engineer.id]);
  await q(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [releasedId, set.id, v.content_hash, engineer.id]);
  await rules.submit(engineer, releasedId, '');
  await rules.release(supervisor, releasedId, { password: TEST_PASSWORD, meaning: 'approval', note: '' });
  const other = await rules.create(engineer, { name: 'Plate spots draft', partType: 'plate', smallestDefectMm: null, document: RULE });
  draftId = other.versions[0].id;
});
afterAll(() => t.close());

const inspect = (bytes: Buffer, key: string, versionId = releasedId, auth = operator) =>
  request(t.app).post('/api/inspections').set(auth).field('stationId', stationId).field('ruleVersionId', versionId).field('idempotencyKey', key).attach('photo', bytes, { filename: 'part.png', contentType: 'image/png' });

test('a good part passes, with its measurement in mm² through the station’s calibration', async () => {
  const res = await inspect(await photo(1, 2), 'key-good-0001');
  expect(res.status).toBe(201);
  const inspection = inspectionSchema.parse(res.body);
  // 2×2 px at 0.05 mm/px = 4 × 0.0025 mm² = 0.01 mm² (REFERENCES.md §8: area_mm² = s²·A_px).
  expect(inspection).toMatchObject({ verdict: 'PASS', cause: null, stationName: 'Press 1', ruleVersionNumber: 1, mmPerPx: 0.05, evidenceUrl: null });
  expect(inspection.measurements[0]).toMatchObject({ gauge: 'Spot area', unit: 'mm2', limitMax: 0.02, pass: true });
  expect(inspection.measurements[0].value).toBeCloseTo(0.01, 10);
});

test('the same idempotency key twice stores one inspection', async () => {
  const bytes = await photo(2, 0);
  const first = await inspect(bytes, 'key-retry-0001');
  const second = await inspect(bytes, 'key-retry-0001');
  expect(first.status).toBe(201);
  expect(second.status).toBe(200);
  expect(second.body.id).toBe(first.body.id);
  const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from inspections where idempotency_key = 'key-retry-0001'`);
  expect(n).toBe(1);
});

test('a defective part fails, names the failing gauge and keeps an evidence image', async () => {
  const res = await inspect(await photo(3, 6), 'key-bad-00001');
  expect(res.body).toMatchObject({ verdict: 'FAIL', cause: 'Spot area' });
  const evidence = await request(t.app).get(res.body.evidenceUrl);
  expect(evidence.status).toBe(200);
  expect(evidence.headers['content-type']).toBe('image/png');
});

test('a dark photo is a RETAKE, never a PASS', async () => {
  const res = await inspect(await photo(4, 0, 20), 'key-dark-0001');
  expect(res.body).toMatchObject({ verdict: 'RETAKE', cause: 'too dark' });
});

// The product's own rule (DESIGN.md, "Image quality gate": size), after common practice: a pixel scale
// holds only for photos of the size it was measured in, so the mm figures of another size mean nothing.
test('a photo of another size than the station’s calibration is a RETAKE with the reason, nothing measured; the calibrated size is judged as usual', async () => {
  const small = await sharp(Buffer.alloc(32 * 32, 250), { raw: { width: 32, height: 32, channels: 1 } }).png().toBuffer();
  const res = await inspect(small, 'key-size-00001');
  expect(res.status).toBe(201);
  const inspection = inspectionSchema.parse(res.body);
  expect(inspection).toMatchObject({ verdict: 'RETAKE', cause: 'wrong size', measurements: [], evidenceUrl: null });
  expect(inspection.quality).toMatchObject({
    pass: false,
    problems: ['wrong size: the photo is 32×32 px; this station’s calibration holds for photos of 64×48 px'],
    widthPx: 32,
    heightPx: 32,
  });
  const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from measurements where inspection_id = $1`, [inspection.id]);
  expect(n).toBe(0);
  // The trends count it as a retake, not as a judged part.
  const [hours] = await t.db.dataSource.query(`select sum(judged)::int as judged, sum(failed)::int as failed, sum(retakes)::int as retakes from inspection_hours where hour = date_trunc('hour', $1::timestamptz)`, [inspection.createdAt]);
  const [rows] = await t.db.dataSource.query(
    `select count(*) filter (where verdict <> 'RETAKE')::int as judged, count(*) filter (where verdict = 'FAIL')::int as failed, count(*) filter (where verdict = 'RETAKE')::int as retakes
       from inspections where created_at >= date_trunc('hour', $1::timestamptz) and created_at < date_trunc('hour', $1::timestamptz) + interval '1 hour'`,
    [inspection.createdAt],
  );
  expect(hours).toEqual(rows);
  expect(rows.retakes).toBeGreaterThanOrEqual(1);

  // The same defective part at the calibrated 64×48 px: judged and failed as usual.
  expect((await inspect(await photo(9, 6), 'key-size-00002')).body).toMatchObject({ verdict: 'FAIL', cause: 'Spot area' });
});

test('only released versions inspect; bad photos are refused clearly and leave no record', async () => {
  const draft = await inspect(await photo(5, 0), 'key-draft-001', draftId);
  expect(draft.status).toBe(409);
  const notImage = await inspect(Buffer.from('%PDF-1.4 not a photo'), 'key-pdf-00001');
  expect(notImage.status).toBe(415);
  expect(notImage.body.error.message).toMatch(/cannot be inspected/);
  const noKey = await request(t.app).post('/api/inspections').set(operator).field('stationId', stationId).field('ruleVersionId', releasedId).attach('photo', await photo(6, 0), 'p.png');
  expect(noKey.status).toBe(400);
  expect(noKey.body.error.details.issues[0].path).toBe('idempotencyKey');
  const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from inspections where idempotency_key in ('key-draft-001', 'key-pdf-00001')`);
  expect(n).toBe(0);
});

test('an operator disputes a verdict once; supervisors and auditors can read it; engineers cannot inspect', async () => {
  const res = await inspect(await photo(7, 6), 'key-dispute-1');
  const disputed = await request(t.app).post(`/api/inspections/${res.body.id}/dispute`).set(operator).send({ note: 'The mark wipes off; it is dust' });
  expect(disputed.status).toBe(201);
  expect(disputed.body.dispute).toMatchObject({ note: 'The mark wipes off; it is dust', resolvedAt: null });
  expect((await request(t.app).post(`/api/inspections/${res.body.id}/dispute`).set(operator).send({ note: 'again' })).status).toBe(409);
  const auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  expect((await request(t.app).get(`/api/inspections/${res.body.id}`).set(auditor)).status).toBe(200);
  const engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  expect((await inspect(await photo(8, 0), 'key-engineer1', releasedId, engineer)).status).toBe(403);
});

test('every inspection is in the audit trail with the exact rule content it used', async () => {
  const rows = await t.db.dataSource.query(`select count(*)::int as n from audit_events where action = 'inspection.create'`);
  const inspections = await t.db.dataSource.query(`select count(*)::int as n from inspections`);
  expect(rows[0].n).toBe(inspections[0].n);
});
