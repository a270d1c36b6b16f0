import crypto from 'node:crypto';
import sharp from 'sharp';
import request from 'supertest';
import { referenceImagePageSchema, referenceSetSchema, uploadResultSchema } from '../../shared/api/references';
import { createTestApp, type TestApp } from '../support/app';

let t: TestApp;
let engineer: { Authorization: string };
let auditor: { Authorization: string };
let setId: string;

/** A small grey PNG whose pixels depend on the seed, so each seed gives different bytes. */
async function photo(seed: number, width = 64, height = 48): Promise<Buffer> {
  const pixels = Buffer.alloc(width * height);
  for (let i = 0; i < pixels.length; i++) pixels[i] = (i * 7 + seed * 31) % 256;
  return sharp(pixels, { raw: { width, height, channels: 1 } }).png().toBuffer();
}

beforeAll(async () => {
  t = await createTestApp();
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('washer-m8', 'Washer M8', 'washer')`);
  await t.db.dataSource.query(`insert into defect_kinds (code, name) values ('burr', 'Burr'), ('scratch', 'Scratch')`);
  await t.createUser('ines', ['engineer']);
  await t.createUser('kofi', ['auditor']);
  await t.createUser('tomas', ['operator']);
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  const res = await request(t.app).post('/api/reference-sets').set(engineer).send({ name: 'Washer M8 rim', partType: 'washer-m8' });
  expect(res.status).toBe(201);
  setId = referenceSetSchema.parse(res.body).id;
});
afterAll(() => t.close());

const upload = (files: { name: string; bytes: Buffer }[], fields: Record<string, string> = {}) => {
  let req = request(t.app).post(`/api/reference-sets/${setId}/images`).set(engineer);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  for (const f of files) req = req.attach('photos', f.bytes, { filename: f.name, contentType: 'image/png' });
  return req;
};

test('photos are stored with their size and bit depth; the same photo again is reported as a duplicate', async () => {
  const bytes = await photo(1);
  const first = await upload([{ name: 'good-001.png', bytes }], { label: 'good' });
  expect(first.status).toBe(201);
  const [stored] = uploadResultSchema.parse(first.body).outcomes;
  expect(stored).toMatchObject({ status: 'stored', image: { width: 64, height: 48, bitDepth: 8, label: 'good', mediaType: 'image/png' } });
  if (stored.status !== 'stored') throw new Error('not stored');
  expect(stored.image.contentHash).toBe(crypto.createHash('sha256').update(bytes).digest('hex'));

  const again = await upload([{ name: 'copy.png', bytes }]);
  expect(again.status).toBe(200);
  expect(again.body.outcomes[0]).toEqual({ status: 'duplicate', fileName: 'copy.png', existingImageId: stored.image.id });
});

test('each file of a batch gets its own outcome; a file that is not an image is refused by its content, not its name', async () => {
  const res = await upload([
    { name: 'ok.png', bytes: await photo(2) },
    { name: 'fake.png', bytes: Buffer.from('<html>not a photo</html>') },
    { name: 'empty.png', bytes: Buffer.alloc(0) },
  ]);
  expect(res.status).toBe(201);
  const statuses = res.body.outcomes.map((o: { status: string; code?: string }) => `${o.status}:${o.code ?? ''}`);
  expect(statuses).toEqual(['stored:', 'refused:not_an_image', 'refused:empty_file']);
  const count = await t.db.dataSource.query('select count(*)::int as n from reference_images where set_id = $1', [setId]);
  expect(count[0].n).toBe(2);
});

test('a 16-bit PNG keeps its bit depth', async () => {
  const raw = new Uint16Array(32 * 32).map((_, i) => i * 50);
  const png16 = await sharp(Buffer.from(raw.buffer), { raw: { width: 32, height: 32, channels: 1 } }).toColourspace('grey16').png().toBuffer();
  const res = await upload([{ name: 'deep.png', bytes: png16 }]);
  expect(res.body.outcomes[0].image.bitDepth).toBe(16);
});

test('labels change one by one or in bulk; a defect kind only goes with "defective"', async () => {
  const page = referenceImagePageSchema.parse((await request(t.app).get(`/api/reference-sets/${setId}/images`).set(engineer)).body);
  const ids = page.items.map((i) => i.id);
  const bulk = await request(t.app).post(`/api/reference-sets/${setId}/labels`).set(engineer).send({ imageIds: ids.slice(0, 2), change: { label: 'defective', defectKind: 'burr' } });
  expect(bulk.status).toBe(200);
  expect(bulk.body.items.map((i: { defectKind: string }) => i.defectKind)).toEqual(['burr', 'burr']);
  const single = await request(t.app).patch(`/api/reference-sets/images/${ids[0]}`).set(engineer).send({ label: 'good' });
  expect(single.body).toMatchObject({ label: 'good', defectKind: null });
  const wrong = await request(t.app).patch(`/api/reference-sets/images/${ids[0]}`).set(engineer).send({ label: 'good', defectKind: 'burr' });
  expect(wrong.status).toBe(400);
  expect(wrong.body.error.details.issues[0].path).toBe('defectKind');
  const unknown = await request(t.app).patch(`/api/reference-sets/images/${ids[0]}`).set(engineer).send({ label: 'defective', defectKind: 'dent' });
  expect(unknown.status).toBe(400);
  const defective = referenceImagePageSchema.parse((await request(t.app).get(`/api/reference-sets/${setId}/images?label=defective`).set(engineer)).body);
  expect(defective.items.map((i) => i.id)).toEqual([ids[1]]);
  const set = referenceSetSchema.parse((await request(t.app).get(`/api/reference-sets/${setId}`).set(engineer)).body);
  expect(set.counts).toMatchObject({ total: 3, good: 1, defective: 1, unlabelled: 1 });
});

test('stored images load through their signed address only', async () => {
  const page = referenceImagePageSchema.parse((await request(t.app).get(`/api/reference-sets/${setId}/images`).set(auditor)).body);
  const image = await request(t.app).get(page.items[0].imageUrl);
  expect(image.status).toBe(200);
  expect(image.headers['content-type']).toBe('image/png');
  const thumb = await request(t.app).get(page.items[0].thumbnailUrl!);
  expect(thumb.headers['content-type']).toBe('image/jpeg');
  const tampered = page.items[0].imageUrl.replace(/sig=[^&]+/, 'sig=AAAA');
  expect((await request(t.app).get(tampered)).status).toBe(403);
  const otherHash = page.items[0].imageUrl.replace(page.items[0].contentHash, page.items[1].contentHash);
  expect((await request(t.app).get(otherHash)).status).toBe(403);
});

test('auditors may look but not change; operators may not open reference sets', async () => {
  const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  expect((await request(t.app).get('/api/reference-sets').set(auditor)).status).toBe(200);
  expect((await request(t.app).post('/api/reference-sets').set(auditor).send({ name: 'x', partType: 'washer-m8' })).status).toBe(403);
  expect((await request(t.app).post(`/api/reference-sets/${setId}/images`).set(auditor)).status).toBe(403);
  expect((await request(t.app).get('/api/reference-sets').set(operator)).status).toBe(403);
  expect((await request(t.app).get('/api/reference-sets')).status).toBe(401);
});

test('a set needs a known part type and a unique name', async () => {
  const unknown = await request(t.app).post('/api/reference-sets').set(engineer).send({ name: 'Other', partType: 'sprocket' });
  expect(unknown.status).toBe(400);
  const taken = await request(t.app).post('/api/reference-sets').set(engineer).send({ name: 'Washer M8 rim', partType: 'washer-m8' });
  expect(taken.status).toBe(409);
});

test('every upload and label change is in the audit trail', async () => {
  const actions = await t.db.dataSource.query(`select action, count(*)::int as n from audit_events where action like 'reference-%' group by action order by action`);
  expect(actions).toEqual([
    { action: 'reference-image.add', n: 3 },
    { action: 'reference-image.label', n: 3 },
    { action: 'reference-set.create', n: 1 },
  ]);
});
