import type { Express } from 'express';
import path from 'node:path';
import request from 'supertest';
import { createApp } from '../../server/app';
import type { Config } from '../../server/config';
import { UserEntity } from '../../server/components/auth/entities';
import { hashPassword } from '../../server/components/auth/passwords';
import { JobQueue } from '../../server/lib/jobs';
import { createLogger } from '../../server/lib/logger';
import { createServices, type Services } from '../../server/services';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { VisionPool } from '../../server/vision/pool';
import type { PipelineRunner } from '../../server/vision/runner';
import { startWorkers } from '../../server/workers';
import type { Role } from '../../shared/roles';
import { createTestDatabase, type TestDatabase } from './db';

export const TEST_PASSWORD = 'correct-horse-battery';

export function testConfig(overrides: Partial<Config> = {}): Config {
  return {
    port: 0,
    host: '127.0.0.1',
    databaseUrl: 'set-by-test',
    dataDir: path.join(__dirname, '..', 'artifacts', 'data'),
    imageDir: path.join(__dirname, '..', 'artifacts', 'images'),
    jwtSecret: 'test-secret-not-for-production',
    tokenTtlSeconds: 3600,
    webDir: null,
    signInLimit: { windowMs: 60_000, maxFailures: 1000 },
    lockout: { failures: 5, minutes: 15 },
    allowedOrigins: ['https://kiosk.fernwick.example'],
    uploadsPerMinute: 10_000,
    maxInspectionsInFlight: 64,
    logLevel: 'silent',
    version: 'test',
    smtp: { host: '127.0.0.1', port: 1, from: 'Kernwright <kernwright@test.example>' },
    fakeSmtp: false,
    ...overrides,
  };
}

export interface TestApp {
  app: Express;
  services: Services;
  db: TestDatabase;
  config: Config;
  createUser(username: string, roles: Role[], extra?: Partial<UserEntity>): Promise<UserEntity>;
  tokenFor(username: string, password?: string): Promise<string>;
  close(): Promise<void>;
}

export interface TestAppOptions {
  /** Run background work through the real PostgreSQL queue (otherwise inline, in the request). */
  queue?: boolean;
  /** A database of the test's own (already migrated) instead of a copy of the template. */
  database?: TestDatabase;
}

/** A pool of two worker threads, started on first use and closed with the test app. */
function lazyPool(): PipelineRunner & { destroy(): Promise<void> } {
  let pool: Promise<VisionPool> | null = null;
  return {
    async run(rule, photo, options) {
      pool ??= loadKernelLibrary().then((kernels) => new VisionPool({ kernels, threads: 2 }));
      return (await pool).run(rule, photo, options);
    },
    async destroy() {
      if (pool) await (await pool).destroy();
    },
  };
}

/** The real Express app on a fresh copy of the migrated database. */
export async function createTestApp(overrides: Partial<Config> = {}, options: TestAppOptions = {}): Promise<TestApp> {
  const db = options.database ?? (await createTestDatabase());
  const config = testConfig({ databaseUrl: db.url, ...overrides });
  const jobs = options.queue ? await new JobQueue(db.url).start() : null;
  const pool = lazyPool();
  const services = createServices({ config, dataSource: db.dataSource, pool, jobs });
  if (jobs) await startWorkers(jobs, services);
  const app = createApp({ config, services, logger: createLogger('silent') });
  const users = db.dataSource.getRepository(UserEntity);
  const passwordHash = await hashPassword(TEST_PASSWORD);
  return {
    app,
    services,
    db,
    config,
    createUser: (username, roles, extra = {}) =>
      users.save(users.create({ username, displayName: `Test ${username}`, email: null, roles, passwordHash, ...extra })),
    async tokenFor(username, password = TEST_PASSWORD) {
      const res = await request(app).post('/api/auth/sign-in').send({ username, password });
      if (res.status !== 200) throw new Error(`sign-in as ${username} failed: ${res.status} ${JSON.stringify(res.body)}`);
      return res.body.token as string;
    },
    async close() {
      await jobs?.stop();
      await pool.destroy();
      await db.drop();
    },
  };
}
