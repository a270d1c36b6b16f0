// Proof on one machine that Kernwright runs on several: two API processes (KW_ROLE=api) and two
// worker processes (KW_ROLE=worker) of the real server share one PostgreSQL and one S3 bucket (the
// stand-in S3 server, in this process). A burst of inspections goes to both API processes, a part of
// them sent twice with the same idempotency key to different processes, while trials queued through
// the API processes run on the workers. Then every inspection must be stored exactly once with its
// photo in the bucket, and every trial done with each reference photo counted once. Prints the
// figures; exits 1 when a check fails.
//
// Run: npx ts-node --transpile-only -P server/tsconfig.json scripts/scale-proof.ts
// Settings: KW_SCALE_PG_URL (a PostgreSQL server; default npm start's, postgres://postgres@127.0.0.1:54329;
// the proof makes a database of its own and drops it), KW_SCALE_INSPECTIONS (240), KW_SCALE_TRIALS (6),
// KW_SCALE_REFERENCE_PHOTOS (24 per part type), KW_SCALE_CONCURRENCY (8 uploads in flight),
// KW_SCALE_PORT (8100: the API processes listen on it and the next port).
import { spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Client } from 'pg';
import { UserEntity } from '../server/components/auth/entities';
import { loadConfig } from '../server/config';
import { makeDataSource } from '../server/db/data-source';
import { FAMILY_NAMES, generateDataset, type FamilyName } from '../server/demo';
import { FAKE_S3_CREDENTIALS, startFakeS3 } from '../server/lib/fake-s3';
import { startFakeSmtp } from '../server/lib/fake-smtp';
import { openImageStore } from '../server/lib/storage/open-store';
import { DEMO_FRAME, demoScale, partTypeCode, seedDemoPlant } from '../server/seed/demo-plant';
import { DEMO_PASSWORD, seedDemoUsers } from '../server/seed/demo-users';
import { MemoizingRunner } from '../server/seed/memo-runner';
import { createServices } from '../server/services';
import { loadKernelLibrary } from '../server/vision/kernel-library';
import { POOL_PROCESS_NODE_FLAGS, VisionPool } from '../server/vision/pool';

const ROOT = path.join(__dirname, '..');
const BUCKET = 'kernwright-scale';

export interface ScaleProofOptions {
  /** A migrated (or empty) database of its own; it is migrated and seeded here. */
  databaseUrl: string;
  inspections: number;
  trials: number;
  referencePhotos: number;
  concurrency: number;
  /** The two API processes' ports. */
  apiPorts: [number, number];
  /** Print progress on stderr. */
  verbose?: boolean;
}

interface Percentiles {
  p50: number;
  p95: number;
  p99: number;
}

export interface ScaleProofReport {
  inspections: {
    sent: number;
    resentToOtherNode: number;
    stored: number;
    distinctKeys: number;
    /** Keys whose answers (first and repeated) all name the same stored inspection. */
    keysAnsweredWithOneInspection: number;
    /** Keys answered 201 Created exactly once. */
    keysCreatedOnce: number;
    photosInBucket: number;
    answeredPerNode: [number, number];
    /** 503 answers (load shed) that the client sent again after Retry-After. */
    shed: number;
    burstSeconds: number;
    /** Uploads answered per second of the burst, repeats included. */
    perSecond: number;
    latencyMs: Percentiles;
  };
  trials: {
    started: number;
    /** A trial queued while only the API processes ran was still queued 3 s later: they run no jobs. */
    stayedQueuedWithoutWorkers: boolean;
    done: number;
    photos: number;
    resultRows: number;
    distinctResults: number;
    /** Every trial's processed = total = its set's photos, and one result per photo. */
    everyPhotoCountedOnce: boolean;
    /** Most trials seen running at the same moment (each worker runs one at a time). */
    mostRunningAtOnce: number;
    /** The worker processes seen holding a trial's claim (its PostgreSQL connection's application_name). */
    workersThatRanTrials: string[];
    seconds: number;
    photosPerSecond: number;
  };
  /** Files under the processes' local image folders: none, the bucket holds everything. */
  localImageFiles: number;
  /** The machine's 1-minute load average when the burst started and when the last trial finished (other work included). */
  loadAverage: [number, number];
  failures: string[];
}

