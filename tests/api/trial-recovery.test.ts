import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Piscina } from 'piscina';
import sharp from 'sharp';
import type { UserEntity } from '../../server/components/auth/entities';
import { JobQueue } from '../../server/lib/jobs';
import { createServices, type Services } from '../../server/services';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { VisionPool } from '../../server/vision/pool';
import type { PipelineRunner } from '../../server/vision/runner';
import { startWorkers } from '../../server/workers';
import { testConfig } from '../support/app';
import { createTestDatabase, type TestDatabase } from '../support/db';

jest.setTimeout(180_000);

const ROOT = path.join(__dirname, '..', '..');
const PHOTOS = 48;
/** Results stored before the worker is killed; the rest must come from the next one. */
const KILL_AFTER = 4;

/** Slow enough per photo (a median and a Gaussian on 480×360) that a kill lands in the middle of the trial. */
const RULE = {
  format: 'kernwright-rule/1',
  name: 'Rim texture',
  steps: [
    { op: 'median', size: 9 },
    { op: 'gaussian', sigma: 3 },
    { op: 'gradient', operator: 'sobel', output: 'magnitude' },
    { op: 'threshold', method: 'otsu' },
  ],
  gauges: [{ name: 'Edge share', measure: 'edge-fraction', limits: { max: 0.5 } }],
};

/** A 480×360 grey photo whose texture depends on the seed (distinct bytes for each seed). */
function texturedPhoto(seed: number): Promise<Buffer> {
  const w = 480;
  const h = 360;
  const px = Buffer.alloc(w * h);
  for (let i = 0; i < px.length; i++) px[i] = 60 + ((i * 31 + seed * 97 + ((i / w) | 0) * seed) % 131);
  return sharp(px, { raw: { width: w, height: h, channels: 1 } }).png().toBuffer();
}

/** A runner for the test process, which only sends jobs and must never judge a photo itself. */
const noRunner: PipelineRunner = {
  run: () => Promise.reject(new Error('the test process runs no pipelines')),
};

let db: TestDatabase;
let work: string;
let sender: JobQueue;
let services: Services;
let engineer: UserEntity;
let setId: string;
let versionId: string;

beforeAll(async () => {
  db = await createTestDatabase();
  work = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-recovery-'));
  sender = await new JobQueue(db.url).start();
  services = createServices({ config: testConfig({ databaseUrl: db.url, imageDir: path.join(work, 'images') }), dataSource: db.dataSource, pool: noRunner, jobs: sender });
  await db.dataSource.query(`insert into part_types (code, name, family) values ('ring', 'Ring', 'ring')`);
  engineer = await db.dataSource.getRepository('UserEntity').save({ username: 'ines', displayName: 'Ines', email: null, roles: ['engineer'], passwordHash: 'not-used' }) as UserEntity;
  setId = (await services.references.createSet(engineer, { name: 'Rings', partType: 'ring', description: '' })).id;
  const files = await Promise.all(Array.from({ length: PHOTOS }, async (_, i) => ({ fileName: `ring-${i}.png`, bytes: await texturedPhoto(i + 1) })));
  const outcomes = await services.references.addImages(engineer, setId, files, { label: 'good' });
  expect(outcomes.every((o) => o.status === 'stored')).toBe(true);
  versionId = (await services.rules.create(engineer, { name: 'Rim texture', partType: 'ring', smallestDefectMm: null, document: RULE })).versions[0].id;
});

afterAll(async () => {
  await sender.stop();
  await db.drop();
  fs.rmSync(work, { recursive: true, force: true });
});

interface TrialRow {
  state: string;
  processed: number;
  total: number;
  attempts: number;
}
const trialRow = async (id: string): Promise<TrialRow> => (await db.dataSource.query('select state, processed, total, attempts from trials where id = $1', [id]))[0];
const storedResults = async (id: string): Promise<Map<string, number>> =>
  new Map((await db.dataSource.query('select image_id, duration_ms from trial_results where trial_id = $1', [id])).map((r: { image_id: string; duration_ms: number }) => [r.image_id, r.duration_ms]));

