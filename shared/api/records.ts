import { z } from 'zod';
import { verdictSchema } from './inspections';

/**
 * An inspection's short reference, "7F3A-19C2": the first eight hex digits of its id (a random
 * UUID), short enough to write on the tag of a part set aside and enough to find its record
 * (two inspections may share one now and then; their times and stations tell them apart).
 */
export function recordReference(id: string): string {
  const hex = id.replace(/-/g, '').slice(0, 8).toUpperCase();
  return `${hex.slice(0, 4)}-${hex.slice(4, 8)}`;
}

/** A reference as typed (7F3A-19C2, 7f3a19c2, with spaces around) → its eight lower-case hex digits. */
export const recordReferenceSchema = z
  .string()
  .trim()
  .regex(/^[0-9a-f]{4}-?[0-9a-f]{4}$/i, 'A record reference is eight letters A–F and digits, e.g. 7F3A-19C2')
  .transform((ref) => ref.replace('-', '').toLowerCase());

const isoDate = z.iso.datetime({ offset: true, message: 'Use an ISO 8601 date and time, e.g. 2026-11-01T00:00:00Z' });

/** Filters shared by the records table and its CSV export. */
export const recordFiltersSchema = z.strictObject({
  from: isoDate.optional(),
  to: isoDate.optional(),
  lineId: z.uuid().optional(),
  stationId: z.uuid().optional(),
  ruleId: z.uuid().optional(),
  ruleVersionId: z.uuid().optional(),
  verdict: verdictSchema.optional(),
  operatorId: z.uuid().optional(),
  disputed: z.enum(['true', 'false']).optional(),
  partType: z.string().min(1).max(40).optional(),
  /** The failing gauge or cause stored on the inspection (a Pareto bar). */
  cause: z.string().min(1).max(120).optional(),
  /** A record reference (recordReference), as written on a part's tag. */
  ref: recordReferenceSchema.optional(),
  order: z.enum(['newest', 'oldest']).default('newest'),
});
export type RecordFilters = z.output<typeof recordFiltersSchema>;

export const listRecordsQuerySchema = recordFiltersSchema.extend({
  /** Keyset cursor from the previous page's `next`. */
  after: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(50),
});

export const recordRowSchema = z.object({
  id: z.string(),
  createdAt: z.string(),
  lineName: z.string(),
  stationName: z.string(),
  ruleName: z.string(),
  ruleVersionNumber: z.number(),
  ruleVersionId: z.string(),
  partType: z.string(),
  verdict: verdictSchema,
  cause: z.string().nullable(),
  operatorName: z.string(),
  disputed: z.boolean(),
});
export type RecordRow = z.infer<typeof recordRowSchema>;

export const recordPageSchema = z.object({ items: z.array(recordRowSchema), next: z.string().nullable() });
export type RecordPage = z.infer<typeof recordPageSchema>;

/**
 * A bound for a file name: its day when it falls at midnight UTC, else its minute (2026-11-03T0600).
 * An exclusive end at midnight names the day before, the last one it includes (To is sent as the
 * next day's start).
 */
function boundText(bound: string, exclusiveEnd: boolean): string {
  const time = Date.parse(bound);
  if (Number.isNaN(time)) return 'unknown';
  const iso = new Date(time).toISOString();
  if (iso.slice(11, 23) !== '00:00:00.000') return iso.slice(0, 16).replace(':', '');
  return exclusiveEnd ? new Date(time - 86_400_000).toISOString().slice(0, 10) : iso.slice(0, 10);
}

const fileWord = (text: string) => text.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40) || 'x';

/**
 * The CSV export's file name, saying what it holds: "inspections_2026-11-01_to_2026-11-30_FAIL_exported-2026-12-05.csv".
 * Days as the list's date fields show them (To inclusive); a filter by an id (line, station, rule,
 * version, operator) is named by what it narrows, not by the id.
 */
export function exportFileName(filters: Partial<RecordFilters>, exportedAt: Date): string {
  const parts = ['inspections'];
  if (filters.from || filters.to) parts.push(`${filters.from ? boundText(filters.from, false) : 'start'}_to_${filters.to ? boundText(filters.to, true) : 'now'}`);
  else parts.push('all-days');
  if (filters.verdict) parts.push(filters.verdict);
  if (filters.disputed) parts.push(filters.disputed === 'true' ? 'disputed' : 'not-disputed');
  if (filters.lineId) parts.push('one-line');
  if (filters.stationId) parts.push('one-station');
  if (filters.ruleId || filters.ruleVersionId) parts.push('one-rule');
  if (filters.operatorId) parts.push('one-operator');
  if (filters.partType) parts.push(fileWord(filters.partType));
  if (filters.cause) parts.push(`cause-${fileWord(filters.cause)}`);
  if (filters.ref) parts.push(`record-${filters.ref}`);
  parts.push(`exported-${exportedAt.toISOString().slice(0, 10)}`);
  return `${parts.join('_')}.csv`;
}

/** The CSV export's columns, in order (one row per measurement; an inspection without gauges has one row). */
export const CSV_COLUMNS = [
  'inspection_id',
  'record_reference',
  'created_at_utc',
  'line',
  'station',
  'rule',
  'rule_version',
  'rule_content_sha256',
  'part_type',
  'part_type_name',
  'operator',
  'verdict',
  'cause',
  'image_sha256',
  'mm_per_px',
  'gauge',
  'value',
  'unit',
  'limit_min',
  'limit_max',
  'gauge_pass',
  'disputed',
] as const;
