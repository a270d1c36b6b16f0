// Benchmark of the operator's path: photo received → verdict, through the real HTTP route.
// A throw-away database gets the demo plant's users and rules (the washer's released 4-step rule)
// and a station calibrated for 5 MP photos; the real server (server/main.ts, its worker pool with one
// thread per core) runs in a child process on loopback; this process photographs generated washers
// at 2592x1944, encodes them as JPEG with sharp, and uploads them with POST /api/inspections:
// first one station after another (sequential), then 2 and 4 stations at once. Prints p50/p95/p99 of
// the time from sending the photo to receiving the verdict, and the server's own split per phase
// (its Server-Timing header). Figures only: nothing here passes or fails on time.
//
// Run: KW_BENCH_PG_URL=postgres://postgres@127.0.0.1:54339 npx ts-node --transpile-only -P server/tsconfig.json tests/bench/inspection.ts
// Settings: KW_BENCH_SEQUENTIAL (100 uploads), KW_BENCH_PER_STATION (25 uploads per concurrent station),
// KW_BENCH_CONCURRENCY (2,4), KW_BENCH_PHOTOS (12 distinct photos), KW_BENCH_KEEP=1 keeps the database and log.
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { Client } from 'pg';
import { RuleEntity } from '../../server/components/rules/entities';
import { makeDataSource } from '../../server/db/data-source';
import { generateDataset, PART_FAMILIES } from '../../server/demo';
import { seedDemoPlant } from '../../server/seed/demo-plant';
import { DEMO_PASSWORD, seedDemoUsers } from '../../server/seed/demo-users';
import { MemoizingRunner } from '../../server/seed/memo-runner';
import { UserEntity } from '../../server/components/auth/entities';
import { createServices } from '../../server/services';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { VisionPool } from '../../server/vision/pool';
import { testConfig } from '../support/app';
import { formatRow, mean, parseServerTiming, percentile, type TimingMetric } from './latency';

const ROOT = path.join(__dirname, '..', '..');
const FRAME = { width: 2592, height: 1944 };
const RULE_NAME = 'Washer rim and bore check';

function setting(name: string, fallback: number): number {
  const value = Number(process.env[name] ?? fallback);
  if (!Number.isInteger(value) || value <= 0) throw new Error(`${name} must be a positive whole number`);
  return value;
}

const SEQUENTIAL = setting('KW_BENCH_SEQUENTIAL', 100);
const PER_STATION = setting('KW_BENCH_PER_STATION', 25);
const PHOTOS = setting('KW_BENCH_PHOTOS', 12);
const CONCURRENCY = (process.env.KW_BENCH_CONCURRENCY ?? '2,4').split(',').map(Number).filter((n) => n > 0);
const WARM_UP = 6;

const PG_URL = (process.env.KW_BENCH_PG_URL ?? process.env.KW_TEST_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54339').replace(/\/$/, '');

async function admin(sql: string): Promise<void> {
  const client = new Client({ connectionString: `${PG_URL}/postgres` });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

interface Plant {
  ruleVersionId: string;
  stationIds: string[];
}

/** Migrates the database, seeds the demo users and rules, and adds stations calibrated for 5 MP washers. */
async function preparePlant(databaseUrl: string, imageDir: string, stations: number): Promise<Plant> {
  const dataSource = makeDataSource(databaseUrl, { poolSize: 4 });
  await dataSource.initialize();
  const pool = new VisionPool({ kernels: await loadKernelLibrary(), threads: 2 });
  try {
    await dataSource.runMigrations({ transaction: 'each' });
    await seedDemoUsers(dataSource);
    const services = createServices({ config: testConfig({ databaseUrl, imageDir }), dataSource, pool: new MemoizingRunner(pool), jobs: null });
    await seedDemoPlant(services, { referencePhotos: 6, historyDays: 0 });
    const supervisor = await dataSource.getRepository(UserEntity).findOneByOrFail({ username: 'supervisor' });
    const line = await services.stations.createLine(supervisor, { name: 'Benchmark line' });
    const mmPerPx = PART_FAMILIES.washer.fieldOfViewMm / FRAME.width;
    const stationIds: string[] = [];
    for (let i = 1; i <= stations; i++) {
      const station = await services.stations.createStation(supervisor, { lineId: line.id, name: `5 MP station ${i}`, cameraNote: `${FRAME.width}×${FRAME.height} JPEG` });
      await services.stations.calibrate(supervisor, station.id, { referenceLengthMm: 20, distancePx: 20 / mmPerPx });
      stationIds.push(station.id);
    }
    const rule = await dataSource.getRepository(RuleEntity).findOneByOrFail({ name: RULE_NAME });
    const released = (await services.rules.detail(rule.id)).releasedVersion;
    if (!released) throw new Error(`${RULE_NAME} has no released version`);
    return { ruleVersionId: released.id, stationIds };
  } finally {
    await pool.destroy();
    await dataSource.destroy();
  }
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const port = (server.address() as net.AddressInfo).port;
      server.close(() => resolve(port));
    });
  });
}