function setting(name: string, fallback: number): number {
  const value = Number(process.env[name] ?? fallback);
  if (!Number.isInteger(value) || value <= 0) throw new Error(`${name} must be a positive whole number`);
  return value;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Nearest-rank percentile of sorted values. */
function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}

interface Plant {
  stations: Map<FamilyName, string>;
  releasedVersions: Map<FamilyName, string>;
  referenceSets: Map<FamilyName, { id: string; photos: number }>;
  photos: Map<FamilyName, Buffer[]>;
}

/** Migrates, seeds the demo users and rules (reference sets, trials, releases) and a station per part type; photographs parts. */
async function preparePlant(config: ReturnType<typeof loadConfig>, options: ScaleProofOptions, log: (line: string) => void): Promise<Plant> {
  const dataSource = makeDataSource(config.databaseUrl, { poolSize: 4 });
  await dataSource.initialize();
  const pool = new VisionPool({ kernels: await loadKernelLibrary(), threads: 2 });
  try {
    await dataSource.runMigrations({ transaction: 'each' });
    await seedDemoUsers(dataSource);
    const services = createServices({ config, dataSource, pool: new MemoizingRunner(pool), jobs: null });
    await seedDemoPlant(services, { referencePhotos: options.referencePhotos, historyDays: 0, log });
    const supervisor = await dataSource.getRepository(UserEntity).findOneByOrFail({ username: 'supervisor' });
    const line = await services.stations.createLine(supervisor, { name: 'Scale proof line' });
    const plant: Plant = { stations: new Map(), releasedVersions: new Map(), referenceSets: new Map(), photos: new Map() };
    const perFamily = Math.ceil(options.inspections / FAMILY_NAMES.length);
    for (const family of FAMILY_NAMES) {
      const station = await services.stations.createStation(supervisor, { lineId: line.id, name: `Scale proof ${family}`, cameraNote: `${DEMO_FRAME.width}×${DEMO_FRAME.height}` });
      await services.stations.calibrate(supervisor, station.id, { referenceLengthMm: 20, distancePx: 20 / demoScale(family), photoWidthPx: DEMO_FRAME.width, photoHeightPx: DEMO_FRAME.height });
      plant.stations.set(family, station.id);
      const [released] = await dataSource.query(
        `select v.id from rule_versions v join rules r on r.id = v.rule_id where r.part_type = $1 and v.state = 'released' order by v.created_at desc limit 1`,
        [partTypeCode(family)],
      );
      if (!released) throw new Error(`the demo seed released no rule for the ${family}`);
      plant.releasedVersions.set(family, released.id);
      const [set] = await dataSource.query(
        `select s.id, count(i.id)::int as photos from reference_sets s join reference_images i on i.set_id = s.id where s.part_type = $1 group by s.id order by photos desc limit 1`,
        [partTypeCode(family)],
      );
      plant.referenceSets.set(family, { id: set.id, photos: set.photos });
      const photos: Buffer[] = [];
      for await (const photo of generateDataset({ count: perFamily, seed: 7300 + FAMILY_NAMES.indexOf(family), families: [family], sizes: [DEMO_FRAME] })) photos.push(photo.buffer);
      plant.photos.set(family, photos);
    }
    return plant;
  } finally {
    await pool.destroy();
    await dataSource.destroy();
  }
}

interface Node {
  name: string;
  child: ChildProcess;
  url?: string;
  imageDir: string;
  logFile: string;
}

