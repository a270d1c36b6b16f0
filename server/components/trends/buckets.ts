// Subgroups of a trend chart: calendar days (UTC) or the plant's shifts, which start on whole hours (UTC).
// Times are handled as whole hours since 1970-01-01T00:00Z: cheap integer arithmetic per row, where time
// zone functions cost several times more on a 90-day chart's tens of thousands of hourly rows.
import type { TrendBucket } from '../../../shared/api/trends';

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;

/** SQL for the hour (since the epoch, UTC) that holds the time `column` (a timestamptz). */
export function epochHourSql(column: string): string {
  return `floor(date_part('epoch', ${column}) / 3600)::bigint`;
}

/**
 * SQL for the start, in hours since the epoch, of the subgroup that holds the hour `hour` (an integer
 * SQL expression, hours since the epoch). For shifts: the hours since the first shift start of the day
 * give, through width_bucket, the last shift start not after the hour.
 */
export function bucketStartHourSql(hour: string, bucket: TrendBucket, shiftHours: readonly number[], params: unknown[]): string {
  if (bucket === 'day') return `(${hour} / 24 * 24)`;
  params.push(shiftHours[0]);
  const first = `$${params.length}::int`;
  params.push(shiftHours.map((h) => h - shiftHours[0]));
  const offsets = `$${params.length}::int[]`;
  const sinceFirst = `((${hour} - ${first}) % 24)`;
  return `(${hour} - ${sinceFirst} + (${offsets})[width_bucket(${sinceFirst}::int, ${offsets})])`;
}

/** Where the subgroup that starts at `start` ends: the next day, or the next shift start. */
export function bucketEnd(start: Date, bucket: TrendBucket, shiftHours: readonly number[]): Date {
  if (bucket === 'day') return new Date(start.getTime() + DAY_MS);
  const dayStart = Date.UTC(start.getUTCFullYear(), start.getUTCMonth(), start.getUTCDate());
  const next = shiftHours.find((h) => h > start.getUTCHours());
  return new Date(next === undefined ? dayStart + DAY_MS + shiftHours[0] * HOUR_MS : dayStart + next * HOUR_MS);
}

/** "2026-11-03" for a day, "2026-11-03 14:00" for the shift that starts then (UTC). */
export function bucketLabel(start: Date, bucket: TrendBucket): string {
  const iso = start.toISOString();
  return bucket === 'day' ? iso.slice(0, 10) : `${iso.slice(0, 10)} ${iso.slice(11, 16)}`;
}

export function dateOfHour(hour: number | string): Date {
  return new Date(Number(hour) * HOUR_MS);
}
