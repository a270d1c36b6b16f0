// Under overload the inspection route sheds load with 503 + Retry-After before reading the photo;
// an upload cut off midway (client gone, network dropped) leaves no row and no stored file.
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { createTestApp, type TestApp } from '../support/app';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { releasedRule } from '../support/released-rule';

let t: TestApp;
let server: http.Server;
let port: number;
let imageDir: string;
let token: string;
let stationId: string;
let releasedId: string;

beforeAll(async () => {
  imageDir = await fs.mkdtemp(path.join(os.tmpdir(), 'kw-overload-'));
  t = await createTestApp({ imageDir, maxInspectionsInFlight: 2 });
  ({ stationId, releasedId } = await releasedRule(t, SPOT_RULE));
  await t.createUser('tomas', ['operator']);
  token = await t.tokenFor('tomas');
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await t.close();
  await fs.rm(imageDir, { recursive: true, force: true });
});

/** Starts a multipart upload and sends only its first part: the server waits for the rest. */
function hangingUpload(photo: Buffer): { request: http.ClientRequest; started: Promise<void> } {
  const boundary = `----kw${crypto.randomBytes(8).toString('hex')}`;
  const field = (name: string, value: string) => `--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`;
  const head = Buffer.from(
    field('stationId', stationId) +
      field('ruleVersionId', releasedId) +
      field('idempotencyKey', crypto.randomUUID()) +
      `--${boundary}\r\nContent-Disposition: form-data; name="photo"; filename="part.png"\r\nContent-Type: image/png\r\n\r\n`,
  );
  const req = http.request({
    host: '127.0.0.1',
    port,
    method: 'POST',
    path: '/api/inspections',
    headers: { Authorization: `Bearer ${token}`, 'Content-Type': `multipart/form-data; boundary=${boundary}`, 'Content-Length': head.length + photo.length + 100 },
  });
  req.on('error', () => undefined);
  const started = new Promise<void>((resolve) => req.write(Buffer.concat([head, photo.subarray(0, photo.length >> 1)]), () => resolve()));
  return { request: req, started };
}

async function counts(): Promise<{ rows: number; files: number }> {
  const [{ n }] = await t.db.dataSource.query('select count(*)::int as n from inspections');
  const files = (await fs.readdir(imageDir, { recursive: true, withFileTypes: true }).catch(() => [])).filter((f) => f.isFile()).length;
  return { rows: n, files };
}

const inspect = async (seed: number) =>
  request(server)
    .post('/api/inspections')
    .set('Authorization', `Bearer ${token}`)
    .field('stationId', stationId)
    .field('ruleVersionId', releasedId)
    .field('idempotencyKey', crypto.randomUUID())
    .attach('photo', await spotPhoto(seed, 0), { filename: 'part.png', contentType: 'image/png' });

test('beyond the in-flight limit an upload is refused at once with 503 and Retry-After; cut-off uploads leave nothing behind', async () => {
  const before = await counts();
  const photo = await spotPhoto(21, 0);
  const hanging = [hangingUpload(photo), hangingUpload(photo)];
  await Promise.all(hanging.map((h) => h.started));
  // Give the server a moment to admit both (they are reading their bodies now).
  await new Promise((resolve) => setTimeout(resolve, 300));

  const shed = await inspect(22);
  expect(shed.status).toBe(503);
  expect(shed.body.error.code).toBe('service_unavailable');
  expect(shed.body.error.message).toMatch(/busy/);
  expect(Number(shed.headers['retry-after'])).toBeGreaterThan(0);

  // The clients go away midway through their photos.
  for (const h of hanging) h.request.destroy();
  await new Promise((resolve) => setTimeout(resolve, 300));
  expect(await counts()).toEqual(before);

  // Their places are free again.
  const admitted = await inspect(23);
  expect(admitted.status).toBe(201);
  expect((await counts()).rows).toBe(before.rows + 1);
});