function startNode(name: string, role: 'api' | 'worker', port: number, env: NodeJS.ProcessEnv, workDir: string): Node {
  const dataDir = path.join(workDir, name);
  fs.mkdirSync(dataDir, { recursive: true });
  const log = fs.openSync(path.join(workDir, `${name}.log`), 'a');
  const imageDir = path.join(dataDir, 'images');
  // Started as npm start starts the server: with the worker pool's node flags.
  const child = spawn(process.execPath, [...POOL_PROCESS_NODE_FLAGS, '-r', 'ts-node/register/transpile-only', path.join(ROOT, 'server', 'main.ts')], {
    cwd: ROOT,
    stdio: ['ignore', log, log],
    env: {
      ...process.env,
      ...env,
      TS_NODE_PROJECT: path.join(ROOT, 'server', 'tsconfig.json'),
      // The process's name on its PostgreSQL connections (node-postgres reads PGAPPNAME), so the proof can see which process holds what.
      PGAPPNAME: name,
      KW_ROLE: role,
      PORT: String(port),
      KW_DATA_DIR: dataDir,
      KW_IMAGE_DIR: imageDir,
    },
  });
  return { name, child, url: role === 'api' ? `http://127.0.0.1:${port}` : undefined, imageDir, logFile: path.join(workDir, `${name}.log`) };
}

async function waitUntil(what: string, probe: () => Promise<boolean>, timeoutMs: number, nodes: Node[] = []): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const stopped = nodes.find((n) => n.child.exitCode !== null);
    if (stopped) {
      const tail = fs.readFileSync(stopped.logFile, 'utf8').trim().split('\n').slice(-5).join('\n');
      throw new Error(`${stopped.name} stopped (exit ${stopped.child.exitCode}) while waiting for ${what}; its log ends:\n${tail}`);
    }
    if (await probe().catch(() => false)) return;
    if (Date.now() > deadline) throw new Error(`gave up waiting for ${what}`);
    await sleep(200);
  }
}

async function stopNodes(nodes: Node[]): Promise<void> {
  await Promise.all(
    nodes.map(async (node) => {
      if (node.child.exitCode !== null || node.child.signalCode !== null) return;
      const exited = new Promise<void>((resolve) => node.child.once('exit', () => resolve()));
      node.child.kill('SIGTERM');
      const timer = setTimeout(() => node.child.kill('SIGKILL'), 15_000);
      await exited;
      clearTimeout(timer);
    }),
  );
}

