// npm run backup / npm run restore: a backup restored into a fresh database and image store gives
// back every row and every image, byte for byte, with the same audit hash chain and triggers, whether
// the images live in the local folder or in an S3 bucket. SHA-256 is checked with Node's crypto.
import { execFile, spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { CreateBucketCommand, GetObjectCommand, ListObjectsV2Command, PutObjectCommand, type S3Client } from '@aws-sdk/client-s3';
import { Client } from 'pg';
import sharp from 'sharp';
import request from 'supertest';
import type { S3Settings } from '../../server/config';
import { FAKE_S3_CREDENTIALS, startFakeS3, type FakeS3 } from '../../server/lib/fake-s3';
import { LocalImageStore } from '../../server/lib/storage/local-store';
import { s3ClientFor } from '../../server/lib/storage/open-store';
import { S3ImageStore } from '../../server/lib/storage/s3-store';
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

const sha256 = (bytes: Buffer | Uint8Array) => crypto.createHash('sha256').update(bytes).digest('hex');

function scriptEnv(imageDir: string, app: TestApp = t, extra: NodeJS.ProcessEnv = {}): NodeJS.ProcessEnv {
  const url = new URL(app.db.url);
  return { ...process.env, KW_PG_PORT: url.port, KW_DB_NAME: url.pathname.slice(1), KW_DATA_DIR: work, KW_IMAGE_DIR: imageDir, ...extra };
}

const dbName = (app: TestApp) => app.db.url.split('/').pop()!;

/** A reference set of three photos (each stored with its thumbnail) and the audit events of its making. */
async function seedReferencePhotos(app: TestApp): Promise<void> {
  await app.db.dataSource.query(`insert into part_types (code, name, family) values ('washer-m8', 'Washer M8', 'washer')`);
  await app.createUser('ines', ['engineer']);
  const engineer = { Authorization: `Bearer ${await app.tokenFor('ines')}` };
  const set = await request(app.app).post('/api/reference-sets').set(engineer).send({ name: 'Washer M8 rim', partType: 'washer-m8' });
  let upload = request(app.app).post(`/api/reference-sets/${set.body.id}/images`).set(engineer);
  for (const seed of [1, 2, 3]) upload = upload.attach('photos', await photo(seed), { filename: `p${seed}.png`, contentType: 'image/png' });
  expect((await upload).status).toBe(201);
}

/** Every image hash the rows name: the photos and their thumbnails. */
async function namedImages(db: string): Promise<string[]> {
  const rows = await query<{ hash: string }>(db, 'select content_hash as hash from reference_images union select thumbnail_hash from reference_images where thumbnail_hash is not null');
  return rows.map((row) => row.hash).sort();
}

/** The rows that carry the evidence, compared by content (not only counts). */
async function expectSameEvidence(restored: string, original: string): Promise<void> {
  for (const sql of ['select id, content_hash, thumbnail_hash from reference_images order by id', 'select seq, prev_hash, hash from audit_events order by seq']) {
    expect(await query(restored, sql)).toEqual(await query(original, sql));
  }
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
  await seedReferencePhotos(t);
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

  await expectSameEvidence(restoredDb, dbName(t));
  // Every image named by a row is in the restored store and hashes to its name.
  const hashes = await namedImages(restoredDb);
  expect(hashes).toHaveLength(6);
  for (const hash of hashes) {
    const bytes = await fs.readFile(path.join(restoredImages, hash.slice(0, 2), hash.slice(2, 4), hash));
    expect(sha256(bytes)).toBe(hash);
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

describe('with the images in an S3 bucket', () => {
  let fake: FakeS3;
  let plant: TestApp;
  let bucketDb: string;
  const savedEnv = { id: process.env.AWS_ACCESS_KEY_ID, secret: process.env.AWS_SECRET_ACCESS_KEY };
  const settings = (bucket: string): S3Settings => ({ endpoint: fake.endpoint, bucket, region: 'us-east-1', pathStyle: true, standInPort: 0 });
  const client = (): S3Client => s3ClientFor(settings('any'), FAKE_S3_CREDENTIALS);
  const bucketEnv = (bucket: string): NodeJS.ProcessEnv => ({
    KW_STORAGE: 's3',
    KW_S3_ENDPOINT: fake.endpoint,
    KW_S3_BUCKET: bucket,
    AWS_ACCESS_KEY_ID: FAKE_S3_CREDENTIALS.accessKeyId,
    AWS_SECRET_ACCESS_KEY: FAKE_S3_CREDENTIALS.secretAccessKey,
  });

  /** The keys of a bucket, read with plain ListObjectsV2 calls (not through the store under test). */
  async function keysOf(bucket: string): Promise<string[]> {
    const keys: string[] = [];
    let token: string | undefined;
    do {
      const page = await client().send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }));
      keys.push(...(page.Contents ?? []).map((object) => object.Key!));
      token = page.NextContinuationToken;
    } while (token);
    return keys.sort();
  }

  async function createBucket(name: string): Promise<void> {
    await client().send(new CreateBucketCommand({ Bucket: name }));
  }

  beforeAll(async () => {
    fake = await startFakeS3({ port: 0, dir: path.join(work, 's3'), bucket: 'plant-images' });
    // The app's store takes its credentials from the SDK's usual environment variables.
    process.env.AWS_ACCESS_KEY_ID = FAKE_S3_CREDENTIALS.accessKeyId;
    process.env.AWS_SECRET_ACCESS_KEY = FAKE_S3_CREDENTIALS.secretAccessKey;
    plant = await createTestApp({ imageDir: path.join(work, 'no-local-images'), s3: settings('plant-images') });
    await seedReferencePhotos(plant);
    // An object another program left in the bucket: not an image, so not in the backup.
    await client().send(new PutObjectCommand({ Bucket: 'plant-images', Key: 'notes/lighting.txt', Body: 'ring light replaced' }));
    bucketDb = `kw_restored_s3_${crypto.randomBytes(4).toString('hex')}`;
  });

  afterAll(async () => {
    await query('postgres', `drop database if exists "${bucketDb}" with (force)`).catch(() => undefined);
    await plant?.close();
    await fake?.close();
    process.env.AWS_ACCESS_KEY_ID = savedEnv.id;
    process.env.AWS_SECRET_ACCESS_KEY = savedEnv.secret;
    if (savedEnv.id === undefined) delete process.env.AWS_ACCESS_KEY_ID;
    if (savedEnv.secret === undefined) delete process.env.AWS_SECRET_ACCESS_KEY;
  });

  /**
   * The stand-in in a Node of its own started with OpenSSL's legacy provider, where its ListObjectsV2
   * continuation tokens work (it makes them with DES, which OpenSSL 3 leaves out by default).
   */
  async function standInWithTokens(dir: string, bucket: string): Promise<{ endpoint: string; child: ChildProcess }> {
    const start = `require('./server/lib/fake-s3').startFakeS3(${JSON.stringify({ port: 0, dir, bucket })})
      .then((fake) => { console.log('port ' + fake.port); setInterval(() => undefined, 60000); });`;
    const child = spawn(process.execPath, ['--openssl-legacy-provider', '-r', 'ts-node/register/transpile-only', '-e', start], {
      cwd: path.join(__dirname, '..', '..'),
      env: { ...process.env, TS_NODE_PROJECT: 'server/tsconfig.json' },
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    const port = await new Promise<string>((resolve, reject) => {
      let out = '';
      child.stdout!.on('data', (chunk: Buffer) => {
        out += chunk.toString();
        const found = /port (\d+)/.exec(out);
        if (found) resolve(found[1]);
      });
      child.on('exit', (code) => reject(new Error(`the stand-in stopped with status ${code}`)));
    });
    return { endpoint: `http://127.0.0.1:${port}`, child };
  }

  async function listAll(store: LocalImageStore | S3ImageStore): Promise<{ listed: string[]; skipped: string[] }> {
    const listed: string[] = [];
    const skipped: string[] = [];
    for await (const hash of store.list((name) => skipped.push(name))) listed.push(hash);
    return { listed: listed.sort(), skipped: skipped.sort() };
  }

  test('each store lists every image once, page by page, and names what is not an image', async () => {
    const images = [0, 1, 2, 3, 4].map((i) => crypto.randomBytes(100 + i));
    const expected = images.map(sha256).sort();
    // Pages of two keys, so that five images and a foreign object take three pages.
    const tokens = await standInWithTokens(path.join(work, 's3-tokens'), 'listing');
    try {
      const client = s3ClientFor({ ...settings('listing'), endpoint: tokens.endpoint }, FAKE_S3_CREDENTIALS);
      const stores = [
        new S3ImageStore(client, { bucket: 'listing', listPageSize: 2 }),
        new S3ImageStore(s3ClientFor(settings('listing'), FAKE_S3_CREDENTIALS), { bucket: 'listing', listPageSize: 2, markerListing: true }),
      ];
      await createBucket('listing');
      for (const [store, s3] of [[stores[0], client], [stores[1], s3ClientFor(settings('listing'), FAKE_S3_CREDENTIALS)]] as const) {
        for (const bytes of images) await store.put(bytes);
        await s3.send(new PutObjectCommand({ Bucket: 'listing', Key: 'readme.txt', Body: 'x' }));
        expect(await listAll(store)).toEqual({ listed: expected, skipped: ['readme.txt'] });
      }
    } finally {
      tokens.child.kill();
    }

    const folder = new LocalImageStore(path.join(work, 'listing'));
    for (const bytes of images) await folder.put(bytes);
    await fs.writeFile(path.join(work, 'listing', 'readme.txt'), 'x');
    // A file named by a hash but outside its ab/cd folder is not where the store would look for it.
    await fs.writeFile(path.join(work, 'listing', expected[0]), images[0]);
    expect(await listAll(folder)).toEqual({ listed: expected, skipped: ['readme.txt', expected[0]].sort() });
    expect(await listAll(new LocalImageStore(path.join(work, 'no-such-folder')))).toEqual({ listed: [], skipped: [] });
  });

  test('a backup of the bucket restores into a fresh database and an empty bucket with every image', async () => {
    const backupDir = path.join(work, 'backup-s3');
    const backup = await run('bash', ['scripts/backup.sh', backupDir], { env: scriptEnv(path.join(work, 'no-local-images'), plant, bucketEnv('plant-images')) });
    expect(backup.stderr).toContain('notes/lighting.txt');

    // The manifest names exactly the images the rows name, and the archive holds them in the folder layout.
    const named = await namedImages(dbName(plant));
    expect(named).toHaveLength(6);
    expect((await fs.readFile(path.join(backupDir, 'images.txt'), 'utf8')).trim().split('\n')).toEqual(named);
    expect(await fs.readdir(backupDir)).not.toContain('images.export');

    await createBucket('restored-images');
    expect(await keysOf('restored-images')).toEqual([]);
    const restore = await run('bash', ['scripts/restore.sh', backupDir, bucketDb], { env: scriptEnv(path.join(work, 'no-local-images'), plant, bucketEnv('restored-images')) });
    expect(restore.stdout).toContain('6 images read back');

    const original = dbName(plant);
    expect(await query(bucketDb, `select count(*)::int as n from reference_images`)).toEqual(await query(original, `select count(*)::int as n from reference_images`));
    await expectSameEvidence(bucketDb, original);
    // The second bucket holds exactly the named images, each hashing to its key.
    expect(await keysOf('restored-images')).toEqual(named);
    for (const hash of named) {
      const object = await client().send(new GetObjectCommand({ Bucket: 'restored-images', Key: hash }));
      expect(sha256(await object.Body!.transformToByteArray())).toBe(hash);
    }
    await expect(fs.access(path.join(work, 'no-local-images'))).rejects.toThrow();
  }, 240_000);

  test('a backup fails, naming the image, when an object of the bucket no longer matches its hash', async () => {
    await createBucket('damaged-images');
    const hash = await new S3ImageStore(client(), { bucket: 'damaged-images' }).put(Buffer.from('photo of a bracket'));
    // Another program overwrites the object behind Kernwright's back.
    await client().send(new PutObjectCommand({ Bucket: 'damaged-images', Key: hash, Body: 'other bytes' }));
    await expect(
      run('bash', ['scripts/backup.sh', path.join(work, 'backup-damaged')], { env: scriptEnv(path.join(work, 'no-local-images'), plant, bucketEnv('damaged-images')) }),
    ).rejects.toMatchObject({ stderr: expect.stringContaining(`image ${hash} is damaged`) });
  }, 240_000);

  test('restore into a bucket fails when an image of the backup does not reach it intact', async () => {
    const backupDir = path.join(work, 'backup-s3');
    // A manifest naming an image the archive lacks: the read-back after the import must catch it.
    const lacking = path.join(work, 'backup-s3-lacking');
    await fs.cp(backupDir, lacking, { recursive: true });
    const ghost = sha256(Buffer.from('a photo that was never stored'));
    await fs.appendFile(path.join(lacking, 'images.txt'), `${ghost}\n`);
    const sums = await run('sha256sum', ['database.dump', 'images.tar', 'row-counts.tsv', 'images.txt'], { cwd: lacking });
    await fs.writeFile(path.join(lacking, 'SHA256SUMS'), sums.stdout);
    await createBucket('restored-lacking');
    await expect(
      run('bash', ['scripts/restore.sh', lacking, `${bucketDb}_l`], { env: scriptEnv(path.join(work, 'no-local-images'), plant, bucketEnv('restored-lacking')) }),
    ).rejects.toMatchObject({ stderr: expect.stringContaining(`image ${ghost} is missing`) });
    await query('postgres', `drop database if exists "${bucketDb}_l" with (force)`);
  }, 240_000);
});
