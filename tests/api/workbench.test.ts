// Kernel library, the browser preview's inputs and the server's preview answer, and disputes.
import sharp from 'sharp';
import request from 'supertest';
import { previewResultSchema } from '../../shared/api/preview';
import { runRule } from '../../shared/vision/pipeline';
import { UserEntity } from '../../server/components/auth/entities';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';
import { STANDARD_STEPS } from '../support/standard-steps';

jest.setTimeout(60_000);

let t: TestApp;
let engineer: { Authorization: string };
let imageId: string;
let imageUrl: string;

const RULE = {
  format: 'kernwright-rule/1',
  name: 'Edges',
  steps: STANDARD_STEPS,
  gauges: [
    { name: 'Edge share', measure: 'edge-fraction', limits: { max: 0.5 } },
    { name: 'Largest blob', measure: 'largest-blob-area', unit: 'px2', limits: { max: 5000 } },
  ],
};

beforeAll(async () => {
  t = await createTestApp();
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  await t.createUser('ines', ['engineer']);
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  const set = (await request(t.app).post('/api/reference-sets').set(engineer).send({ name: 'Plates', partType: 'plate' })).body.id;
  // A 16-bit colour photo: the browser must not see it through an 8-bit decoder.
  const w = 97;
  const h = 61;
  const px = new Uint16Array(w * h * 3);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) for (let c = 0; c < 3; c++) px[(y * w + x) * 3 + c] = ((x - 48) ** 2 + (y - 30) ** 2 < 400 ? 52000 : 9000) + ((x * 31 + y * 17 + c * 5) % 700);
  const png = await sharp(Buffer.from(px.buffer), { raw: { width: w, height: h, channels: 3 } }).toColourspace('rgb16').png().toBuffer();
  const up = await request(t.app).post(`/api/reference-sets/${set}/images`).set(engineer).attach('photos', png, { filename: 'disc.png', contentType: 'image/png' });
  imageId = up.body.outcomes[0].image.id;
  imageUrl = up.body.outcomes[0].image.imageUrl;
});
afterAll(() => t.close());

test('the kernel library lists the built-in kernels with their sources, and engineers add their own', async () => {
  const list = (await request(t.app).get('/api/kernels').set(engineer)).body.items;
  const sobel = list.find((k: { name: string }) => k.name === 'sobel-x');
  expect(sobel).toMatchObject({ matrix: [[-1, 0, 1], [-2, 0, 2], [-1, 0, 1]], builtIn: true });
  expect(sobel.source.length).toBeGreaterThan(10);
  const add = await request(t.app).post('/api/kernels').set(engineer).send({ name: 'Rim-Emboss', matrix: [[-2, -1, 0], [-1, 1, 1], [0, 1, 2]], description: 'Raises the rim edge for burr checks' });
  expect(add.status).toBe(201);
  expect(add.body.name).toBe('rim-emboss');
  const even = await request(t.app).post('/api/kernels').set(engineer).send({ name: 'even', matrix: [[1, 1], [1, 1]], description: 'x' });
  expect(even.status).toBe(400);
  const zero = await request(t.app).post('/api/kernels').set(engineer).send({ name: 'zero', matrix: [[1]], divisor: 0, description: 'x' });
  expect(zero.body.error.details.issues[0].path).toBe('divisor');
  expect((await request(t.app).post('/api/kernels').set(engineer).send({ name: 'sobel-x', matrix: [[1]], description: 'x' })).status).toBe(409);
  // A rule may now name the engineer's kernel.
  const rule = await request(t.app).post('/api/rules').set(engineer).send({ name: 'Emboss', partType: 'plate', document: { ...RULE, steps: [{ op: 'kernel', kernel: 'rim-emboss' }], gauges: [] } });
  expect(rule.status).toBe(201);
});