async function signIn(url: string, username: string): Promise<string> {
  const response = await fetch(`${url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username, password: DEMO_PASSWORD }) });
  if (!response.ok) throw new Error(`sign-in as ${username} answered ${response.status}`);
  return ((await response.json()) as { token: string }).token;
}

interface Upload {
  key: string;
  family: FamilyName;
  photo: Buffer;
  node: 0 | 1;
}

interface Answer {
  key: string;
  node: 0 | 1;
  status: number;
  inspectionId: string | null;
  ms: number;
  shed: number;
}

/** One operator's upload as the app sends it: sent again after Retry-After when the node sheds load. */
async function inspect(apiUrls: string[], token: string, plant: Plant, upload: Upload): Promise<Answer> {
  let shed = 0;
  const started = performance.now();
  for (;;) {
    const form = new FormData();
    form.append('stationId', plant.stations.get(upload.family)!);
    form.append('ruleVersionId', plant.releasedVersions.get(upload.family)!);
    form.append('idempotencyKey', upload.key);
    form.append('photo', new Blob([new Uint8Array(upload.photo)]), `${upload.key}.png`);
    const response = await fetch(`${apiUrls[upload.node]}/api/inspections`, { method: 'POST', headers: { authorization: `Bearer ${token}` }, body: form });
    const body = (await response.json()) as { id?: string };
    if (response.status === 503) {
      shed += 1;
      await sleep(1000 * Number(response.headers.get('retry-after') ?? 1));
      continue;
    }
    return { key: upload.key, node: upload.node, status: response.status, inspectionId: body.id ?? null, ms: performance.now() - started, shed };
  }
}

async function inParallel<T, R>(items: T[], limit: number, work: (item: T) => Promise<R>): Promise<R[]> {
  const results: R[] = new Array(items.length);
  let next = 0;
  await Promise.all(
    Array.from({ length: Math.min(limit, items.length) }, async () => {
      while (next < items.length) {
        const i = next++;
        results[i] = await work(items[i]);
      }
    }),
  );
  return results;
}

function countFiles(dir: string): number {
  if (!fs.existsSync(dir)) return 0;
  return fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((e) => e.isFile()).length;
}

export async function runScaleProof(options: ScaleProofOptions): Promise<ScaleProofReport> {
  const log = (line: string) => {
    if (options.verbose) process.stderr.write(`[scale-proof] ${line}\n`);
  };
  const workDir = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-scale-'));
  const s3 = await startFakeS3({ port: 0, dir: path.join(workDir, 's3'), bucket: BUCKET });
  const smtp = await startFakeSmtp({ port: 0 });
  // Every process reaches the bucket with the SDK's usual credentials, as on real machines.
  process.env.AWS_ACCESS_KEY_ID = FAKE_S3_CREDENTIALS.accessKeyId;
  process.env.AWS_SECRET_ACCESS_KEY = FAKE_S3_CREDENTIALS.secretAccessKey;
  const shared: NodeJS.ProcessEnv = {
    DATABASE_URL: options.databaseUrl,
    KW_JWT_SECRET: crypto.randomBytes(32).toString('base64url'),
    KW_STORAGE: 's3',
    KW_S3_ENDPOINT: s3.endpoint,
    KW_S3_BUCKET: BUCKET,
    KW_SMTP_HOST: '127.0.0.1',
    KW_SMTP_PORT: String(smtp.port),
    KW_WEB_DIR: path.join(workDir, 'no-web-app'),
    KW_VISION_THREADS: '1',
    KW_UPLOADS_PER_MINUTE: '100000',
    KW_LOG_LEVEL: 'warn',
  };
  const config = loadConfig({ ...shared, KW_DATA_DIR: path.join(workDir, 'seed'), KW_IMAGE_DIR: path.join(workDir, 'seed', 'images') });
  const nodes: Node[] = [];
  const failures: string[] = [];
  const db = makeDataSource(options.databaseUrl, { poolSize: 2 });
  let finished = false;
  try {
    log('seeding the demo users, rules and reference sets into the bucket');
    const plant = await preparePlant(config, options, log);
    await db.initialize();

    log('starting two API processes');
    const apis = options.apiPorts.map((port, i) => startNode(`api-${i + 1}`, 'api', port, shared, workDir));
    nodes.push(...apis);
    const apiUrls = apis.map((a) => a.url!);
    for (const url of apiUrls) await waitUntil(`${url} to answer`, async () => (await fetch(`${url}/api/health`)).ok, 180_000, nodes);
    const operator = await signIn(apiUrls[0], 'operator');
    const engineer = await signIn(apiUrls[1], 'engineer');

    const startTrial = async (i: number): Promise<string> => {
      const family = FAMILY_NAMES[i % FAMILY_NAMES.length];
      const response = await fetch(`${apiUrls[i % 2]}/api/trials`, {
        method: 'POST',
        headers: { authorization: `Bearer ${engineer}`, 'content-type': 'application/json' },
        // The demo rules measure in mm: the trial takes the station's calibration.
        body: JSON.stringify({ ruleVersionId: plant.releasedVersions.get(family), referenceSetId: plant.referenceSets.get(family)!.id, stationId: plant.stations.get(family) }),
      });
      if (response.status !== 202) throw new Error(`starting a trial answered ${response.status}: ${await response.text()}`);
      return ((await response.json()) as { id: string }).id;
    };
    log('queueing a trial while only the API processes run');
    const trialIds: string[] = [await startTrial(0)];
    // pg-boss workers look for jobs every second: three seconds without a taker shows that no API process takes any.
    await sleep(3000);
    const [{ state: probeState }] = await db.query('select state from trials where id = $1', [trialIds[0]]);

    log('starting two worker processes');
    const workers = [1, 2].map((i) => startNode(`worker-${i}`, 'worker', options.apiPorts[1] + i, shared, workDir));
    nodes.push(...workers);
    for (const worker of workers) await waitUntil(`${worker.name} to start`, async () => fs.readFileSync(worker.logFile, 'utf8').includes('is running'), 180_000, nodes);
    const workersReady = performance.now();
    let mostRunning = 0;
    const claimHolders = new Set<string>();
    const watch = setInterval(() => {
      Promise.all([
        db.query(`select count(*)::int as running from trials where id = any($1) and state = 'running'`, [trialIds]),
        db.query(
          `select distinct a.application_name as holder
             from pg_locks l join pg_stat_activity a on a.pid = l.pid join trials t on t.id = any($1)
            where l.locktype = 'advisory' and l.granted and l.objsubid = 1
              and ((l.classid::bigint << 32) | l.objid::bigint) = ('x' || substr(md5('kernwright.trial:' || t.id), 1, 16))::bit(64)::bigint`,
          [trialIds],
        ),
      ])
        .then(([[{ running }], holders]) => {
          mostRunning = Math.max(mostRunning, running);
          for (const { holder } of holders as { holder: string }[]) claimHolders.add(holder);
        })
        .catch(() => undefined);
    }, 100);

    log(`queueing ${options.trials - 1} more trials through both API processes, and sending ${options.inspections} inspections to both`);
    for (let i = 1; i < options.trials; i++) trialIds.push(await startTrial(i));
    const run = crypto.randomBytes(3).toString('hex');
    const uploads: Upload[] = [];
    let resent = 0;
    for (let i = 0; i < options.inspections; i++) {
      const family = FAMILY_NAMES[i % FAMILY_NAMES.length];
      const photos = plant.photos.get(family)!;
      const upload: Upload = { key: `scale-${run}-${i}`, family, photo: photos[Math.floor(i / FAMILY_NAMES.length) % photos.length], node: (i % 2) as 0 | 1 };
      uploads.push(upload);
      // Every fourth photo is sent again at once to the other process, as a client whose answer was lost would.
      if (i % 4 === 0) {
        uploads.push({ ...upload, node: (1 - upload.node) as 0 | 1 });
        resent += 1;
      }
    }
    const loadAtStart = os.loadavg()[0];
    const burstStarted = performance.now();
    const answers = await inParallel(uploads, options.concurrency, (u) => inspect(apiUrls, operator, plant, u));
    const burstSeconds = (performance.now() - burstStarted) / 1000;

    log('waiting for the trials');
    await waitUntil(
      'every trial to finish',
      async () => (await db.query(`select count(*)::int as open from trials where id = any($1) and state in ('queued', 'running')`, [trialIds]))[0].open === 0,
      600_000,
      nodes,
    );
    const trialSeconds = (performance.now() - workersReady) / 1000;
    clearInterval(watch);

    // What was stored.
    const keys = uploads.filter((u, i) => uploads.findIndex((v) => v.key === u.key) === i).map((u) => u.key);
    const [stored] = await db.query(`select count(*)::int as rows, count(distinct idempotency_key)::int as keys from inspections where idempotency_key like $1`, [`scale-${run}-%`]);
    const byKey = new Map<string, Answer[]>();
    for (const a of answers) byKey.set(a.key, [...(byKey.get(a.key) ?? []), a]);
    const oneInspection = keys.filter((k) => {
      const ids = new Set(byKey.get(k)!.map((a) => a.inspectionId));
      return ids.size === 1 && !ids.has(null) && byKey.get(k)!.every((a) => a.status === 200 || a.status === 201);
    }).length;
    const createdOnce = keys.filter((k) => byKey.get(k)!.filter((a) => a.status === 201).length === 1).length;
    const hashes: { image_hash: string }[] = await db.query(`select image_hash from inspections where idempotency_key like $1`, [`scale-${run}-%`]);
    const bucket = openImageStore(config);
    const inBucket = (await inParallel(hashes, 8, (h) => bucket.has(h.image_hash))).filter(Boolean).length;

    const trialRows: { id: string; state: string; error: string | null; processed: number; total: number; set_photos: number; rows: number; distinct_images: number }[] = await db.query(
      `select t.id, t.state, t.error, t.processed, t.total,
              (select count(*)::int from reference_images i where i.set_id = t.reference_set_id) as set_photos,
              (select count(*)::int from trial_results r where r.trial_id = t.id) as rows,
              (select count(distinct r.image_id)::int from trial_results r where r.trial_id = t.id) as distinct_images
         from trials t where t.id = any($1)`,
      [trialIds],
    );
    const photos = trialRows.reduce((n, t) => n + t.set_photos, 0);
    const latencies = answers.map((a) => a.ms).sort((a, b) => a - b);
    const report: ScaleProofReport = {
      inspections: {
        sent: answers.length,
        resentToOtherNode: resent,
        stored: stored.rows,
        distinctKeys: stored.keys,
        keysAnsweredWithOneInspection: oneInspection,
        keysCreatedOnce: createdOnce,
        photosInBucket: inBucket,
        answeredPerNode: [answers.filter((a) => a.node === 0).length, answers.filter((a) => a.node === 1).length],
        shed: answers.reduce((n, a) => n + a.shed, 0),
        burstSeconds,
        perSecond: answers.length / burstSeconds,
        latencyMs: { p50: percentile(latencies, 50), p95: percentile(latencies, 95), p99: percentile(latencies, 99) },
      },
      trials: {
        started: trialIds.length,
        stayedQueuedWithoutWorkers: probeState === 'queued',
        done: trialRows.filter((t) => t.state === 'done').length,
        photos,
        resultRows: trialRows.reduce((n, t) => n + t.rows, 0),
        distinctResults: trialRows.reduce((n, t) => n + t.distinct_images, 0),
        everyPhotoCountedOnce: trialRows.every((t) => t.processed === t.set_photos && t.total === t.set_photos && t.rows === t.set_photos && t.distinct_images === t.set_photos),
        mostRunningAtOnce: mostRunning,
        workersThatRanTrials: [...claimHolders].sort(),
        seconds: trialSeconds,
        photosPerSecond: photos / trialSeconds,
      },
      localImageFiles: nodes.reduce((n, node) => n + countFiles(node.imageDir), 0),
      loadAverage: [loadAtStart, os.loadavg()[0]],
      failures,
    };
    const expect = (ok: boolean, what: string) => {
      if (!ok) failures.push(what);
    };
    expect(report.inspections.stored === options.inspections && report.inspections.distinctKeys === options.inspections, `${options.inspections} inspections stored once each`);
    expect(oneInspection === keys.length, 'every answer for a key names the same stored inspection');
    expect(createdOnce === keys.length, 'every key created exactly once (201), repeats answered 200');
    expect(inBucket === hashes.length, "every inspection's photo is in the bucket");
    expect(probeState === 'queued', 'API processes ran no trial');
    expect(report.trials.done === trialIds.length, `every trial done${trialRows.filter((t) => t.error).map((t) => ` (${t.error})`).join('')}`);
    expect(report.trials.everyPhotoCountedOnce, 'every reference photo counted once in every trial');
    expect(report.trials.workersThatRanTrials.length === workers.length, 'both workers ran trials');
    expect(report.localImageFiles === 0, 'no image in any local folder');
    finished = true;
    return report;
  } finally {
    await stopNodes(nodes);
    if (db.isInitialized) await db.destroy();
    await smtp.close();
    await s3.close();
    if (finished && failures.length === 0) fs.rmSync(workDir, { recursive: true, force: true });
    else process.stderr.write(`[scale-proof] the processes' logs are kept in ${workDir}\n`);
  }
}

