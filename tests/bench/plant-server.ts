// The pieces the inspection benchmarks share: a throw-away database with the demo plant's users and
// rules and stations calibrated for 5 MP washers, the real server in a child process on loopback,
// generated 5 MP washer photos, and the server process's CPU time.
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { UserEntity } from '../../server/components/auth/entities';
import { RuleEntity } from '../../server/components/rules/entities';
import { makeDataSource } from '../../server/db/data-source';
import { generateDataset, PART_FAMILIES } from '../../server/demo';
import { seedDemoPlant } from '../../server/seed/demo-plant';
import { DEMO_PASSWORD, seedDemoUsers } from '../../server/seed/demo-users';
import { MemoizingRunner } from '../../server/seed/memo-runner';
import { createServices } from '../../server/services';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { POOL_PROCESS_NODE_FLAGS, VisionPool } from '../../server/vision/pool';
import { testConfig } from '../support/app';
import { adminQuery } from './bench-db';
import { builtServerDir } from './built-server';

const ROOT = path.join(__dirname, '..', '..');
export const FRAME = { width: 2592, height: 1944 };
export const RULE_NAME = 'Washer rim and bore check';


export const PG_URL = (process.env.KW_BENCH_PG_URL ?? process.env.KW_TEST_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54339').replace(/\/$/, '');

export function admin(sql: string): Promise<void> {
  return adminQuery(PG_URL, sql);
}


export interface Plant {
  ruleVersionId: string;
  stationIds: string[];
}

/** Migrates the database, seeds the demo users and rules, and adds stations calibrated for 5 MP washers. */
export async function preparePlant(databaseUrl: string, imageDir: string, stations: number): Promise<Plant> {
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
      await services.stations.calibrate(supervisor, station.id, { referenceLengthMm: 20, distancePx: 20 / mmPerPx, photoWidthPx: FRAME.width, photoHeightPx: FRAME.height });
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

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const port = (server.address() as net.AddressInfo).port;
      server.close(() => resolve(port));
    });
  });
}

/** The built server (server/main.ts) in a child process with the pool's node flags, API only, mail to a closed port (nothing here sends any). */
export async function startServer(databaseUrl: string, dataDir: string, logFile: string, extraEnv: NodeJS.ProcessEnv = {}): Promise<{ url: string; child: ChildProcess }> {
  const port = await freePort();
  const log = fs.openSync(logFile, 'a');
  const child = spawn(process.execPath, [...POOL_PROCESS_NODE_FLAGS, path.join(builtServerDir(), 'server', 'main.js')], {
    cwd: ROOT,
    stdio: ['ignore', log, log],
    env: {
      ...process.env,
      PORT: String(port),
      DATABASE_URL: databaseUrl,
      KW_DATA_DIR: dataDir,
      KW_WEB_DIR: path.join(dataDir, 'no-web-app'),
      KW_SMTP_HOST: '127.0.0.1',
      KW_SMTP_PORT: '9',
      // One operator's token uploads for every station here: lift the per-person limit, not the server's own.
      KW_UPLOADS_PER_MINUTE: process.env.KW_UPLOADS_PER_MINUTE ?? '100000',
      ...extraEnv,
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

export interface GeneratedPhoto {
  jpeg: Buffer;
  label: string;
}

export async function photographWashers(count: number): Promise<GeneratedPhoto[]> {
  const photos: GeneratedPhoto[] = [];
  for await (const photo of generateDataset({ count, seed: 2592, families: ['washer'], sizes: [FRAME], defectShare: 1 / 3, retakeShare: 0, sixteenBitShare: 0, jpegShare: 1 })) {
    photos.push({ jpeg: photo.buffer, label: photo.truth.label });
  }
  return photos;
}

/** The same photo with a JPEG comment naming the upload, so that every upload is stored as a new image (content-addressed store). */
export function uniqueJpeg(jpeg: Buffer, tag: string): Buffer {
  const text = Buffer.from(tag, 'latin1');
  const segment = Buffer.from([0xff, 0xfe, ((text.length + 2) >> 8) & 0xff, (text.length + 2) & 0xff]);
  return Buffer.concat([jpeg.subarray(0, 2), segment, text, jpeg.subarray(2)]);
}


export async function signIn(url: string): Promise<string> {
  const response = await fetch(`${url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: 'operator', password: DEMO_PASSWORD }) });
  if (!response.ok) throw new Error(`sign-in failed: ${response.status}`);
  return ((await response.json()) as { token: string }).token;
}


export const CLOCK_TICKS_PER_SECOND = Number(execFileSync('getconf', ['CLK_TCK']).toString().trim()) || 100;

/** User + system CPU time of a process and all its threads (Linux /proc/PID/stat, fields 14 and 15). */
export function processCpuMs(pid: number): number {
  const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / CLOCK_TICKS_PER_SECOND;
}

