// Load test of the inspection route: simulated stations upload real 5 MP JPEGs of generated washers
// to the real server (server/main.ts in a child process on loopback, its worker pool) as fast as
// the server answers, for a bounded time; first a line's worth of stations, then an overload. Prints
// throughput, p50/p95/p99 of the judged uploads, how many were shed (503 with Retry-After), and the
// server process's resident memory (sampled, and the kernel's peak). Figures only, no pass or fail.
//
// Run: KW_BENCH_PG_URL=postgres://postgres@127.0.0.1:54339 npm run bench:load
// Settings: KW_LOAD_SECONDS (60 per phase), KW_LOAD_STATIONS (normal phase: 4), KW_LOAD_OVERLOAD (overload phase: 24),
// KW_LOAD_IN_FLIGHT (the server's KW_MAX_INSPECTIONS_IN_FLIGHT: 8), KW_LOAD_PHOTOS (8 distinct photos).
import type { ChildProcess } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { mean, percentile } from './latency';
import { admin, FRAME, photographWashers, PG_URL, preparePlant, processCpuMs, RULE_NAME, signIn, startServer, uniqueJpeg, type GeneratedPhoto } from './plant-server';

function setting(name: string, fallback: number): number {
  const value = Number(process.env[name] ?? fallback);
  if (!Number.isInteger(value) || value <= 0) throw new Error(`${name} must be a positive whole number`);
  return value;
}

const SECONDS = setting('KW_LOAD_SECONDS', 60);
const STATIONS = setting('KW_LOAD_STATIONS', 4);
const OVERLOAD = setting('KW_LOAD_OVERLOAD', 24);
const IN_FLIGHT = setting('KW_LOAD_IN_FLIGHT', 8);
const PHOTOS = setting('KW_LOAD_PHOTOS', 8);

/** Resident memory of a process now and its peak so far (Linux /proc/PID/status VmRSS, VmHWM), in MB. */
function residentMb(pid: number): { now: number; peak: number } {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = (field: string) => Number(new RegExp(`^${field}:\\s+(\\d+)`, 'm').exec(status)?.[1] ?? NaN);
  return { now: kb('VmRSS') / 1024, peak: kb('VmHWM') / 1024 };
}

interface Outcome {
  status: number;
  ms: number;
  retryAfter: string | null;
}

async function upload(url: string, token: string, ruleVersionId: string, stationId: string, photo: GeneratedPhoto): Promise<Outcome> {
  const key = `load-${crypto.randomUUID()}`;
  const form = new FormData();
  form.append('stationId', stationId);
  form.append('ruleVersionId', ruleVersionId);
  form.append('idempotencyKey', key);
  form.append('photo', new Blob([new Uint8Array(uniqueJpeg(photo.jpeg, key))], { type: 'image/jpeg' }), 'part.jpg');
  const started = performance.now();
  try {
    const response = await fetch(`${url}/api/inspections`, { method: 'POST', headers: { authorization: `Bearer ${token}` }, body: form });
    await response.arrayBuffer();
    return { status: response.status, ms: performance.now() - started, retryAfter: response.headers.get('retry-after') };
  } catch {
    return { status: 0, ms: performance.now() - started, retryAfter: null };
  }
}

async function phase(label: string, stations: number, run: { url: string; token: string; ruleVersionId: string; stationIds: string[]; photos: GeneratedPhoto[]; pid: number }): Promise<void> {
  const outcomes: Outcome[] = [];
  const memory: number[] = [];
  const sampler = setInterval(() => memory.push(residentMb(run.pid).now), 250);
  const cpuBefore = processCpuMs(run.pid);
  const started = performance.now();
  const deadline = started + SECONDS * 1000;
  let n = 0;
  await Promise.all(
    Array.from({ length: stations }, async (_, s) => {
      const stationId = run.stationIds[s % run.stationIds.length];
      while (performance.now() < deadline) {
        const outcome = await upload(run.url, run.token, run.ruleVersionId, stationId, run.photos[n++ % run.photos.length]);
        outcomes.push(outcome);
        // A shed station waits as it was told, as the operator's phone does.
        if (outcome.status === 503) await new Promise((r) => setTimeout(r, Math.min(5, Number(outcome.retryAfter) || 1) * 1000));
      }
    }),
  );
  const wallS = (performance.now() - started) / 1000;
  clearInterval(sampler);
  const judged = outcomes.filter((o) => o.status === 201).map((o) => o.ms);
  const shed = outcomes.filter((o) => o.status === 503);
  const other = outcomes.filter((o) => o.status !== 201 && o.status !== 503);
  const fmt = (v: number) => `${v.toFixed(0)} ms`;
  console.log(`\n${label}: ${stations} stations for ${wallS.toFixed(0)} s`);
  console.log(`  judged ${judged.length} (${(judged.length / wallS).toFixed(2)} per second), shed ${shed.length} (all with Retry-After: ${shed.every((o) => o.retryAfter !== null)}), other answers ${other.length}${other.length ? ` (${[...new Set(other.map((o) => o.status))].join(', ')})` : ''}`);
  if (judged.length) console.log(`  photo sent → verdict: p50 ${fmt(percentile(judged, 50))}, p95 ${fmt(percentile(judged, 95))}, p99 ${fmt(percentile(judged, 99))}, mean ${fmt(mean(judged))}`);
  if (shed.length) console.log(`  a shed upload was answered in p50 ${fmt(percentile(shed.map((o) => o.ms), 50))}`);
  const busyCores = (processCpuMs(run.pid) - cpuBefore) / 1000 / wallS;
  console.log(`  server CPU ${busyCores.toFixed(2)} cores busy on average; resident memory p50 ${percentile(memory, 50).toFixed(0)} MB, max sampled ${Math.max(...memory).toFixed(0)} MB, peak so far ${residentMb(run.pid).peak.toFixed(0)} MB`);
}

async function main(): Promise<void> {
  const cores = os.availableParallelism?.() ?? os.cpus().length;
  console.log(`Load test: ${FRAME.width}×${FRAME.height} JPEG, rule "${RULE_NAME}", ${cores} cores, server in-flight limit ${IN_FLIGHT}, load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
  const name = `kw_load_${crypto.randomBytes(5).toString('hex')}`;
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-load-'));
  const databaseUrl = `${PG_URL}/${name}`;
  let server: ChildProcess | null = null;
  await admin(`create database "${name}"`);
  try {
    const plant = await preparePlant(databaseUrl, path.join(dataDir, 'images'), Math.min(8, Math.max(STATIONS, OVERLOAD)));
    const photos = await photographWashers(PHOTOS);
    const started = await startServer(databaseUrl, dataDir, path.join(dataDir, 'server.log'), { KW_MAX_INSPECTIONS_IN_FLIGHT: String(IN_FLIGHT) });
    server = started.child;
    const run = { url: started.url, token: await signIn(started.url), ruleVersionId: plant.ruleVersionId, stationIds: plant.stationIds, photos, pid: server.pid! };
    for (let i = 0; i < 4; i++) await upload(run.url, run.token, run.ruleVersionId, run.stationIds[0], photos[i % photos.length]);
    console.log(`after warm-up the server holds ${residentMb(run.pid).now.toFixed(0)} MB`);
    await phase('A line at work', STATIONS, run);
    await phase('Overload', OVERLOAD, run);
    console.log(`\nload average at the end: ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
  } finally {
    if (server && server.exitCode === null) {
      const exited = new Promise((r) => server!.once('exit', r));
      server.kill('SIGTERM');
      await exited;
    }
    await admin(`drop database if exists "${name}" with (force)`);
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.stack : err);
  process.exit(1);
});
