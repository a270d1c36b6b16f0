// Records at scale: seeds a throw-away database with a year of inspections (1 000 000 by default) and two
// measurements each, then prints
//   (a) the time of one records page (50 rows) through RecordsService.list, p50 and p95 of 20 runs, at the
//       first page, deep pages and with each filter, and the query plan's scans (EXPLAIN ANALYZE);
//   (b) the CSV export of 100 000 and of every inspection through the HTTP route, each in a fresh process:
//       bytes, rows, time and the peak RSS and heap sampled every 20 ms.
// Run (the test PostgreSQL of `npm test`, or any server you point it at):
//   npx ts-node --transpile-only -P server/tsconfig.json tests/bench/records.ts [--inspections 3000000] [--keep] [--plans]
//   --keep keeps the database; --reuse NAME measures a kept one again (after migrating it); --pages-only skips (b).
//   KW_BENCH_PG_URL names the PostgreSQL server (default postgres://postgres@127.0.0.1:54339, the test cluster).
import { execFile } from 'node:child_process';
import crypto from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import type { DataSource } from 'typeorm';
import type { RecordFilters } from '../../shared/api/records';
import { createApp } from '../../server/app';
import { hashPassword } from '../../server/components/auth/passwords';
import { ensureInspectionMonths } from '../../server/components/inspections/partitions';
import { encodeCursor } from '../../server/components/records/query';
import { makeDataSource } from '../../server/db/data-source';
import { createLogger } from '../../server/lib/logger';
import { createServices } from '../../server/services';
import { testConfig } from '../support/app';
import { adminQuery, argument, noPipelines as noPipelinesFor, seconds } from './bench-db';
import { percentile } from './latency';

const PASSWORD = 'bench-records-password';
const PAGE = 50;
const RUNS = 20;
const noPipelines = noPipelinesFor('records');


/**
 * A year of a plant with two lines of four stations, three part types with two rule versions each
 * (the second released seven months in), six operators; verdicts about 92 % PASS, 6 % FAIL, 2 % RETAKE;
 * one inspection in a thousand disputed. Inserts only: the append-only triggers allow them.
 */