function printReport(report: ScaleProofReport, options: ScaleProofOptions): void {
  const i = report.inspections;
  const t = report.trials;
  const ms = (v: number) => `${v.toFixed(0)} ms`;
  const lines = [
    `Machine: ${os.cpus().length} cores, ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB, ${os.cpus()[0]?.model ?? 'unknown CPU'}; 2 API + 2 worker processes, one vision thread each`,
    `  1-minute load average ${report.loadAverage[0].toFixed(1)} when the burst started, ${report.loadAverage[1].toFixed(1)} at the end (other work on the machine included)`,
    `Inspections: ${i.sent} uploads (${i.resentToOtherNode} keys sent twice, to both API processes) of ${DEMO_FRAME.width}×${DEMO_FRAME.height} photos, ${options.concurrency} in flight`,
    `  stored ${i.stored} (distinct keys ${i.distinctKeys}); one inspection per key in every answer: ${i.keysAnsweredWithOneInspection}; created once: ${i.keysCreatedOnce}; photos in the bucket: ${i.photosInBucket}`,
    `  answered per API process: ${i.answeredPerNode.join(' / ')}; shed with 503 and sent again: ${i.shed}`,
    `  ${i.perSecond.toFixed(1)} uploads answered/s (${(i.distinctKeys / i.burstSeconds).toFixed(1)} new inspections/s) over ${i.burstSeconds.toFixed(1)} s; latency p50 ${ms(i.latencyMs.p50)}, p95 ${ms(i.latencyMs.p95)}, p99 ${ms(i.latencyMs.p99)} (trials running at the same time)`,
    `Trials: ${t.started} queued through the API processes; the one queued before any worker ran was still queued 3 s later: ${t.stayedQueuedWithoutWorkers}`,
    `  done ${t.done}; ${t.photos} reference photos, ${t.resultRows} results (${t.distinctResults} distinct); each counted once: ${t.everyPhotoCountedOnce}`,
    `  run by ${t.workersThatRanTrials.join(' and ')}, at most ${t.mostRunningAtOnce} at once; ${t.seconds.toFixed(1)} s from both workers ready to the last result (${t.photosPerSecond.toFixed(1)} photos/s, with the burst alongside)`,
    `Files in local image folders: ${report.localImageFiles}`,
    report.failures.length ? `FAILED: ${report.failures.join('; ')}` : 'All checks passed.',
  ];
  process.stdout.write(lines.join('\n') + '\n');
}