/** server/main.ts in a child process, API only, mail to a closed port (nothing here sends any). */
async function startServer(databaseUrl: string, dataDir: string, logFile: string): Promise<{ url: string; child: ChildProcess }> {
  const port = await freePort();
  const log = fs.openSync(logFile, 'a');
  const child = spawn(process.execPath, ['-r', 'ts-node/register/transpile-only', path.join(ROOT, 'server', 'main.ts')], {
    cwd: ROOT,
    stdio: ['ignore', log, log],
    env: {
      ...process.env,
      TS_NODE_PROJECT: path.join(ROOT, 'server', 'tsconfig.json'),
      PORT: String(port),
      DATABASE_URL: databaseUrl,
      KW_DATA_DIR: dataDir,
      KW_WEB_DIR: path.join(dataDir, 'no-web-app'),
      KW_SMTP_HOST: '127.0.0.1',
      KW_SMTP_PORT: '9',
      // One operator's token uploads for every station here: lift the per-person limit, not the server's own.
      KW_UPLOADS_PER_MINUTE: process.env.KW_UPLOADS_PER_MINUTE ?? '100000',
    },
  });
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 120_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`the server stopped (exit ${child.exitCode}); see ${logFile}`);
    try {
      if ((await fetch(`${url}/api/health`)).ok) return { url, child };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`the server did not answer within 120 s; see ${logFile}`);
}

interface GeneratedPhoto {
  jpeg: Buffer;
  label: string;
}

async function photographWashers(count: number): Promise<GeneratedPhoto[]> {
  const photos: GeneratedPhoto[] = [];
  for await (const photo of generateDataset({ count, seed: 2592, families: ['washer'], sizes: [FRAME], defectShare: 1 / 3, retakeShare: 0, sixteenBitShare: 0, jpegShare: 1 })) {
    photos.push({ jpeg: photo.buffer, label: photo.truth.label });
  }
  return photos;
}

/** The same photo with a JPEG comment naming the upload, so that every upload is stored as a new image (content-addressed store). */
function uniqueJpeg(jpeg: Buffer, tag: string): Buffer {
  const text = Buffer.from(tag, 'latin1');
  const segment = Buffer.from([0xff, 0xfe, ((text.length + 2) >> 8) & 0xff, (text.length + 2) & 0xff]);
  return Buffer.concat([jpeg.subarray(0, 2), segment, text, jpeg.subarray(2)]);
}

interface Sample {
  ms: number;
  verdict: string;
  phases: TimingMetric[];
}

class Uploader {
  private counter = 0;
  constructor(
    private readonly url: string,
    private readonly token: string,
    private readonly ruleVersionId: string,
    private readonly photos: GeneratedPhoto[],
  ) {}

  async inspect(stationId: string): Promise<Sample> {
    const n = this.counter++;
    const photo = this.photos[n % this.photos.length];
    const key = `bench-${crypto.randomUUID()}`;
    const form = new FormData();
    form.append('stationId', stationId);
    form.append('ruleVersionId', this.ruleVersionId);
    form.append('idempotencyKey', key);
    form.append('photo', new Blob([new Uint8Array(uniqueJpeg(photo.jpeg, key))], { type: 'image/jpeg' }), `part-${n}.jpg`);
    const started = performance.now();
    const response = await fetch(`${this.url}/api/inspections`, { method: 'POST', headers: { authorization: `Bearer ${this.token}` }, body: form });
    const body = (await response.json()) as { verdict?: string; error?: { message: string } };
    const ms = performance.now() - started;
    if (response.status !== 201) throw new Error(`upload ${n} answered ${response.status}: ${body.error?.message}`);
    return { ms, verdict: body.verdict!, phases: parseServerTiming(response.headers.get('server-timing')) };
  }
}

