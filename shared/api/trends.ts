import { z } from 'zod';

const isoDate = z.iso.datetime({ offset: true, message: 'Use an ISO 8601 date and time, e.g. 2026-11-01T00:00:00Z' });

/** Run-rule sets that can be checked on a p-chart. */
export const RUN_RULE_SETS = ['western-electric', 'nelson'] as const;
export const runRuleSetSchema = z.enum(RUN_RULE_SETS);
export type RunRuleSet = z.infer<typeof runRuleSetSchema>;

/** One subgroup per calendar day (UTC) or per shift (the plant's shift start hours, see the server's config). */
export const trendBucketSchema = z.enum(['day', 'shift']);
export type TrendBucket = z.infer<typeof trendBucketSchema>;

/** Filters shared by every trend chart. RETAKE inspections are not parts judged, so they are left out. */
export const trendFiltersSchema = z.strictObject({
  from: isoDate,
  to: isoDate,
  ruleId: z.uuid().optional(),
  stationId: z.uuid().optional(),
  lineId: z.uuid().optional(),
  partType: z.string().min(1).max(40).optional(),
});
export type TrendFilters = z.output<typeof trendFiltersSchema>;

export const pChartQuerySchema = trendFiltersSchema.extend({
  bucket: trendBucketSchema.default('day'),
  runRules: runRuleSetSchema.default('western-electric'),
});
export type PChartQuery = z.output<typeof pChartQuerySchema>;

/** A run rule that fired at a point, in words a supervisor can act on. */
export const runRuleSignalSchema = z.object({
  /** e.g. "WE1" … "WE4", "N1" … "N8". */
  rule: z.string(),
  /** Index into `points` of the point that completes the pattern. */
  pointIndex: z.number().int(),
  /** Indices of every point in the pattern (for marking them on the chart). */
  pointIndices: z.array(z.number().int()),
  description: z.string(),
});
export type RunRuleSignal = z.infer<typeof runRuleSignalSchema>;

export const pChartPointSchema = z.object({
  /** Start of the subgroup (ISO 8601 UTC); the subgroup covers [start, end). */
  start: z.string(),
  end: z.string(),
  label: z.string(),
  /** Parts judged (PASS + FAIL) and parts failed in the subgroup. */
  n: z.number().int(),
  defectives: z.number().int(),
  p: z.number(),
  ucl: z.number(),
  lcl: z.number(),
  /** True when any run rule fired at this point. */
  signal: z.boolean(),
});
export type PChartPoint = z.infer<typeof pChartPointSchema>;

export const pChartSchema = z.object({
  bucket: trendBucketSchema,
  runRules: runRuleSetSchema,
  /** p̄ = total defectives / total judged over the shown range (NIST/SEMATECH e-Handbook §6.3.3.2). */
  center: z.number().nullable(),
  points: z.array(pChartPointSchema),
  signals: z.array(runRuleSignalSchema),
});
export type PChart = z.infer<typeof pChartSchema>;

export const paretoBarSchema = z.object({
  /** The failing gauge or defect cause as stored on the inspection. */
  cause: z.string(),
  count: z.number().int(),
  /** Running share of all failures, 0..1, in bar order (largest first). */
  cumulative: z.number(),
});
export const stationShareSchema = z.object({
  stationId: z.string(),
  stationName: z.string(),
  lineName: z.string(),
  n: z.number().int(),
  defectives: z.number().int(),
  p: z.number(),
});
export const paretoSchema = z.object({
  totalFailures: z.number().int(),
  bars: z.array(paretoBarSchema),
  /** Stations with the highest defect fraction in the range, worst first (at most 10). */
  topStations: z.array(stationShareSchema),
});
export type Pareto = z.infer<typeof paretoSchema>;

/** Choices for the trend filters (rules, stations by line, part types seen). */
export const trendChoicesSchema = z.object({
  rules: z.array(z.object({ id: z.string(), name: z.string() })),
  lines: z.array(z.object({ id: z.string(), name: z.string(), stations: z.array(z.object({ id: z.string(), name: z.string() })) })),
  partTypes: z.array(z.string()),
});
export type TrendChoices = z.infer<typeof trendChoicesSchema>;
