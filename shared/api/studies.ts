import { z } from 'zod';
import { verdictSchema } from './inspections';

/** AIAG MSA acceptance decision for one figure (REFERENCES.md §9). */
export const acceptanceSchema = z.enum(['acceptable', 'marginal', 'unacceptable']);
export type Acceptance = z.infer<typeof acceptanceSchema>;

// ---- Repeatability: one part photographed N times at a station ----

/** Multipart fields sent with the photos (`photos`, 2..50 files). */
export const createRepeatabilityStudySchema = z.strictObject({
  ruleVersionId: z.uuid(),
  stationId: z.uuid(),
  /** How the plant names the part that was photographed (serial, tag). */
  partLabel: z.string().trim().min(1, 'Name the part you photographed').max(120),
  /** What the part is known to be, when someone qualified has judged it. */
  knownLabel: z.enum(['good', 'defective', 'unknown']).default('unknown'),
});
export type CreateRepeatabilityStudy = z.output<typeof createRepeatabilityStudySchema>;

export const gaugeSpreadSchema = z.object({
  gauge: z.string(),
  unit: z.string(),
  n: z.number().int(),
  mean: z.number(),
  /** Sample standard deviation (n − 1). */
  standardDeviation: z.number(),
  range: z.number(),
  limitMin: z.number().nullable(),
  limitMax: z.number().nullable(),
  /** 6·s as a share of the tolerance (limitMax − limitMin), when both limits exist (AIAG MSA 4th ed. %Tolerance). */
  shareOfTolerance: z.number().nullable(),
});
export type GaugeSpread = z.infer<typeof gaugeSpreadSchema>;

export const repeatabilityStudySchema = z.object({
  id: z.string(),
  ruleId: z.string(),
  ruleName: z.string(),
  ruleVersionId: z.string(),
  ruleVersionNumber: z.number(),
  stationId: z.string(),
  stationName: z.string(),
  partLabel: z.string(),
  knownLabel: z.enum(['good', 'defective', 'unknown']),
  createdBy: z.string(),
  createdAt: z.string(),
  photos: z.number().int(),
  verdicts: z.object({ PASS: z.number().int(), FAIL: z.number().int(), RETAKE: z.number().int() }),
  /** True when every judged photo got the same verdict (RETAKEs aside). */
  consistent: z.boolean(),
  results: z.array(z.object({ position: z.number().int(), verdict: verdictSchema, cause: z.string().nullable() })),
  gauges: z.array(gaugeSpreadSchema),
});
export type RepeatabilityStudy = z.infer<typeof repeatabilityStudySchema>;

export const repeatabilityStudyListSchema = z.object({ items: z.array(repeatabilityStudySchema) });

// ---- Attribute agreement: the rule's verdicts against a qualified person's judgement ----

export const attributeAgreementQuerySchema = z.discriminatedUnion('source', [
  /** Resolved disputes of one rule's inspections in a date range. */
  z.strictObject({
    source: z.literal('disputes'),
    ruleId: z.uuid(),
    from: z.iso.datetime({ offset: true }).optional(),
    to: z.iso.datetime({ offset: true }).optional(),
  }),
  /** A finished trial: its rule version against the reference set's labels. */
  z.strictObject({ source: z.literal('trial'), trialId: z.uuid() }),
]);
export type AttributeAgreementQuery = z.output<typeof attributeAgreementQuerySchema>;

const figureSchema = z.object({ value: z.number().nullable(), acceptance: acceptanceSchema.nullable() });

export const attributeAgreementSchema = z.object({
  source: z.enum(['disputes', 'trial']),
  /** Judged pairs; "defective" is the positive class. RETAKEs are counted apart and left out. */
  counts: z.object({
    defectiveFailed: z.number().int(),
    defectivePassed: z.number().int(),
    goodFailed: z.number().int(),
    goodPassed: z.number().int(),
    retakes: z.number().int(),
  }),
  /** Share of all parts judged correctly. */
  effectiveness: figureSchema,
  /** Defective parts passed / defective parts. */
  missRate: figureSchema,
  /** Good parts failed / good parts. */
  falseAlarmRate: figureSchema,
  /** Cohen's kappa of verdict against judgement; acceptance "acceptable" ≥ 0.75, "unacceptable" < 0.40. */
  kappa: figureSchema,
});
export type AttributeAgreement = z.infer<typeof attributeAgreementSchema>;
