import { z } from 'zod';

export const proportionSchema = z.object({ count: z.number(), of: z.number(), rate: z.number().nullable(), low: z.number().nullable(), high: z.number().nullable() });

const verdictCounts = z.object({ PASS: z.number(), FAIL: z.number(), RETAKE: z.number() });
export const trialSummarySchema = z.object({
  table: z.object({ good: verdictCounts, defective: verdictCounts, retake: verdictCounts }),
  images: z.number(),
  unlabelled: z.number(),
  agreement: proportionSchema,
  falseRejectRate: proportionSchema,
  escapeRate: proportionSchema,
  retakeRate: proportionSchema,
  kappa: z.number().nullable(),
  medianMs: z.number().nullable(),
});
export type TrialSummary = z.infer<typeof trialSummarySchema>;

export const trialSchema = z.object({
  id: z.string(),
  ruleVersionId: z.string(),
  referenceSetId: z.string(),
  referenceSetName: z.string(),
  contentHash: z.string(),
  mmPerPx: z.number().nullable(),
  state: z.enum(['queued', 'running', 'done', 'failed']),
  total: z.number(),
  processed: z.number(),
  summary: trialSummarySchema.nullable(),
  error: z.string().nullable(),
  startedBy: z.string(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
});
export type Trial = z.infer<typeof trialSchema>;

export const startTrialRequestSchema = z.strictObject({
  ruleVersionId: z.uuid('Choose a rule version'),
  referenceSetId: z.uuid('Choose a reference set'),
  /** Station whose calibration converts px to mm; needed when a gauge is in mm or mm². */
  stationId: z.uuid().optional(),
});

export const trialResultSchema = z.object({
  imageId: z.string(),
  fileName: z.string(),
  thumbnailUrl: z.string().nullable(),
  label: z.string(),
  defectKind: z.string().nullable(),
  verdict: z.enum(['PASS', 'FAIL', 'RETAKE']),
  agrees: z.boolean().nullable(),
  measurements: z.array(z.object({ name: z.string(), value: z.number(), unit: z.string().nullable(), limits: z.object({ min: z.number().optional(), max: z.number().optional() }), pass: z.boolean() })),
  quality: z.record(z.string(), z.unknown()),
  durationMs: z.number(),
});
export type TrialResult = z.infer<typeof trialResultSchema>;

export const listTrialResultsQuerySchema = z.strictObject({
  outcome: z.enum(['all', 'misjudged', 'agrees']).default('all'),
  sort: z.enum(['file', 'slowest']).default('file'),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});

export const sweepQuerySchema = z.strictObject({ gauge: z.string().min(1).max(120), bound: z.enum(['min', 'max']).default('max') });
export const sweepPointSchema = z.object({ limit: z.number(), falseRejectRate: z.number().nullable(), escapeRate: z.number().nullable(), falseRejects: z.number(), escapes: z.number() });
export const sweepSchema = z.object({
  gauge: z.string(),
  bound: z.enum(['min', 'max']),
  current: z.number().nullable(),
  points: z.array(sweepPointSchema),
});
export type Sweep = z.infer<typeof sweepSchema>;
