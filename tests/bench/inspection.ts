// Benchmark of the operator's path: photo received → verdict, through the real HTTP route.
// A throw-away database gets the demo plant's users and rules (the washer's released 4-step rule)
// and a station calibrated for 5 MP photos; the real server (server/main.ts built, its worker pool with one
// thread per core) runs in a child process on loopback; this process photographs generated washers
// at 2592x1944, encodes them as JPEG with sharp, and uploads them with POST /api/inspections:
// first one station after another (sequential), then 2 and 4 stations at once. Prints p50/p95/p99 of
// the time from sending the photo to receiving the verdict, and the server's own split per phase
// (its Server-Timing header). Figures only: nothing here passes or fails on time.
//
// Run: KW_BENCH_PG_URL=postgres://postgres@127.0.0.1:54339 npm run bench:inspection
// Settings: KW_BENCH_SEQUENTIAL (100 uploads), KW_BENCH_PER_STATION (25 uploads per concurrent station),
// KW_BENCH_CONCURRENCY (2,4), KW_BENCH_PHOTOS (12 distinct photos), KW_BENCH_KEEP=1 keeps the database and log.
import type { ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { formatRow, mean, parseServerTiming, percentile, type TimingMetric } from './latency';
import { admin, FRAME, photographWashers, PG_URL, preparePlant, processCpuMs, RULE_NAME, signIn, startServer, uniqueJpeg, type GeneratedPhoto } from './plant-server';

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

interface RunResult {
  label: string;
  samples: Sample[];
  wallMs: number;
  /** CPU time of the server process, all its threads, over the run. */
  serverCpuMs: number;
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