async function waitFor<T>(what: string, probe: () => Promise<T | null>, timeoutMs: number, everyMs = 40): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value !== null) return value;
    if (Date.now() > until) throw new Error(`gave up waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

/** The real server as a worker-only process (KW_ROLE=worker) on the test database. */
function startWorkerProcess(name: string): { child: ChildProcess; ready: Promise<void>; output: () => string } {
  let output = '';
  const child = spawn(process.execPath, ['-r', 'ts-node/register/transpile-only', path.join(ROOT, 'server', 'main.ts')], {
    cwd: ROOT,
    env: {
      ...process.env,
      TS_NODE_PROJECT: path.join(ROOT, 'server', 'tsconfig.json'),
      KW_ROLE: 'worker',
      DATABASE_URL: db.url,
      KW_DATA_DIR: path.join(work, name),
      KW_IMAGE_DIR: path.join(work, 'images'),
      KW_JWT_SECRET: 'recovery-test-secret',
      KW_FAKE_SMTP: '0',
      KW_VISION_THREADS: '1',
      KW_LOG_LEVEL: 'warn',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const ready = new Promise<void>((resolve, reject) => {
    child.stdout!.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      if (output.includes('worker') && output.includes('is running')) resolve();
    });
    child.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.once('exit', (code, signal) => reject(new Error(`${name} stopped before it was ready (${code ?? signal}): ${output}`)));
  });
  return { child, ready, output: () => output };
}

const exited = (child: ChildProcess) => new Promise<void>((resolve) => (child.exitCode !== null || child.signalCode !== null ? resolve() : child.once('exit', () => resolve())));

async function expectCompletedOnce(trialId: string, before: Map<string, number>): Promise<void> {
  const trial = await trialRow(trialId);
  expect(trial).toMatchObject({ state: 'done', processed: PHOTOS, total: PHOTOS });
  const [{ rows, images }] = await db.dataSource.query('select count(*)::int as rows, count(distinct image_id)::int as images from trial_results where trial_id = $1', [trialId]);
  expect({ rows, images }).toEqual({ rows: PHOTOS, images: PHOTOS });
  // Photos judged before the failure were not judged again: their stored results are untouched.
  const after = await storedResults(trialId);
  for (const [imageId, durationMs] of before) expect(after.get(imageId)).toBe(durationMs);
  const summary = (await services.trials.get(trialId)).summary!;
  expect(summary.table.good.PASS + summary.table.good.FAIL + summary.table.good.RETAKE).toBe(PHOTOS);
}

test('a worker process killed in the middle of a trial: the next worker finishes it, each photo counted once', async () => {
  const first = startWorkerProcess('worker-a');
  await first.ready;
  const trial = await services.trials.start(engineer, { ruleVersionId: versionId, referenceSetId: setId });
  await waitFor('the first results', async () => ((await trialRow(trial.id)).processed >= KILL_AFTER ? true : null), 120_000);
  first.child.kill('SIGKILL');
  await exited(first.child);

  const before = await storedResults(trial.id);
  const killed = await trialRow(trial.id);
  expect(killed.state).toBe('running');
  expect(before.size).toBeGreaterThanOrEqual(KILL_AFTER);
  expect(before.size).toBeLessThan(PHOTOS);

  const second = startWorkerProcess('worker-b');
  try {
    await second.ready;
    await waitFor('the trial to finish', async () => ((await trialRow(trial.id)).state === 'done' ? true : null), 120_000, 200);
    await expectCompletedOnce(trial.id, before);
    expect((await trialRow(trial.id)).attempts).toBe(2);
  } finally {
    second.child.kill('SIGTERM');
    await exited(second.child);
  }
});

test('a worker thread that dies in the middle of a trial: the job is retried and the trial finishes, each photo counted once', async () => {
  const pool = new VisionPool({ kernels: await loadKernelLibrary(), threads: 1 });
  const jobs = await new JobQueue(db.url).start();
  const working = createServices({ config: testConfig({ databaseUrl: db.url, imageDir: path.join(work, 'images') }), dataSource: db.dataSource, pool, jobs });
  try {
    await startWorkers(jobs, working);
    const trial = await working.trials.start(engineer, { ruleVersionId: versionId, referenceSetId: setId });
    await waitFor('the first results', async () => ((await trialRow(trial.id)).processed >= KILL_AFTER ? true : null), 120_000, 10);
    // The pool's own threads (piscina), ended as a crash would end them.
    const threads = (pool as unknown as { piscina: Piscina }).piscina.threads;
    await Promise.all(threads.map((thread) => thread.terminate()));

    const before = await storedResults(trial.id);
    expect(before.size).toBeLessThan(PHOTOS);
    await waitFor('the trial to finish', async () => ((await trialRow(trial.id)).state === 'done' ? true : null), 120_000, 200);
    await expectCompletedOnce(trial.id, before);
    // Threads ended between two photos cost no attempt (the pool starts new ones); ended during a photo,
    // the job fails and is taken up again. Either way every photo is counted once, which is what matters.
    expect((await trialRow(trial.id)).attempts).toBeGreaterThanOrEqual(1);
  } finally {
    await jobs.stop();
    await pool.destroy();
  }
});

// The two checks below leave their trials unfinished on purpose: they come last, once no worker runs.

test('a trial claimed by a live worker is left alone by a second job and by the requeueing, and requeued once the claim goes', async () => {
  const [{ id }] = await db.dataSource.query(
    `insert into trials (rule_version_id, reference_set_id, content_hash, state, total, started_by)
     select $1, $2, content_hash, 'running', $3, $4 from rule_versions where id = $1 returning id`,
    [versionId, setId, PHOTOS, engineer.id],
  );
  // Another worker's claim: the same advisory lock, held on another PostgreSQL connection.
  const claims = services.trials as unknown as { claim(trialId: string): Promise<{ release(): Promise<void> } | null> };
  const held = (await claims.claim(id))!;
  expect(held).not.toBeNull();
  await services.trials.run(id);
  expect(await trialRow(id)).toMatchObject({ state: 'running', processed: 0, attempts: 0 });
  expect(await services.trials.resumeAbandoned()).toBe(0);
  await held.release();
  expect(await services.trials.resumeAbandoned()).toBe(1);
});

test('a trial taken up five times without finishing is failed with a message rather than tried again', async () => {
  const [{ id }] = await db.dataSource.query(
    `insert into trials (rule_version_id, reference_set_id, content_hash, state, total, attempts, started_by)
     select $1, $2, content_hash, 'running', $3, 5, $4 from rule_versions where id = $1 returning id`,
    [versionId, setId, PHOTOS, engineer.id],
  );
  await services.trials.run(id);
  const trial = await services.trials.get(id);
  expect(trial.state).toBe('failed');
  expect(trial.error).toMatch(/stopped 5 times/);
});
