// npm run backup / npm run restore: a backup restored into a fresh database and image store gives
// back every row and every image, byte for byte, with the same audit hash chain and triggers.
import { execFile } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { Client } from 'pg';
import sharp from 'sharp';
import request from 'supertest';
import { createTestApp, type TestApp } from '../support/app';

const run = promisify(execFile);
let t: TestApp;
let work: string;
let restoredDb: string;

async function photo(seed: number): Promise<Buffer> {
  const pixels = Buffer.alloc(64 * 48);
  for (let i = 0; i < pixels.length; i++) pixels[i] = (i * 5 + seed * 37) % 256;
  return sharp(pixels, { raw: { width: 64, height: 48, channels: 1 } }).png().toBuffer();
}

function scriptEnv(imageDir: string): NodeJS.ProcessEnv {
  const url = new URL(t.db.url);
  return { ...process.env, KW_PG_PORT: url.port, KW_DB_NAME: url.pathname.slice(1), KW_DATA_DIR: work, KW_IMAGE_DIR: imageDir };
}

async function query<T>(db: string, sql: string): Promise<T[]> {
  const url = new URL(t.db.url);
  const client = new Client({ connectionString: `postgres://postgres@127.0.0.1:${url.port}/${db}` });
  await client.connect();
  try {
    return (await client.query(sql)).rows as T[];
  } finally {
    await client.end();
  }
}

beforeAll(async () => {
  work = await fs.mkdtemp(path.join(os.tmpdir(), 'kw-backup-'));
  t = await createTestApp({ imageDir: path.join(work, 'images') });
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('washer-m8', 'Washer M8', 'washer')`);
  await t.createUser('ines', ['engineer']);
  const engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  const set = await request(t.app).post('/api/reference-sets').set(engineer).send({ name: 'Washer M8 rim', partType: 'washer-m8' });
  let upload = request(t.app).post(`/api/reference-sets/${set.body.id}/images`).set(engineer);
  for (const seed of [1, 2, 3]) upload = upload.attach('photos', await photo(seed), { filename: `p${seed}.png`, contentType: 'image/png' });
  expect((await upload).status).toBe(201);
  restoredDb = `kw_restored_${crypto.randomBytes(4).toString('hex')}`;
});

afterAll(async () => {
  await query('postgres', `drop database if exists "${restoredDb}" with (force)`).catch(() => undefined);
  await t.close();
  await fs.rm(work, { recursive: true, force: true });
});

test('a backup restores into a fresh database and image store with the same rows, images and audit hash chain', async () => {
  const backupDir = path.join(work, 'backup');
  await run('bash', ['scripts/backup.sh', backupDir], { env: scriptEnv(path.join(work, 'images')) });
  const manifest = await fs.readFile(path.join(backupDir, 'row-counts.tsv'), 'utf8');
  expect(manifest).toMatch(/^reference_images\t3$/m);

  const restoredImages = path.join(work, 'restored-images');
  await run('bash', ['scripts/restore.sh', backupDir, restoredDb], { env: scriptEnv(restoredImages) });

  // The same rows, compared by content (not only counts), in the tables that carry the evidence.
  for (const sql of ['select id, content_hash, thumbnail_hash from reference_images order by id', 'select seq, prev_hash, hash from audit_events order by seq']) {
    expect(await query(restoredDb, sql)).toEqual(await query(t.db.url.split('/').pop()!, sql));
  }
  // Every image named by a row is in the restored store and hashes to its name.
  const hashes = await query<{ content_hash: string }>(restoredDb, 'select content_hash from reference_images union select thumbnail_hash from reference_images where thumbnail_hash is not null');
  for (const { content_hash: hash } of hashes) {
    const bytes = await fs.readFile(path.join(restoredImages, hash.slice(0, 2), hash.slice(2, 4), hash));
    expect(crypto.createHash('sha256').update(bytes).digest('hex')).toBe(hash);
  }
  // The append-only triggers came back too.
  await expect(query(restoredDb, 'delete from audit_events')).rejects.toThrow();
});

test('restore refuses to overwrite an existing database and refuses a damaged backup', async () => {
  const backupDir = path.join(work, 'backup');
  await expect(run('bash', ['scripts/restore.sh', backupDir, restoredDb], { env: scriptEnv(path.join(work, 'other')) })).rejects.toMatchObject({
    stderr: expect.stringContaining('exists'),
  });
  const damaged = path.join(work, 'damaged');
  await fs.cp(backupDir, damaged, { recursive: true });
  await fs.appendFile(path.join(damaged, 'images.tar'), 'x');
  await expect(run('bash', ['scripts/restore.sh', damaged, `${restoredDb}_x`], { env: scriptEnv(path.join(work, 'other')) })).rejects.toMatchObject({
    stderr: expect.stringContaining('damaged'),
  });
});
