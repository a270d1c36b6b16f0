// PostgreSQL stopped in the middle of inspections: requests fail with a clear 503 and Retry-After,
// nothing is half-written, the server recovers by itself when the database is back, and photos sent
// again with their idempotency key are stored exactly once.
// Runs against a PostgreSQL cluster of its own, which the test stops and starts.
import { execFile } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import request from 'supertest';
import { makeDataSource } from '../../server/db/data-source';
import { createTestApp, type TestApp } from '../support/app';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { releasedRule } from '../support/released-rule';
import { restartablePort } from '../support/restartable-port';

const run = promisify(execFile);
let work: string;
let env: NodeJS.ProcessEnv;
let t: TestApp;
let token: string;
let stationId: string;
let releasedId: string;

const cluster = (command: 'pg_start' | 'pg_stop') => run('bash', ['-c', `source scripts/lib.sh; ${command}`], { env });

beforeAll(async () => {
  work = await fs.mkdtemp(path.join(os.tmpdir(), 'kw-outage-'));
  await fs.chmod(work, 0o755); // the postgres user must reach its data directory inside
  // Below the ephemeral range: the restart must find its port free (see restartable-port.ts).
  const port = String(await restartablePort());
  env = { ...process.env, KW_DATA_DIR: work, KW_PG_PORT: port, KW_DB_NAME: 'outage' };
  await cluster('pg_start');
  const url = `postgres://postgres@127.0.0.1:${port}/outage`;
  const dataSource = makeDataSource(url, { poolSize: 4 });
  await dataSource.initialize();
  await dataSource.runMigrations();
  t = await createTestApp({ imageDir: path.join(work, 'images') }, { database: { url, dataSource, drop: async () => { if (dataSource.isInitialized) await dataSource.destroy(); } } });
  ({ stationId, releasedId } = await releasedRule(t, SPOT_RULE));
  await t.createUser('tomas', ['operator']);
  token = await t.tokenFor('tomas');
}, 120_000);

afterAll(async () => {
  await t?.close();
  await cluster('pg_stop').catch(() => undefined);
  await fs.rm(work, { recursive: true, force: true });
});

const inspect = async (key: string, seed: number) =>
  request(t.app)
    .post('/api/inspections')
    .set('Authorization', `Bearer ${token}`)
    .field('stationId', stationId)
    .field('ruleVersionId', releasedId)
    .field('idempotencyKey', key)
    .attach('photo', await spotPhoto(seed, seed % 2 ? 6 : 0), { filename: 'part.png', contentType: 'image/png' });

test('inspections during an outage get 503 with Retry-After, none is half-written or stored twice, and service resumes when the database returns', async () => {
  expect((await inspect(crypto.randomUUID(), 1)).status).toBe(201);

  // A burst of inspections, with the database stopped while they run.
  const keys = Array.from({ length: 8 }, () => crypto.randomUUID());
  const burst = Promise.all(keys.map((key, i) => inspect(key, i + 2)));
  await new Promise((resolve) => setTimeout(resolve, 150));
  await cluster('pg_stop');
  const answers = await burst;
  for (const res of answers) {
    expect([201, 200, 503]).toContain(res.status);
    if (res.status === 503) {
      expect(res.body.error.code).toBe('service_unavailable');
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
    }
  }

  const down = await inspect(crypto.randomUUID(), 20);
  expect(down.status).toBe(503);
  expect(down.body.error.message).toMatch(/database/i);

  await cluster('pg_start');
  // The pool reconnects by itself: the next inspection is judged.
  const back = await inspect(crypto.randomUUID(), 21);
  expect(back.status).toBe(201);

  // The phone sends every photo that got a 503 again with the same key. An answer lost after the
  // commit (the database went away between commit and reply) is then found, not stored twice.
  for (const [i, res] of answers.entries()) {
    const final = res.status === 503 ? await inspect(keys[i], i + 2) : res;
    expect([200, 201]).toContain(final.status);
    const stored = await t.db.dataSource.query(
      `select i.id, (select count(*)::int from measurements m where m.inspection_id = i.id) as measured from inspections i where idempotency_key = $1`,
      [keys[i]],
    );
    expect(stored).toEqual([{ id: final.body.id, measured: 1 }]);
  }
  const [{ orphans }] = await t.db.dataSource.query(`select count(*)::int as orphans from inspections i where not exists (select 1 from measurements m where m.inspection_id = i.id)`);
  expect(orphans).toBe(0);
});