async function seed(ds: DataSource, inspections: number): Promise<void> {
  const q = (sql: string, params: unknown[] = []) => ds.query(sql, params);
  const hash = await hashPassword(PASSWORD);
  await q(`insert into users (username, display_name, password_hash, roles) values ('bench-auditor', 'Bench Auditor', $1, '{auditor}'), ('bench-engineer', 'Bench Engineer', $1, '{engineer}')`, [hash]);
  await q(`insert into users (username, display_name, password_hash, roles) select 'op-' || k, 'Operator ' || k, $1, '{operator}' from generate_series(1, 6) k`, [hash]);
  await q(`insert into part_types (code, name, family) values ('washer', 'Washer', 'washer'), ('bracket', 'Bracket', 'bracket'), ('gasket', 'Gasket', 'gasket')`);
  await q(`insert into lines (name) values ('Line 1'), ('Line 2')`);
  await q(`insert into stations (line_id, name, mm_per_px) select l.id, l.name || ' station ' || k, 0.05 from lines l, generate_series(1, 4) k`);
  const [{ id: engineer }] = await q(`select id from users where username = 'bench-engineer'`);
  await q(`insert into rules (name, part_type, created_by) select code || ' check', code, $1 from part_types`, [engineer]);
  await q(
    `insert into rule_versions (rule_id, number, state, document, content_hash, author_id, edited_at)
     select r.id, n, 'draft', jsonb_build_object('name', r.name, 'v', n), encode(sha256((r.name || n)::bytea), 'hex'), $1, now()
     from rules r, generate_series(1, 2) n`,
    [engineer],
  );
  await q(`update rule_versions set state = 'released', released_at = now()`);
  await q(`update rule_versions set state = 'superseded', ended_at = now() where number = 1`);

  // Lookup tables so that each generated row picks its station, rule version and operator by arithmetic.
  await q(`create unlogged table bench_station as select row_number() over (order by s.name) - 1 as k, s.id, s.line_id from stations s`);
  await q(`create unlogged table bench_operator as select row_number() over (order by u.username) - 1 as k, u.id from users u where u.username like 'op-%'`);
  await q(
    `create unlogged table bench_version as
     select p.k, v.number, v.id, v.rule_id, r.part_type
     from (select row_number() over (order by code) - 1 as k, code from part_types) p
     join rules r on r.part_type = p.code join rule_versions v on v.rule_id = r.id`,
  );
  // Each month of the year in its own partition, as the daily job would have made them.
  await ensureInspectionMonths(ds, new Date(Date.now() - 365 * 86_400_000), new Date());
  let started = performance.now();
  // Spread over the last 365 days in time order, as a plant records them; (g * 2654435761) mod 1000 is a cheap
  // well-mixed number per row (Knuth's multiplicative hash) for the verdict, cause and operator.
  await q(
    `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash,
                              verdict, cause, quality, mm_per_px, duration_ms, created_at)
     select 'bench-' || g, v.id, v.rule_id, s.id, s.line_id, v.part_type, o.id, encode(sha256(g::text::bytea), 'hex'),
            case when h < 60 then 'FAIL' when h < 80 then 'RETAKE' else 'PASS' end,
            case when h < 30 then v.part_type || ' edge area' when h < 60 then v.part_type || ' notch count' when h < 79 then 'focus' when h < 80 then 'clipped' end,
            '{"focus": 120, "clipped": 0, "mean": 110}', 0.05, 40 + g % 30,
            now() - interval '365 days' + (g::double precision / $1::int) * interval '365 days'
     from (select g, ((g::bigint * 2654435761) % 1000)::int as h from generate_series(1, $1::int) g) x
     join bench_station s on s.k = x.g % 8
     join bench_version v on v.k = (x.g % 8) % 3 and v.number = case when x.g < $1::int * 0.6 then 1 else 2 end
     join bench_operator o on o.k = (x.h + x.g) % 6`,
    [inspections],
  );
  console.log(`  inspections: ${inspections.toLocaleString('en')} rows in ${seconds(started).toFixed(1)} s`);
  await q('drop table bench_station, bench_operator, bench_version');
  started = performance.now();
  await q(
    `insert into measurements (inspection_id, inspection_created_at, position, gauge, value, unit, limit_min, limit_max, pass)
     select i.id, i.created_at, p.pos, i.part_type || case p.pos when 0 then ' edge area' else ' notch count' end,
            case p.pos when 0 then 0.1 + (i.duration_ms - 40) / 60 else (i.duration_ms::int - 40) % 4 end,
            case p.pos when 0 then 'mm2' else '' end, null, case p.pos when 0 then 0.5 else 3 end,
            i.cause is distinct from i.part_type || case p.pos when 0 then ' edge area' else ' notch count' end
     from inspections i cross join (values (0), (1)) p(pos)`,
  );
  console.log(`  measurements: ${(2 * inspections).toLocaleString('en')} rows in ${seconds(started).toFixed(1)} s`);
  await q(`insert into disputes (inspection_id, inspection_created_at, raised_by, note, raised_at) select id, created_at, operator_id, 'Looks fine to me', created_at + interval '5 minutes' from inspections where idempotency_key like 'bench-%000'`);
  started = performance.now();
  await q('vacuum analyze inspections');
  await q('vacuum analyze measurements');
  await q('vacuum analyze disputes');
  console.log(`  vacuum analyze in ${seconds(started).toFixed(1)} s`);
}

interface PlanNode {
  'Node Type': string;
  'Relation Name'?: string;
  'Index Name'?: string;
  'Scan Direction'?: string;
  'Actual Rows'?: number;
  'Actual Loops'?: number;
  'Rows Removed by Filter'?: number;
  Plans?: PlanNode[];
}

/**
 * How a plan reads the inspections table's monthly partitions: each way of reading (index, its name
 * without the partition's prefix, or a whole-partition scan), in how many partitions, and the rows visited.
 */
function inspectionsAccess(plan: PlanNode): string {
  const ways = new Map<string, { partitions: number; visited: number }>();
  const visit = (node: PlanNode) => {
    if (/^inspections(_y\d{4}m\d{2}|_default)?$/.test(node['Relation Name'] ?? '')) {
      const visited = ((node['Actual Rows'] ?? 0) + (node['Rows Removed by Filter'] ?? 0)) * (node['Actual Loops'] ?? 1);
      const index = node['Index Name']?.replace(/^inspections(_y\d{4}m\d{2}|_default)_/, '');
      const how = node['Node Type'] === 'Seq Scan' ? 'SEQ SCAN' : `${index ?? node['Node Type']}${node['Scan Direction'] === 'Backward' ? ' (backward)' : ''}`;
      const way = ways.get(how) ?? { partitions: 0, visited: 0 };
      ways.set(how, { partitions: way.partitions + 1, visited: way.visited + visited });
    }
    node.Plans?.forEach(visit);
  };
  visit(plan);
  return [...ways].map(([how, { partitions, visited }]) => `${how} in ${partitions} partition${partitions === 1 ? '' : 's'}, ${visited.toLocaleString('en')} rows visited`).join('; ');
}

