import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { CreateBucketCommand, PutObjectCommand } from '@aws-sdk/client-s3';
import request from 'supertest';
import type { S3Settings } from '../../server/config';
import { FAKE_S3_CREDENTIALS, startFakeS3, type FakeS3 } from '../../server/lib/fake-s3';
import { LocalImageStore } from '../../server/lib/storage/local-store';
import { openImageStore, s3ClientFor } from '../../server/lib/storage/open-store';
import { DamagedImageError, S3ImageStore } from '../../server/lib/storage/s3-store';
import { inspectionSchema } from '../../shared/api/inspections';
import { createTestApp, testConfig, type TestApp } from '../support/app';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { releasedRule } from '../support/released-rule';
import { imageStoreContract } from '../unit/storage/image-store-contract';

jest.setTimeout(60_000);

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-s3-'));
let fake: FakeS3;
let bucketCount = 0;

const settings = (bucket: string, endpoint: string | null = fake.endpoint): S3Settings => ({ endpoint, bucket, region: 'us-east-1', pathStyle: true, standInPort: 0 });

/** A store on a bucket of its own in the stand-in, so tests do not see each other's objects. */
async function freshS3Store(): Promise<S3ImageStore> {
  const bucket = `contract-${++bucketCount}`;
  await s3ClientFor(settings(bucket), FAKE_S3_CREDENTIALS).send(new CreateBucketCommand({ Bucket: bucket }));
  return new S3ImageStore(s3ClientFor(settings(bucket), FAKE_S3_CREDENTIALS), { bucket });
}

beforeAll(async () => {
  fake = await startFakeS3({ port: 0, dir: path.join(work, 's3'), bucket: 'kernwright-images' });
});
afterAll(async () => {
  await fake.close();
  fs.rmSync(work, { recursive: true, force: true });
});

imageStoreContract('local folder', async () => new LocalImageStore(fs.mkdtempSync(path.join(work, 'local-'))));
imageStoreContract('S3 bucket', freshS3Store);

test('an object whose bytes do not hash to its name is reported as damaged, not served', async () => {
  const store = await freshS3Store();
  const good = Buffer.from('the photo that was stored');
  const hash = await store.put(good);
  // Another program overwrites the object behind Kernwright's back.
  const bucket = `contract-${bucketCount}`;
  await s3ClientFor(settings(bucket), FAKE_S3_CREDENTIALS).send(new PutObjectCommand({ Bucket: bucket, Key: hash, Body: Buffer.from('other bytes') }));
  await expect(store.get(hash)).rejects.toBeInstanceOf(DamagedImageError);
});

test('without an endpoint the bucket lives in a stand-in on loopback, started on first use and kept in the data folder', async () => {
  const port = 8117;
  const config = testConfig({ dataDir: path.join(work, 'demo-data'), s3: { endpoint: null, bucket: 'kernwright-images', region: 'us-east-1', pathStyle: true, standInPort: port } });
  const store = openImageStore(config);
  const hash = await store.put(Buffer.from('demo photo'));
  expect((await store.get(hash)).toString()).toBe('demo photo');
  // A second store of the same settings (another part of the process) finds the stand-in running.
  expect(await openImageStore(config).has(hash)).toBe(true);
  expect(fs.readdirSync(path.join(work, 'demo-data', 's3'))).toContain('kernwright-images');
});

describe('an inspection with images in S3', () => {
  let t: TestApp;
  const imageDir = path.join(work, 'unused-local-folder');
  const savedEnv = { id: process.env.AWS_ACCESS_KEY_ID, secret: process.env.AWS_SECRET_ACCESS_KEY };

  beforeAll(async () => {
    // An explicit endpoint takes its credentials from the SDK's usual environment variables.
    process.env.AWS_ACCESS_KEY_ID = FAKE_S3_CREDENTIALS.accessKeyId;
    process.env.AWS_SECRET_ACCESS_KEY = FAKE_S3_CREDENTIALS.secretAccessKey;
    t = await createTestApp({ imageDir, s3: settings('kernwright-images') });
  });
  afterAll(async () => {
    await t.close();
    process.env.AWS_ACCESS_KEY_ID = savedEnv.id;
    process.env.AWS_SECRET_ACCESS_KEY = savedEnv.secret;
    if (savedEnv.id === undefined) delete process.env.AWS_ACCESS_KEY_ID;
    if (savedEnv.secret === undefined) delete process.env.AWS_SECRET_ACCESS_KEY;
  });

  test('the photo is stored in the bucket by its SHA-256, judged, and served back from the bucket', async () => {
    const { stationId, releasedId } = await releasedRule(t, SPOT_RULE);
    await t.createUser('tomas', ['operator']);
    const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
    const bytes = await spotPhoto(3, 8);
    const res = await request(t.app)
      .post('/api/inspections')
      .set(operator)
      .field('stationId', stationId)
      .field('ruleVersionId', releasedId)
      .field('idempotencyKey', 'key-s3-0001')
      .attach('photo', bytes, { filename: 'part.png', contentType: 'image/png' });
    expect(res.status).toBe(201);
    const inspection = inspectionSchema.parse(res.body);
    // An 8×8 bright square is 64 px², over the 20 px² limit.
    expect(inspection.verdict).toBe('FAIL');
    const hash = crypto.createHash('sha256').update(bytes).digest('hex');
    expect(inspection.imageUrl).toContain(hash);

    const bucket = new S3ImageStore(s3ClientFor(settings('kernwright-images'), FAKE_S3_CREDENTIALS), { bucket: 'kernwright-images' });
    expect((await bucket.get(hash)).equals(bytes)).toBe(true);
    const address = new URL(inspection.imageUrl, 'http://kernwright.test');
    const served = await request(t.app).get(address.pathname + address.search).buffer(true);
    expect(served.status).toBe(200);
    expect(Buffer.from(served.body as Buffer).equals(bytes)).toBe(true);
    expect(fs.existsSync(imageDir)).toBe(false);
  });
});
