// HTTP hardening at the edge: security headers, cross-origin reads limited to the listed origins,
// body size limits and a per-person limit on photo uploads.
import request from 'supertest';
import { createTestApp, type TestApp } from '../support/app';

let t: TestApp;
let operator: { Authorization: string };

beforeAll(async () => {
  t = await createTestApp({ uploadsPerMinute: 3 });
  await t.createUser('tomas', ['operator']);
  operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
});
afterAll(() => t.close());

test('answers carry the usual security headers (helmet defaults)', async () => {
  const res = await request(t.app).get('/api/health');
  expect(res.headers['x-content-type-options']).toBe('nosniff');
  expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
  expect(res.headers['strict-transport-security']).toMatch(/max-age=/);
  expect(res.headers['x-powered-by']).toBeUndefined();
});

test('a listed origin may read cross-origin; any other origin gets no CORS headers', async () => {
  const allowed = await request(t.app).options('/api/auth/me').set('Origin', 'https://kiosk.fernwick.example').set('Access-Control-Request-Method', 'GET').set('Access-Control-Request-Headers', 'authorization');
  expect(allowed.status).toBe(204);
  expect(allowed.headers['access-control-allow-origin']).toBe('https://kiosk.fernwick.example');
  expect(allowed.headers['access-control-allow-headers']).toMatch(/Authorization/);
  const other = await request(t.app).options('/api/auth/me').set('Origin', 'https://elsewhere.example').set('Access-Control-Request-Method', 'GET');
  expect(other.headers['access-control-allow-origin']).toBeUndefined();
  const simple = await request(t.app).get('/api/health').set('Origin', 'https://elsewhere.example');
  expect(simple.headers['access-control-allow-origin']).toBeUndefined();
});

test('a JSON body over 1 MB is refused with 413 in the one error shape', async () => {
  const res = await request(t.app).post('/api/auth/sign-in').set('Content-Type', 'application/json').send(JSON.stringify({ username: 'x', password: 'y'.repeat(1_100_000) }));
  expect(res.status).toBe(413);
  expect(res.body.error.code).toBe('payload_too_large');
});

test('photo uploads beyond the per-minute limit are refused with 429 and a Retry-After; reading is not limited', async () => {
  const statuses: number[] = [];
  for (let i = 0; i < 4; i++) statuses.push((await request(t.app).post('/api/inspections').set(operator).field('stationId', 'x')).status);
  expect(statuses.slice(0, 3)).not.toContain(429);
  expect(statuses[3]).toBe(429);
  const limited = await request(t.app).post('/api/inspections').set(operator);
  expect(limited.body.error.message).toMatch(/More than 3 uploads in a minute/);
  expect(limited.headers['retry-after']).toBeDefined();
  expect((await request(t.app).get('/api/inspections/00000000-0000-4000-8000-000000000000').set(operator)).status).not.toBe(429);
});

test('two API processes on one database share the limits: uploads and failed sign-ins count in PostgreSQL', async () => {
  // A second app on the same database stands for a second API process behind the load balancer.
  const other = await createTestApp({ uploadsPerMinute: 3, signInLimit: { windowMs: 60_000, maxFailures: 4 } }, { database: t.db });
  const first = await createTestApp({ uploadsPerMinute: 3, signInLimit: { windowMs: 60_000, maxFailures: 4 } }, { database: t.db });
  await t.createUser('ayla', ['operator']);
  const ayla = { Authorization: `Bearer ${await t.tokenFor('ayla')}` };
  const statuses: number[] = [];
  for (let i = 0; i < 4; i++) statuses.push((await request(i % 2 === 0 ? first.app : other.app).post('/api/inspections').set(ayla).field('stationId', 'x')).status);
  expect(statuses.slice(0, 3)).not.toContain(429);
  expect(statuses[3]).toBe(429);

  const wrong = (app: typeof t.app) => request(app).post('/api/auth/sign-in').send({ username: 'ayla', password: 'not-her-password' });
  const signIns: number[] = [];
  for (let i = 0; i < 5; i++) signIns.push((await wrong(i % 2 === 0 ? first.app : other.app)).status);
  expect(signIns.slice(0, 4)).toEqual([401, 401, 401, 401]);
  expect(signIns[4]).toBe(429);
  const [{ keys }] = await t.db.dataSource.query(`select count(*)::int as keys from rate_limit_hits where key like 'sign-in:%' or key like 'uploads:%'`);
  expect(keys).toBeGreaterThanOrEqual(2);
});