interface PageCase {
  name: string;
  filters: Partial<RecordFilters>;
  after?: string;
}

async function measurePages(ds: DataSource, inspections: number): Promise<void> {
  // The real list query, with the SQL it sends kept for EXPLAIN.
  let last: { sql: string; params: unknown[] } = { sql: '', params: [] };
  const spy = new Proxy(ds, {
    get(target, prop) {
      if (prop === 'query') return (sql: string, params: unknown[]) => ((last = { sql, params }), target.query(sql, params));
      const value = Reflect.get(target, prop, target);
      return typeof value === 'function' ? value.bind(target) : value;
    },
  });
  const { records } = createServices({ config: testConfig({ databaseUrl: 'bench' }), dataSource: spy, pool: noPipelines, jobs: null });
  const one = async (sql: string, params: unknown[] = []) => (await ds.query(sql, params))[0];
  const cursorAt = async (offset: number) => {
    const row = await one('select created_at, id from inspections order by created_at desc, id desc offset $1 limit 1', [offset]);
    return encodeCursor(row.created_at, row.id);
  };
  const line = await one(`select id from lines order by name limit 1`);
  const station = await one(`select id from stations order by name desc limit 1`);
  const rule = await one(`select id from rules order by name limit 1`);
  const oldVersion = await one(`select id from rule_versions where number = 1 order by id limit 1`);
  const operator = await one(`select id from users where username = 'op-3'`);
  const middle = await one('select created_at from inspections order by created_at offset $1 limit 1', [Math.floor(inspections / 2)]);
  const weekFrom = new Date(middle.created_at).toISOString();
  const weekTo = new Date(new Date(middle.created_at).getTime() + 7 * 86_400_000).toISOString();
  const deep = await cursorAt(Math.floor(inspections / 2));
  const deepest = await cursorAt(inspections - 10);
  const filters: PageCase[] = [
    { name: 'one week (from, to)', filters: { from: weekFrom, to: weekTo } },
    { name: 'line', filters: { lineId: line.id } },
    { name: 'station', filters: { stationId: station.id } },
    { name: 'rule', filters: { ruleId: rule.id } },
    { name: 'rule version (superseded)', filters: { ruleVersionId: oldVersion.id } },
    { name: 'verdict FAIL (6 %)', filters: { verdict: 'FAIL' } },
    { name: 'verdict RETAKE (2 %)', filters: { verdict: 'RETAKE' } },
    { name: 'operator', filters: { operatorId: operator.id } },
    { name: 'disputed (0.1 %)', filters: { disputed: 'true' } },
    { name: 'not disputed', filters: { disputed: 'false' } },
    { name: 'part type', filters: { partType: 'gasket' } },
    { name: 'cause (1 %)', filters: { cause: 'gasket notch count' } },
    { name: 'cause (0.1 %)', filters: { cause: 'clipped' } },
    { name: 'station + FAIL + one week', filters: { stationId: station.id, verdict: 'FAIL', from: weekFrom, to: weekTo } },
  ];
  const cases: PageCase[] = [
    { name: 'first page, newest first', filters: {} },
    { name: 'first page, oldest first', filters: { order: 'oldest' } },
    { name: 'deep page (row 500 000 of 1 000 000)'.replace('500 000', (inspections / 2).toLocaleString('en')).replace('1 000 000', inspections.toLocaleString('en')), filters: {}, after: deep },
    { name: 'last page', filters: {}, after: deepest },
    ...filters,
    ...filters.map((c) => ({ ...c, name: `${c.name}, deep page`, after: deep })),
  ];
  console.log(`\n(a) one page of ${PAGE} records: p50 and p95 of ${RUNS} runs, and the scans of its plan`);
  console.log('case'.padEnd(46) + 'p50 ms'.padStart(8) + 'p95 ms'.padStart(8) + '  rows  how the inspections are read');
  for (const c of cases) {
    const full: RecordFilters = { order: 'newest', ...c.filters } as RecordFilters;
    await records.list(full, c.after, PAGE);
    const times: number[] = [];
    let rows = 0;
    for (let i = 0; i < RUNS; i++) {
      const t0 = performance.now();
      rows = (await records.list(full, c.after, PAGE)).items.length;
      times.push(performance.now() - t0);
    }
    const [{ 'QUERY PLAN': plan }] = await ds.query(`explain (analyze, format json) ${last.sql}`, last.params);
    console.log(c.name.padEnd(46) + percentile(times, 50).toFixed(1).padStart(8) + percentile(times, 95).toFixed(1).padStart(8) + String(rows).padStart(6) + '  ' + inspectionsAccess(plan[0].Plan));
    if (process.argv.includes('--plans')) {
      const text = await ds.query(`explain (analyze, buffers) ${last.sql}`, last.params);
      console.log(text.map((r: { 'QUERY PLAN': string }) => `    ${r['QUERY PLAN']}`).join('\n'));
    }
  }
}