async function main(): Promise<void> {
  const server = (process.env.KW_SCALE_PG_URL ?? 'postgres://postgres@127.0.0.1:54329').replace(/\/$/, '');
  const port = setting('KW_SCALE_PORT', 8100);
  const name = `kw_scale_${crypto.randomBytes(4).toString('hex')}`;
  const admin = async (sql: string) => {
    const client = new Client({ connectionString: `${server}/postgres` });
    await client.connect();
    try {
      await client.query(sql);
    } finally {
      await client.end();
    }
  };
  await admin(`create database "${name}"`);
  const options: ScaleProofOptions = {
    databaseUrl: `${server}/${name}`,
    inspections: setting('KW_SCALE_INSPECTIONS', 240),
    trials: setting('KW_SCALE_TRIALS', 6),
    referencePhotos: setting('KW_SCALE_REFERENCE_PHOTOS', 24),
    concurrency: setting('KW_SCALE_CONCURRENCY', 8),
    apiPorts: [port, port + 1],
    verbose: true,
  };
  try {
    const report = await runScaleProof(options);
    printReport(report, options);
    process.exitCode = report.failures.length ? 1 : 0;
  } finally {
    await admin(`drop database if exists "${name}" with (force)`);
  }
}

if (require.main === module) {
  main().catch((err) => {
    process.stderr.write(`scale proof failed: ${err instanceof Error ? err.stack ?? err.message : String(err)}\n`);
    process.exit(1);
  });
}