test('the browser preview, fed the server’s samples, gives the same numbers as the server', async () => {
  const samplesUrl = imageUrl.replace('?', '/samples?');
  const raw = await request(t.app).get(samplesUrl).buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });
  expect(raw.headers['x-photo-bit-depth']).toBe('16');
  const photo = {
    width: Number(raw.headers['x-photo-width']),
    height: Number(raw.headers['x-photo-height']),
    channels: Number(raw.headers['x-photo-channels']) as 3,
    bitDepth: 16 as const,
    samples: new Uint16Array(new Uint8Array(raw.body as Buffer).buffer),
  };
  expect(photo).toMatchObject({ width: 97, height: 61, channels: 3 });
  const browser = runRule(RULE, photo, { kernels: await loadKernelLibrary() });

  const server = previewResultSchema.parse((await request(t.app).post('/api/preview').set(engineer).send({ document: RULE, referenceImageId: imageId })).body);
  expect(server.verdict).toBe(browser.verdict);
  expect(server.measurements.map((m) => m.value)).toEqual(browser.measurements.map((m) => m.value));
  expect(server.quality.focus).toBe(browser.quality.focus);
  expect(server.steps.map((s) => s.op)).toEqual(['gaussian', 'gradient', 'threshold', 'open']);
});

test('the server preview names the problem in an invalid draft', async () => {
  const res = await request(t.app).post('/api/preview').set(engineer).send({ document: { ...RULE, steps: [{ op: 'median', size: 4 }] }, referenceImageId: imageId });
  expect(res.status).toBe(400);
  expect(res.body.error.details.issues[0].path).toBe('document.steps[0].size');
});

test('a supervisor resolves a disputed verdict with a judgement; the inspection itself is unchanged', async () => {
  const supervisor = await t.createUser('mara', ['supervisor']);
  const operator = await t.createUser('tomas', ['operator']);
  const eng = await t.db.dataSource.getRepository(UserEntity).findOneByOrFail({ username: 'ines' });
  const { rules, stations, inspections } = t.services;
  const line = await stations.createLine(supervisor, { name: 'L' });
  const station = await stations.createStation(supervisor, { lineId: line.id, name: 'S', cameraNote: '' });
  const rule = await rules.create(eng, { name: 'Dispute me', partType: 'plate', smallestDefectMm: null, document: RULE });
  const v = rule.versions[0];
  const [set] = await t.db.dataSource.query(`select id from reference_sets limit 1`);
  await t.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [v.id, set.id, v.contentHash, v.author.id]);
  await rules.submit(eng, v.id, '');
  await rules.release(supervisor, v.id, { password: TEST_PASSWORD, meaning: 'approval', note: '' });
  const photo = await sharp(Buffer.alloc(40 * 30, 100), { raw: { width: 40, height: 30, channels: 1 } }).png().toBuffer();
  const { inspection } = await inspections.inspect(operator, { stationId: station.id, ruleVersionId: v.id, idempotencyKey: 'dispute-test-1' }, photo);
  await inspections.dispute(operator, inspection.id, 'Looks fine to me');

  const auth = { Authorization: `Bearer ${await t.tokenFor('mara')}` };
  const open = (await request(t.app).get('/api/disputes').set(auth)).body;
  expect(open.items).toHaveLength(1);
  const resolved = await request(t.app).post(`/api/disputes/${open.items[0].id}/resolve`).set(auth).send({ judgement: 'good', note: 'Checked under the loupe: no defect' });
  expect(resolved.status).toBe(200);
  expect(resolved.body).toMatchObject({ verdict: inspection.verdict, dispute: { judgement: 'good', resolutionNote: 'Checked under the loupe: no defect' } });
  expect((await request(t.app).get('/api/disputes').set(auth)).body.items).toHaveLength(0);
  expect((await request(t.app).post(`/api/disputes/${open.items[0].id}/resolve`).set(auth).send({ judgement: 'good', note: 'x' })).status).toBe(409);
  expect((await request(t.app).get('/api/disputes').set(engineer)).status).toBe(403);
});