interface ExportFigures {
  bytes: number;
  lines: number;
  seconds: number;
  firstByteSeconds: number;
  baselineRss: number;
  baselineHeap: number;
  peakRss: number;
  peakHeap: number;
}

/** One CSV export through the HTTP route, in this (fresh) process: bytes, time and peak memory. */
async function exportChild(url: string, to: string): Promise<void> {
  const dataSource = makeDataSource(url, { poolSize: 4 });
  await dataSource.initialize();
  const config = testConfig({ databaseUrl: url });
  const services = createServices({ config, dataSource, pool: noPipelines, jobs: null });
  const server = createApp({ config, services, logger: createLogger('silent') }).listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  const port = (server.address() as AddressInfo).port;
  const signIn = await fetch(`http://127.0.0.1:${port}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ username: 'bench-auditor', password: PASSWORD }),
  });
  const { token } = (await signIn.json()) as { token: string };
  global.gc?.();
  const baseline = process.memoryUsage();
  let peakRss = baseline.rss;
  let peakHeap = baseline.heapUsed;
  const sample = setInterval(() => {
    const m = process.memoryUsage();
    peakRss = Math.max(peakRss, m.rss);
    peakHeap = Math.max(peakHeap, m.heapUsed);
  }, 20);
  const started = performance.now();
  let firstByte = 0;
  const figures = await new Promise<{ bytes: number; lines: number }>((resolve, reject) => {
    const query = to === 'all' ? '' : `?to=${encodeURIComponent(to)}`;
    http
      .get(`http://127.0.0.1:${port}/api/records/inspections.csv${query}`, { headers: { Authorization: `Bearer ${token}` } }, (res) => {
        if (res.statusCode !== 200) return reject(new Error(`export answered ${res.statusCode}`));
        let bytes = 0;
        let lines = 0;
        res.on('data', (chunk: Buffer) => {
          if (bytes === 0) firstByte = seconds(started);
          bytes += chunk.length;
          for (let i = chunk.indexOf(10); i !== -1; i = chunk.indexOf(10, i + 1)) lines += 1;
        });
        res.on('end', () => resolve({ bytes, lines }));
        res.on('error', reject);
      })
      .on('error', reject);
  });
  const result: ExportFigures = { ...figures, seconds: seconds(started), firstByteSeconds: firstByte, baselineRss: baseline.rss, baselineHeap: baseline.heapUsed, peakRss, peakHeap };
  clearInterval(sample);
  server.close();
  await dataSource.destroy();
  process.stdout.write(`\n@@export@@${JSON.stringify(result)}\n`);
}

function runExportChild(url: string, to: string, heapCeilingMb?: number): Promise<ExportFigures> {
  return new Promise((resolve, reject) => {
    execFile(
      process.execPath,
      [...(heapCeilingMb ? [`--max-old-space-size=${heapCeilingMb}`] : []), '--expose-gc', '-r', 'ts-node/register/transpile-only', __filename, '--export-child', url, to],
      { env: { ...process.env, TS_NODE_PROJECT: path.join(__dirname, '..', '..', 'server', 'tsconfig.json') }, maxBuffer: 16 * 1024 * 1024 },
      (err, stdout, stderr) => {
        if (err) return reject(new Error(stderr || err.message));
        const line = stdout.split('\n').find((l) => l.startsWith('@@export@@'));
        if (!line) return reject(new Error('the export printed no figures'));
        resolve(JSON.parse(line.slice('@@export@@'.length)) as ExportFigures);
      },
    );
  });
}