async function signIn(url: string): Promise<string> {
  const response = await fetch(`${url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: 'operator', password: DEMO_PASSWORD }) });
  if (!response.ok) throw new Error(`sign-in failed: ${response.status}`);
  return ((await response.json()) as { token: string }).token;
}

interface RunResult {
  label: string;
  samples: Sample[];
  wallMs: number;
  /** CPU time of the server process, all its threads, over the run. */
  serverCpuMs: number;
}

const CLOCK_TICKS_PER_SECOND = Number(execFileSync('getconf', ['CLK_TCK']).toString().trim()) || 100;

/** User + system CPU time of a process and all its threads (Linux /proc/PID/stat, fields 14 and 15). */
function processCpuMs(pid: number): number {
  const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / CLOCK_TICKS_PER_SECOND;
}

async function runStations(label: string, uploader: Uploader, serverPid: number, stationIds: string[], perStation: number): Promise<RunResult> {
  const samples: Sample[] = [];
  const cpuBefore = processCpuMs(serverPid);
  const started = performance.now();
  await Promise.all(
    stationIds.map(async (stationId) => {
      for (let i = 0; i < perStation; i++) samples.push(await uploader.inspect(stationId));
    }),
  );
  return { label, samples, wallMs: performance.now() - started, serverCpuMs: processCpuMs(serverPid) - cpuBefore };
}

const PHASES = ['receive', 'lookup', 'decode', 'pipeline', 'engine', 'store', 'evidence', 'database', 'reply'];

function phaseMs(sample: Sample, name: string): number | undefined {
  return sample.phases.find((p) => p.name === name)?.ms;
}

function report(run: RunResult): void {
  const times = run.samples.map((s) => s.ms);
  const verdicts = new Map<string, number>();
  for (const s of run.samples) verdicts.set(s.verdict, (verdicts.get(s.verdict) ?? 0) + 1);
  console.log(`\n${run.label}: ${run.samples.length} inspections in ${(run.wallMs / 1000).toFixed(1)} s, ${((run.samples.length * 1000) / run.wallMs).toFixed(2)} per second; verdicts ${[...verdicts].map(([v, n]) => `${v} ${n}`).join(', ')}`);
  console.log(`server CPU time (all its threads): ${(run.serverCpuMs / run.samples.length).toFixed(0)} ms per inspection`);
  console.log(formatRow('', [], 28) + ['p50', 'p95', 'p99', 'mean', 'max'].map((h) => h.padStart(9)).join(''));
  console.log(formatRow('photo sent → verdict (ms)', [percentile(times, 50), percentile(times, 95), percentile(times, 99), mean(times), Math.max(...times)]));
  console.log('  server phases (ms), from Server-Timing:');
  const phaseNames = [...PHASES, ...(run.samples[0]?.phases.filter((p) => p.name.startsWith('step-')).map((p) => p.name) ?? [])];
  for (const name of phaseNames) {
    const values = run.samples.map((s) => phaseMs(s, name)).filter((v): v is number => v !== undefined);
    if (values.length === 0) continue;
    const description = run.samples[0].phases.find((p) => p.name === name)?.description;
    const label = name.startsWith('step-') ? `    ${name} ${description ?? ''}` : `  ${name}${values.length < run.samples.length ? ` (${values.length}×)` : ''}`;
    console.log(formatRow(label, [percentile(values, 50), percentile(values, 95), percentile(values, 99), mean(values), Math.max(...values)]));
  }
  const accounted = run.samples.map((s) => PHASES.filter((p) => p !== 'engine').reduce((sum, p) => sum + (phaseMs(s, p) ?? 0), 0));
  const outside = run.samples.map((s, i) => s.ms - accounted[i]);
  console.log(formatRow('  outside the route', [percentile(outside, 50), percentile(outside, 95), percentile(outside, 99), mean(outside), Math.max(...outside)]));
}

async function main(): Promise<void> {
  const cores = os.availableParallelism?.() ?? os.cpus().length;
  console.log(`Inspection benchmark: ${FRAME.width}×${FRAME.height} JPEG, rule "${RULE_NAME}" (4 steps), ${cores} cores (${os.cpus()[0]?.model ?? 'unknown CPU'}), load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
  const name = `kw_bench_${crypto.randomBytes(5).toString('hex')}`;
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-bench-inspection-'));
  const databaseUrl = `${PG_URL}/${name}`;
  const logFile = path.join(dataDir, 'server.log');
  const keep = process.env.KW_BENCH_KEEP === '1';
  let server: ChildProcess | null = null;
  await admin(`create database "${name}"`);
  try {
    let t0 = performance.now();
    const plant = await preparePlant(databaseUrl, path.join(dataDir, 'images'), Math.max(1, ...CONCURRENCY));
    console.log(`database ${name} migrated and seeded in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
    t0 = performance.now();
    const photos = await photographWashers(PHOTOS);
    const sizes = photos.map((p) => p.jpeg.length / 1e6);
    console.log(`${photos.length} photos generated in ${((performance.now() - t0) / 1000).toFixed(1)} s (${photos.filter((p) => p.label === 'defective').length} defective), JPEG ${Math.min(...sizes).toFixed(1)}–${Math.max(...sizes).toFixed(1)} MB`);
    const started = await startServer(databaseUrl, dataDir, logFile);
    server = started.child;
    const uploader = new Uploader(started.url, await signIn(started.url), plant.ruleVersionId, photos);
    for (let i = 0; i < WARM_UP; i++) await uploader.inspect(plant.stationIds[0]);

    const pid = server.pid!;
    report(await runStations('Sequential, one station', uploader, pid, [plant.stationIds[0]], SEQUENTIAL));
    for (const stations of CONCURRENCY) {
      if (stations > plant.stationIds.length) continue;
      report(await runStations(`${stations} stations at once`, uploader, pid, plant.stationIds.slice(0, stations), PER_STATION));
    }
    console.log('\nreceive: the upload read by the route (multipart); pipeline includes the hand-over to a worker thread;');
    console.log('engine: its part inside the worker; outside the route: sign-in check, HTTP and the client on loopback.');
    console.log(`load average at the end: ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
  } finally {
    if (server && server.exitCode === null) {
      const exited = new Promise((r) => server!.once('exit', r));
      server.kill('SIGTERM');
      await exited;
    }
    if (keep) console.log(`kept: database ${name}, data and server log in ${dataDir}`);
    else {
      await admin(`drop database if exists "${name}" with (force)`);
      fs.rmSync(dataDir, { recursive: true, force: true });
    }
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.stack : err);
  process.exit(1);
});
