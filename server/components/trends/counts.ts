// Counts of inspections over a time range, exactly as the records list would count them: whole hours
// come from the hourly counts (inspection_hours, kept by a trigger), the part-hours at the range's edges
// from the inspections themselves. Every row has a time `t` that falls in the same subgroup as the
// inspections it counts (subgroups start on whole hours).
import type { TrendFilters } from '../../../shared/api/trends';
import { whereClause } from '../records/query';

const HOUR_MS = 3_600_000;

export interface TimeRange {
  from: Date;
  to: Date;
}

/** The rule, station, line and part type filters; the records list applies the same SQL, so a tap-through finds the same inspections. */
export type CountFilters = Pick<TrendFilters, 'ruleId' | 'stationId' | 'lineId' | 'partType'>;

function filterSql(filters: CountFilters, params: unknown[]): string {
  const { ruleId, stationId, lineId, partType } = filters;
  return whereClause({ ruleId, stationId, lineId, partType, order: 'newest' }, params);
}

/** Whole hours inside the range, and the part-hours before and after them. */
function split(range: TimeRange, params: unknown[]) {
  const bind = (value: Date) => {
    params.push(value.toISOString());
    return `$${params.length}::timestamptz`;
  };
  const firstHour = new Date(Math.ceil(range.from.getTime() / HOUR_MS) * HOUR_MS);
  const lastHour = new Date(Math.floor(range.to.getTime() / HOUR_MS) * HOUR_MS);
  if (firstHour >= lastHour) return { hours: 'false', edges: `(i.created_at >= ${bind(range.from)} and i.created_at < ${bind(range.to)})` };
  return {
    hours: `(i.hour >= ${bind(firstHour)} and i.hour < ${bind(lastHour)})`,
    edges: `((i.created_at >= ${bind(range.from)} and i.created_at < ${bind(firstHour)}) or (i.created_at >= ${bind(lastHour)} and i.created_at < ${bind(range.to)}))`,
  };
}

/** A subquery of (t, rule_id, station_id, line_id, part_type, judged, failed): parts judged (RETAKEs left out) and failed. */
export function judgedCountsSql(range: TimeRange, filters: CountFilters, params: unknown[]): string {
  const { hours, edges } = split(range, params);
  const where = filterSql(filters, params);
  return `(select i.hour as t, i.rule_id, i.station_id, i.line_id, i.part_type, i.judged, i.failed
           from inspection_hours i where ${hours} and ${where}
           union all
           select i.created_at, i.rule_id, i.station_id, i.line_id, i.part_type, (i.verdict <> 'RETAKE')::int, (i.verdict = 'FAIL')::int
           from inspections i where ${edges} and ${where})`;
}

/** A subquery of (t, rule_id, station_id, line_id, part_type, cause, failures): failed inspections by cause ('' when none was stored). */
export function failureCountsSql(range: TimeRange, filters: CountFilters, params: unknown[]): string {
  const { hours, edges } = split(range, params);
  const where = filterSql(filters, params);
  return `(select i.hour as t, i.rule_id, i.station_id, i.line_id, i.part_type, i.cause, i.failures
           from inspection_failure_hours i where ${hours} and ${where}
           union all
           select i.created_at, i.rule_id, i.station_id, i.line_id, i.part_type, coalesce(i.cause, ''), 1
           from inspections i where ${edges} and i.verdict = 'FAIL' and ${where})`;
}