/** A hard heap ceiling for the export process: a streamed export fits; one that held its rows would run out. */
const HEAP_CEILING_MB = 96;

async function measureExports(ds: DataSource, url: string, inspections: number): Promise<void> {
  const mb = (n: number) => (n / 1e6).toFixed(1);
  console.log('\n(b) CSV export through GET /api/records/inspections.csv, each in a fresh process (memory sampled every 20 ms)');
  console.log(
    'inspections'.padEnd(12) + 'CSV rows'.padStart(11) + 'MB'.padStart(8) + 'first byte s'.padStart(13) + 'total s'.padStart(9) + 'MB/s'.padStart(6) +
      'RSS start→peak MB'.padStart(20) + 'heap start→peak MB'.padStart(20) + `  under a ${HEAP_CEILING_MB} MB heap ceiling`,
  );
  const sizes = [100_000, inspections].filter((n, i, all) => n <= inspections && all.indexOf(n) === i);
  for (const n of sizes) {
    let to = 'all';
    if (n < inspections) {
      const [row] = await ds.query('select created_at from inspections order by created_at offset $1 limit 1', [n]);
      to = new Date(row.created_at).toISOString();
    }
    const f = await runExportChild(url, to);
    const capped = await runExportChild(url, to, HEAP_CEILING_MB).then(
      (c) => `finished, peak heap ${mb(c.peakHeap)} MB, ${c.seconds.toFixed(1)} s`,
      (err: Error) => `FAILED: ${err.message.split('\n').find((l) => /heap|memory/i.test(l)) ?? err.message.slice(0, 120)}`,
    );
    console.log(
      n.toLocaleString('en').padEnd(12) +
        (f.lines - 1).toLocaleString('en').padStart(11) +
        mb(f.bytes).padStart(8) +
        f.firstByteSeconds.toFixed(2).padStart(13) +
        f.seconds.toFixed(1).padStart(9) +
        (f.bytes / 1e6 / f.seconds).toFixed(1).padStart(6) +
        `${mb(f.baselineRss)} → ${mb(f.peakRss)}`.padStart(20) +
        `${mb(f.baselineHeap)} → ${mb(f.peakHeap)}`.padStart(20) +
        `  ${capped}`,
    );
  }
}

async function main(): Promise<void> {
  const serverUrl = (process.env.KW_BENCH_PG_URL ?? `postgres://postgres@127.0.0.1:${process.env.KW_TEST_PG_PORT ?? '54339'}`).replace(/\/$/, '');
  let inspections = Number(argument('--inspections') ?? 1_000_000);
  if (!Number.isInteger(inspections) || inspections < 200_000) throw new Error('--inspections must be a whole number of at least 200000');
  // --reuse NAME measures a database kept by an earlier run (--keep) again, after migrating it.
  const reuse = argument('--reuse');
  const name = reuse ?? `kw_bench_records_${crypto.randomBytes(4).toString('hex')}`;
  if (!reuse) await adminQuery(serverUrl, `create database "${name}"`);
  const url = `${serverUrl}/${name}`;
  const ds = makeDataSource(url, { poolSize: 4 });
  const keep = reuse !== undefined || process.argv.includes('--keep');
  try {
    await ds.initialize();
    await ds.runMigrations({ transaction: 'each' });
    if (reuse) {
      const [{ n }] = await ds.query(`select count(*)::int as n from inspections`);
      inspections = n;
      await ds.query('analyze inspections');
    }
    console.log(`Records benchmark on ${name} (PostgreSQL ${(await ds.query('show server_version'))[0].server_version}, ${inspections.toLocaleString('en')} inspections)`);
    if (!reuse) {
      const started = performance.now();
      await seed(ds, inspections);
      const [{ size }] = await ds.query(`select pg_size_pretty(pg_database_size(current_database())) as size`);
      console.log(`  seeded in ${seconds(started).toFixed(1)} s; database size ${size}`);
    }
    await measurePages(ds, inspections);
    if (!process.argv.includes('--pages-only')) await measureExports(ds, url, inspections);
  } finally {
    if (ds.isInitialized) await ds.destroy();
    if (keep) console.log(`\nkept database ${url}`);
    else await adminQuery(serverUrl, `drop database if exists "${name}" with (force)`);
  }
}

const run = process.argv[2] === '--export-child' ? exportChild(process.argv[3], process.argv[4]) : main();
run.catch((err) => {
  console.error(err);
  process.exit(1);
});
