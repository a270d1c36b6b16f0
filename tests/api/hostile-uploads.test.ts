// Hostile and broken uploads, to both photo routes: each is refused with a clear error in the one
// error shape, nothing crashes, and no row or stored file is left behind.
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import sharp from 'sharp';
import request from 'supertest';
import { MAX_PHOTO_BYTES } from '../../server/lib/uploads';
import { createTestApp, type TestApp } from '../support/app';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { releasedRule } from '../support/released-rule';

let t: TestApp;
let imageDir: string;
let operator: { Authorization: string };
let engineer: { Authorization: string };
let stationId: string;
let releasedId: string;
let setId: string;

/** A PNG chunk: length, type, data, CRC-32 over type and data (PNG specification, ISO/IEC 15948 §5.3). */
function chunk(type: string, data: Buffer): Buffer {
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(zlib.crc32(body));
  return Buffer.concat([length, body, crc]);
}

/** A valid PNG header that declares width × height 8-bit grey pixels, with a tiny (wrong-sized) image body. */
function pngDeclaring(width: number, height: number): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([8, 0, 0, 0, 0], 8);
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  return Buffer.concat([signature, chunk('IHDR', ihdr), chunk('IDAT', zlib.deflateSync(Buffer.alloc(64))), chunk('IEND', Buffer.alloc(0))]);
}

interface Hostile {
  name: string;
  file: string;
  type: string;
  bytes: () => Promise<Buffer>;
  status: number;
  message: RegExp;
}

const HOSTILE: Hostile[] = [
  { name: 'an empty file', file: 'part.png', type: 'image/png', bytes: async () => Buffer.alloc(0), status: 400, message: /the file is empty/ },
  {
    name: 'a truncated JPEG',
    file: 'part.jpg',
    type: 'image/jpeg',
    bytes: async () => {
      const jpeg = await sharp({ create: { width: 320, height: 240, channels: 3, background: { r: 90, g: 90, b: 90 } } }).jpeg().toBuffer();
      return jpeg.subarray(0, Math.floor(jpeg.length / 2));
    },
    status: 400,
    message: /damaged or truncated/,
  },
  {
    name: 'a PNG with a damaged body',
    file: 'part.png',
    type: 'image/png',
    bytes: async () => {
      const png = Buffer.from(await spotPhoto(11, 0));
      for (let i = Math.floor(png.length * 0.6); i < png.length - 16; i += 5) png[i] ^= 0xff;
      return png;
    },
    status: 400,
    message: /damaged or truncated/,
  },
  { name: 'a PNG that declares 50 000 × 50 000 pixels', file: 'huge.png', type: 'image/png', bytes: async () => pngDeclaring(50_000, 50_000), status: 413, message: /50000x50000.*pixels/ },
  { name: 'a text file named .png', file: 'part.png', type: 'image/png', bytes: async () => Buffer.from('these are not the pixels you are looking for\n'.repeat(20)), status: 415, message: /not a readable image/ },
  { name: 'an SVG image', file: 'part.svg', type: 'image/svg+xml', bytes: async () => Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="64" height="48"><rect width="64" height="48"/></svg>'), status: 415, message: /svg images are not accepted/ },
  { name: 'an HTML page', file: 'part.html', type: 'text/html', bytes: async () => Buffer.from('<!doctype html><script>alert(1)</script>'), status: 415, message: /not a readable image/ },
];

const inspect = (bytes: Buffer, file: string, type: string) =>
  request(t.app)
    .post('/api/inspections')
    .set(operator)
    .field('stationId', stationId)
    .field('ruleVersionId', releasedId)
    .field('idempotencyKey', crypto.randomUUID())
    .attach('photo', bytes, { filename: file, contentType: type });

async function storedFiles(): Promise<number> {
  const files = await fs.readdir(imageDir, { recursive: true, withFileTypes: true }).catch(() => []);
  return files.filter((f) => f.isFile()).length;
}

async function rowCounts(): Promise<Record<string, number>> {
  const [row] = await t.db.dataSource.query(
    `select (select count(*)::int from inspections) as inspections, (select count(*)::int from measurements) as measurements, (select count(*)::int from reference_images) as reference_images`,
  );
  return row;
}

beforeAll(async () => {
  imageDir = await fs.mkdtemp(path.join(os.tmpdir(), 'kw-hostile-'));
  t = await createTestApp({ imageDir });
  ({ stationId, releasedId } = await releasedRule(t, SPOT_RULE));
  await t.createUser('tomas', ['operator']);
  await t.createUser('ines', ['engineer']);
  operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  setId = (await request(t.app).post('/api/reference-sets').set(engineer).send({ name: 'Plates', partType: 'plate' })).body.id;
});
afterAll(async () => {
  await t.close();
  await fs.rm(imageDir, { recursive: true, force: true });
});

describe.each(HOSTILE)('$name', ({ file, type, bytes, status, message }) => {
  test('is refused by the inspection route, leaving nothing behind', async () => {
    const before = { rows: await rowCounts(), files: await storedFiles() };
    const res = await inspect(await bytes(), file, type);
    expect(res.status).toBe(status);
    expect(res.body.error.message).toMatch(message);
    expect({ rows: await rowCounts(), files: await storedFiles() }).toEqual(before);
  });

  test('is refused by the reference upload, naming the file, leaving nothing behind', async () => {
    const before = { rows: await rowCounts(), files: await storedFiles() };
    const res = await request(t.app).post(`/api/reference-sets/${setId}/images`).set(engineer).attach('photos', await bytes(), { filename: file, contentType: type });
    // A batch upload reports each file's outcome; the hostile file is refused with the same reason.
    expect(res.status).toBe(200);
    expect(res.body.outcomes).toEqual([expect.objectContaining({ status: 'refused', fileName: file, message: expect.stringMatching(message) })]);
    expect({ rows: await rowCounts(), files: await storedFiles() }).toEqual(before);
  });
});

test('a file over the size limit is refused before it is read in full, with the limit named', async () => {
  const before = { rows: await rowCounts(), files: await storedFiles() };
  const res = await inspect(Buffer.alloc(MAX_PHOTO_BYTES + 1), 'big.png', 'image/png');
  expect(res.status).toBe(413);
  expect(res.body.error.message).toMatch(/MB/);
  expect({ rows: await rowCounts(), files: await storedFiles() }).toEqual(before);
});

test('after all that, a good photo is still inspected', async () => {
  const res = await inspect(await spotPhoto(12, 0), 'part.png', 'image/png');
  expect(res.status).toBe(201);
});
