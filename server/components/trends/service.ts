import type { DataSource } from 'typeorm';
import type { Pareto, PChart, PChartQuery, TrendChoices, TrendFilters } from '../../../shared/api/trends';
import { pChart } from '../../../shared/metrics/control-chart';
import { runRuleSignals } from '../../../shared/metrics/run-rules';
import { AppError } from '../../lib/errors';
import { bucketEnd, bucketLabel, bucketStartHourSql, dateOfHour, epochHourSql } from './buckets';
import { failureCountsSql, judgedCountsSql, type TimeRange } from './counts';

/** Parts judged and failed by one rule at one station on one day (UTC). */
export interface DailyCount {
  ruleId: string;
  stationId: string;
  day: Date;
  n: number;
  defectives: number;
}

const TOP_STATIONS = 10;

function rangeOf(filters: Pick<TrendFilters, 'from' | 'to'>): TimeRange {
  const range = { from: new Date(filters.from), to: new Date(filters.to) };
  if (range.to <= range.from) throw new AppError('validation_failed', 'to: must be after from', { issues: [{ path: 'to', message: 'Must be after from' }] });
  return range;
}

/** Defect fractions over time (p-chart with run rules), failure causes (Pareto) and the stations behind them. */
export class TrendsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly shiftHours: readonly number[],
  ) {}

  async choices(): Promise<TrendChoices> {
    const [rules, stations, partTypes] = await Promise.all([
      this.dataSource.query(
        `select r.id, r.name from rules r
         where exists (select 1 from rule_versions v where v.rule_id = r.id and v.state in ('released', 'superseded', 'withdrawn'))
         order by r.name`,
      ) as Promise<{ id: string; name: string }[]>,
      this.dataSource.query(
        `select l.id as line_id, l.name as line_name, s.id, s.name from lines l left join stations s on s.line_id = l.id order by l.name, s.name`,
      ) as Promise<{ line_id: string; line_name: string; id: string | null; name: string | null }[]>,
      this.dataSource.query(`select distinct part_type from inspection_hours order by part_type`) as Promise<{ part_type: string }[]>,
    ]);
    const lines = new Map<string, TrendChoices['lines'][number]>();
    for (const row of stations) {
      const line = lines.get(row.line_id) ?? { id: row.line_id, name: row.line_name, stations: [] };
      lines.set(row.line_id, line);
      if (row.id && row.name) line.stations.push({ id: row.id, name: row.name });
    }
    return { rules, lines: [...lines.values()], partTypes: partTypes.map((p) => p.part_type) };
  }

  /**
   * The defect fraction per day or shift with limits that vary with each subgroup's size, and the run
   * rules that fire. A subgroup's start and end are cut to the asked range, so that the records list
   * with the same range and filters holds exactly the point's inspections.
   */
  async pChart(query: PChartQuery): Promise<PChart> {
    const range = rangeOf(query);
    const params: unknown[] = [];
    const counts = judgedCountsSql(range, query, params);
    const bucket = bucketStartHourSql('c.hour', query.bucket, this.shiftHours, params);
    const rows: { start_hour: string; n: number; defectives: number }[] = await this.dataSource.query(
      // Added up by time first (a 90-day chart has some 2 000 distinct hours), then by subgroup.
      `select ${bucket} as start_hour, sum(c.judged)::int as n, sum(c.failed)::int as defectives
       from (select ${epochHourSql('t.t')} as hour, t.judged, t.failed
             from (select i.t, sum(i.judged) as judged, sum(i.failed) as failed from ${counts} i group by i.t) t) c
       group by 1 having sum(c.judged) > 0 order by 1`,
      params,
    );
    const chart = pChart(rows.map((r) => ({ start: dateOfHour(r.start_hour), n: r.n, defectives: r.defectives })));
    const signals = runRuleSignals(
      chart.points.map((p) => p.z),
      query.runRules,
    );
    const signalled = new Set(signals.map((s) => s.pointIndex));
    return {
      bucket: query.bucket,
      runRules: query.runRules,
      center: chart.center,
      points: chart.points.map((p, i) => {
        const start = new Date(Math.max(p.start.getTime(), range.from.getTime()));
        const end = new Date(Math.min(bucketEnd(p.start, query.bucket, this.shiftHours).getTime(), range.to.getTime()));
        return { start: start.toISOString(), end: end.toISOString(), label: bucketLabel(p.start, query.bucket), n: p.n, defectives: p.defectives, p: p.p, ucl: p.ucl, lcl: p.lcl, signal: signalled.has(i) };
      }),
      signals,
    };
  }

  /** Failures by cause, largest first with the running share, and the stations with the highest defect fraction. */
  async pareto(filters: TrendFilters): Promise<Pareto> {
    const range = rangeOf(filters);
    const causeParams: unknown[] = [];
    const causes: { cause: string; count: number }[] = await this.dataSource.query(
      `select i.cause, sum(i.failures)::int as count from ${failureCountsSql(range, filters, causeParams)} i group by 1 order by 2 desc, 1`,
      causeParams,
    );
    const stationParams: unknown[] = [];
    const stations: { station_id: string; station_name: string; line_name: string; n: number; defectives: number }[] = await this.dataSource.query(
      `select c.station_id, s.name as station_name, l.name as line_name, c.n, c.defectives
       from (select i.station_id, sum(i.judged)::int as n, sum(i.failed)::int as defectives
             from ${judgedCountsSql(range, filters, stationParams)} i group by 1 having sum(i.judged) > 0) c
       join stations s on s.id = c.station_id join lines l on l.id = s.line_id
       order by c.defectives::float8 / c.n desc, c.n desc, s.name limit ${TOP_STATIONS}`,
      stationParams,
    );
    const totalFailures = causes.reduce((sum, c) => sum + c.count, 0);
    let running = 0;
    // A failure stored without a cause counts in the total but has no bar of its own.
    const bars = causes
      .filter((c) => c.cause !== '')
      .map((c) => {
        running += c.count;
        return { cause: c.cause, count: c.count, cumulative: running / totalFailures };
      });
    return {
      totalFailures,
      bars,
      topStations: stations.map((s) => ({ stationId: s.station_id, stationName: s.station_name, lineName: s.line_name, n: s.n, defectives: s.defectives, p: s.defectives / s.n })),
    };
  }

  /** Parts judged and failed per rule, station and day (UTC) in the range, for the given rules. */
  async dailyCounts(range: TimeRange, ruleIds: readonly string[]): Promise<DailyCount[]> {
    if (ruleIds.length === 0) return [];
    const params: unknown[] = [];
    const counts = judgedCountsSql(range, {}, params);
    const day = bucketStartHourSql(epochHourSql('i.t'), 'day', this.shiftHours, params);
    params.push(ruleIds);
    const rows: { rule_id: string; station_id: string; day_hour: string; n: number; defectives: number }[] = await this.dataSource.query(
      `select i.rule_id, i.station_id, ${day} as day_hour,
              sum(i.judged)::int as n, sum(i.failed)::int as defectives
       from ${counts} i where i.rule_id = any($${params.length}::uuid[])
       group by 1, 2, 3 having sum(i.judged) > 0 order by 1, 2, 3`,
      params,
    );
    return rows.map((r) => ({ ruleId: r.rule_id, stationId: r.station_id, day: dateOfHour(r.day_hour), n: r.n, defectives: r.defectives }));
  }
}
