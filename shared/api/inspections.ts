import { z } from 'zod';

export const verdictSchema = z.enum(['PASS', 'FAIL', 'RETAKE']);

export const measurementSchema = z.object({
  gauge: z.string(),
  value: z.number(),
  unit: z.string(),
  limitMin: z.number().nullable(),
  limitMax: z.number().nullable(),
  pass: z.boolean(),
});
export type InspectionMeasurement = z.infer<typeof measurementSchema>;

export const inspectionSchema = z.object({
  id: z.string(),
  idempotencyKey: z.string(),
  ruleId: z.string(),
  ruleName: z.string(),
  ruleVersionId: z.string(),
  ruleVersionNumber: z.number(),
  stationId: z.string(),
  stationName: z.string(),
  lineName: z.string(),
  partType: z.string(),
  operator: z.object({ id: z.string(), name: z.string() }),
  verdict: verdictSchema,
  cause: z.string().nullable(),
  quality: z.record(z.string(), z.unknown()),
  measurements: z.array(measurementSchema),
  mmPerPx: z.number().nullable(),
  durationMs: z.number(),
  imageUrl: z.string(),
  evidenceUrl: z.string().nullable(),
  createdAt: z.string(),
  dispute: z
    .object({ note: z.string(), raisedAt: z.string(), resolvedAt: z.string().nullable(), judgement: z.string().nullable(), resolutionNote: z.string().nullable() })
    .nullable(),
});
export type Inspection = z.infer<typeof inspectionSchema>;

/** The form fields sent with the photo (multipart). */
export const inspectRequestSchema = z.strictObject({
  stationId: z.uuid('Choose a station'),
  ruleVersionId: z.uuid('Choose a released rule'),
  /** Chosen by the client, so that a retried upload is stored once. */
  idempotencyKey: z.string().trim().min(8, 'An idempotency key of 8 to 80 characters').max(80).regex(/^[A-Za-z0-9._:-]+$/, 'Letters, digits and . _ : - only'),
});

export const disputeRequestSchema = z.strictObject({ note: z.string().trim().min(1, 'Say why the verdict looks wrong').max(2000) });

export const resolveDisputeRequestSchema = z.strictObject({
  /** The qualified person's judgement of the part itself. */
  judgement: z.enum(['good', 'defective']),
  note: z.string().trim().min(1, 'Say how the part was judged').max(2000),
});

export const listDisputesQuerySchema = z.strictObject({
  state: z.enum(['open', 'resolved']).default('open'),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export const disputeItemSchema = z.object({ id: z.string(), inspection: inspectionSchema });
export type DisputeItem = z.infer<typeof disputeItemSchema>;
