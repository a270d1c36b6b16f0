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

/** The CSV export's columns, in order (one row per measurement; an inspection without gauges has one row). */
export const CSV_COLUMNS = [
  'inspection_id',
  'created_at_utc',
  'line',
  'station',
  'rule',
  'rule_version',
  'rule_content_sha256',
  'part_type',
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
