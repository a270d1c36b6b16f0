// Subgroups of a trend chart: calendar days (UTC) or the plant's shifts, which start on whole hours (UTC).
import type { TrendBucket } from '../../../shared/api/trends';

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;

/**
 * SQL for the start of the subgroup that holds the time `column` (a timestamptz). For shifts the time
 * is moved back to the first shift start, so that every shift lies within one (shifted) day; there the
 * last shift start not after the hour is found with width_bucket.
 */
export function bucketStartSql(column: string, bucket: TrendBucket, shiftHours: readonly number[], params: unknown[]): string {
  if (bucket === 'day') return `date_trunc('day', ${column}, 'UTC')`;
  params.push(shiftHours[0]);
  const first = `$${params.length}::int`;
  params.push(shiftHours.map((h) => h - shiftHours[0]));
  const offsets = `$${params.length}::int[]`;
  const moved = `(${column} - ${first} * interval '1 hour')`;
  return `(date_trunc('day', ${moved}, 'UTC') + (${first} + (${offsets})[width_bucket(extract(hour from ${moved} at time zone 'UTC')::int, ${offsets})]) * interval '1 hour')`;
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
