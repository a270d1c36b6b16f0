import { z } from 'zod';

export const previewRequestSchema = z.strictObject({
  /** The rule document to run (a draft being edited need not be saved). */
  document: z.unknown(),
  referenceImageId: z.uuid('Choose a reference photo'),
  /** Station whose calibration converts px to mm. */
  stationId: z.uuid().optional(),
});

export const previewResultSchema = z.object({
  verdict: z.enum(['PASS', 'FAIL', 'RETAKE']),
  quality: z.object({ focus: z.number(), clipped: z.number(), mean: z.number(), pass: z.boolean(), problems: z.array(z.string()) }),
  measurements: z.array(z.object({ name: z.string(), value: z.number(), unit: z.string().nullable(), limits: z.object({ min: z.number().optional(), max: z.number().optional() }), pass: z.boolean() })),
  steps: z.array(z.object({ op: z.string(), ms: z.number() })),
  ms: z.number(),
});
export type PreviewResult = z.infer<typeof previewResultSchema>;
