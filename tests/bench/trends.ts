// Trend charts at scale: seeds a throw-away database with 90 days of inspections (1 000 000 by default) at
// 20 stations on 4 lines, then prints the time of the p-chart and Pareto queries through TrendsService
// (p50 and p95 of 10 runs after one warm-up), unfiltered and filtered, the alert check over the same data,
// and for comparison the same daily chart added up straight from the inspections table.
// Run (the test PostgreSQL of `npm test`, or any server you point it at):
//   npx ts-node --transpile-only -P server/tsconfig.json tests/bench/trends.ts [--inspections 3000000] [--keep]
//   settings: KW_BENCH_PG_URL (postgres://postgres@127.0.0.1:54339); the database is dropped afterwards unless --keep.
import crypto from 'node:crypto';
import os from 'node:os';
import type { DataSource } from 'typeorm';
import type { PChartQuery, TrendFilters } from '../../shared/api/trends';
import { ensureInspectionMonths } from '../../server/components/inspections/partitions';
import { makeDataSource } from '../../server/db/data-source';
import { createServices, type Services } from '../../server/services';
import { testConfig } from '../support/app';
import { adminQuery, argument, noPipelines as noPipelinesFor, seconds } from './bench-db';
import { percentile } from './latency';

const RUNS = 10;
const DAYS = 90;
const noPipelines = noPipelinesFor('trends');



/**
 * 90 days of a plant with 4 lines of 5 stations, 4 part types with one released rule each (a station
 * always runs the same rule); verdicts about 93 % PASS, 5 % FAIL over four causes, 2 % RETAKE. One INSERT
 * … SELECT generate_series; the inspections' statement trigger keeps the hourly counts as it goes.
 */
async function seed(ds: DataSource, inspections: number): Promise<void> {
  const q = (sql: string, params: unknown[] = []) => ds.query(sql, params);
  await q(`insert into users (username, display_name, password_hash, roles) values ('bench-operator', 'Bench Operator', 'x', '{operator}'), ('bench-engineer', 'Bench Engineer', 'x', '{engineer}')`);
  await q(`insert into part_types (code, name, family) select 'part-' || k, 'Part ' || k, 'bracket' from generate_series(1, 4) k`);
  await q(`insert into lines (name) select 'Line ' || k from generate_series(1, 4) k`);
  await q(`insert into stations (line_id, name) select l.id, l.name || ' station ' || k from lines l, generate_series(1, 5) k`);
  const [{ id: engineer }] = await q(`select id from users where username = 'bench-engineer'`);
  await q(`insert into rules (name, part_type, created_by) select code || ' check', code, $1 from part_types`, [engineer]);
  await q(
    `insert into rule_versions (rule_id, number, state, document, content_hash, author_id, edited_at, released_at)
     select r.id, 1, 'released', jsonb_build_object('name', r.name), encode(sha256(r.name::bytea), 'hex'), $1, now(), now() from rules r`,
    [engineer],
  );
  await q(`create unlogged table bench_station as select row_number() over (order by s.name) - 1 as k, s.id, s.line_id from stations s`);
  await q(`create unlogged table bench_version as select row_number() over (order by r.part_type) - 1 as k, v.id, v.rule_id, r.part_type from rule_versions v join rules r on r.id = v.rule_id`);
  // Each month of the history in its own partition, as the daily job would have made them.
  await ensureInspectionMonths(ds, new Date(Date.now() - DAYS * 86_400_000), new Date());
  const started = performance.now();
  // (g * 2654435761) mod 1000 is a cheap well-mixed number per row (Knuth's multiplicative hash) for the verdict and cause.
  await q(
    `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash,
                              verdict, cause, quality, duration_ms, created_at)
     select 'bench-' || g, v.id, v.rule_id, s.id, s.line_id, v.part_type, (select id from users where username = 'bench-operator'), repeat('a', 64),
            case when h < 50 then 'FAIL' when h < 70 then 'RETAKE' else 'PASS' end,
            case when h < 20 then 'Edge area' when h < 35 then 'Notch count' when h < 45 then 'Hole diameter' when h < 50 then 'Scratch length' when h < 70 then 'focus' end,
            '{}', 40, now() - interval '${DAYS} days' + (g::double precision / $1::int) * interval '${DAYS} days'
     from (select g, ((g::bigint * 2654435761) % 1000)::int as h from generate_series(1, $1::int) g) x
     join bench_station s on s.k = x.g % 20
     join bench_version v on v.k = (x.g % 20) % 4`,
    [inspections],
  );
  console.log(`  inspections: ${inspections.toLocaleString('en')} rows in ${seconds(started).toFixed(1)} s (the hourly counts kept by the trigger in the same statement)`);
  await q('drop table bench_station, bench_version');
  const vacuumed = performance.now();
  for (const table of ['inspections', 'inspection_hours', 'inspection_failure_hours']) await q(`vacuum analyze ${table}`);
  console.log(`  vacuum analyze in ${seconds(vacuumed).toFixed(1)} s`);
  const [counts] = await q(`select (select count(*) from inspection_hours)::int as hours, (select count(*) from inspection_failure_hours)::int as failures`);
  console.log(`  hourly counts: ${counts.hours.toLocaleString('en')} rows; failure causes by hour: ${counts.failures.toLocaleString('en')} rows`);
}

