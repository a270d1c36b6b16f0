import request from 'supertest';
import { healthSchema } from '../../shared/api/health';
import { createTestApp, type TestApp } from '../support/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

test('health needs no sign-in and reports the database as up', async () => {
  const res = await request(t.app).get('/api/health');
  expect(res.status).toBe(200);
  expect(healthSchema.parse(res.body)).toMatchObject({ status: 'ok', database: { status: 'up' } });
});

test('health answers 503 and says the database is down when it cannot reach it', async () => {
  await t.db.dataSource.destroy();
  const res = await request(t.app).get('/api/health');
  expect(res.status).toBe(503);
  expect(res.body.database.status).toBe('down');
});