async function timed(run: () => Promise<unknown>): Promise<{ p50: number; p95: number }> {
  await run();
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const started = performance.now();
    await run();
    times.push(performance.now() - started);
  }
  return { p50: percentile(times, 50), p95: percentile(times, 95) };
}

async function benchmark(services: Services, ds: DataSource): Promise<void> {
  const [station] = await ds.query(`select s.id, s.line_id from stations s order by s.name limit 1`);
  const [rule] = await ds.query(`select id from rules order by name limit 1`);
  const today = new Date();
  today.setUTCHours(0, 0, 0, 0);
  // The last 90 days up to now: whole hours from the counts, the hour now under way from the inspections.
  const range = { from: new Date(today.getTime() - (DAYS - 1) * 86_400_000).toISOString(), to: new Date().toISOString() };
  const chart = (extra: Partial<PChartQuery>): PChartQuery => ({ ...range, bucket: 'day', runRules: 'western-electric', ...extra });
  const cases: [string, () => Promise<unknown>][] = [
    ['p-chart, 90 days by day, all stations', () => services.trends.pChart(chart({}))],
    ['p-chart, 90 days by day, one station', () => services.trends.pChart(chart({ stationId: station.id }))],
    ['p-chart, 90 days by day, one rule', () => services.trends.pChart(chart({ ruleId: rule.id }))],
    ['p-chart, 90 days by day, one line', () => services.trends.pChart(chart({ lineId: station.line_id }))],
    ['p-chart, 90 days by shift, all stations', () => services.trends.pChart(chart({ bucket: 'shift' }))],
    ['p-chart, 90 days by day, Nelson rules', () => services.trends.pChart(chart({ runRules: 'nelson' }))],
    ['Pareto + top stations, 90 days, all', () => services.trends.pareto(range as TrendFilters)],
    ['Pareto + top stations, 90 days, one station', () => services.trends.pareto({ ...range, stationId: station.id } as TrendFilters)],
  ];
  console.log(`\n  query (through TrendsService)${' '.repeat(17)}p50 ms   p95 ms   (${RUNS} runs after a warm-up)`);
  for (const [name, run] of cases) {
    const { p50, p95 } = await timed(run);
    console.log(`  ${name.padEnd(46)}${p50.toFixed(1).padStart(7)}  ${p95.toFixed(1).padStart(7)}`);
  }

  const direct = await timed(() =>
    ds.query(
      `select date_trunc('day', created_at, 'UTC') as day, count(*) filter (where verdict <> 'RETAKE') as n, count(*) filter (where verdict = 'FAIL') as d
       from inspections where created_at >= $1 and created_at < $2 group by 1 order by 1`,
      [range.from, range.to],
    ),
  );
  console.log(`  ${'same daily chart straight from inspections'.padEnd(46)}${direct.p50.toFixed(1).padStart(7)}  ${direct.p95.toFixed(1).padStart(7)}   (for comparison)`);

  const checked = performance.now();
  const outcome = await services.alerts.check();
  console.log(`\n  alert check, 30 days of ${outcome.series} rule and station series: ${(performance.now() - checked).toFixed(0)} ms, ${outcome.raised} alerts raised`);
}

async function main(): Promise<void> {
  const inspections = Number(argument('--inspections') ?? 1_000_000);
  const serverUrl = (process.env.KW_BENCH_PG_URL ?? 'postgres://postgres@127.0.0.1:54339').replace(/\/$/, '');
  const name = `kw_bench_trends_${crypto.randomBytes(4).toString('hex')}`;
  console.log(`Trends benchmark: ${inspections.toLocaleString('en')} inspections over ${DAYS} days, database ${name}`);
  console.log(`  machine: ${os.cpus().length} cores, load average ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
  await adminQuery(serverUrl, `create database "${name}"`);
  const url = `${serverUrl}/${name}`;
  const ds = makeDataSource(url, { poolSize: 4 });
  try {
    await ds.initialize();
    await ds.runMigrations({ transaction: 'each' });
    await seed(ds, inspections);
    const services = createServices({ config: testConfig({ databaseUrl: url }), dataSource: ds, pool: noPipelines, jobs: null });
    await benchmark(services, ds);
    console.log(`  machine load average after: ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
  } finally {
    await ds.destroy();
    if (process.argv.includes('--keep')) console.log(`  kept: ${url}`);
    else await adminQuery(serverUrl, `drop database if exists "${name}" with (force)`);
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
