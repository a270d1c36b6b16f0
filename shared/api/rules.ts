import { z } from 'zod';
import { codeSchema } from './catalogue';

export const RULE_VERSION_STATES = ['draft', 'in-review', 'released', 'superseded', 'withdrawn'] as const;
export const ruleVersionStateSchema = z.enum(RULE_VERSION_STATES);
export type RuleVersionState = z.infer<typeof ruleVersionStateSchema>;

export const SIGNATURE_MEANINGS = ['review', 'approval', 'responsibility'] as const;
export const signatureMeaningSchema = z.enum(SIGNATURE_MEANINGS);
export const SIGNATURE_MEANING_LABELS: Record<(typeof SIGNATURE_MEANINGS)[number] | 'authorship', string> = {
  authorship: 'Authored',
  review: 'Reviewed',
  approval: 'Approved for production',
  responsibility: 'Responsible for release',
};

export const signatureSchema = z.object({
  id: z.string(),
  signerId: z.string(),
  signerName: z.string(),
  meaning: z.string(),
  signedAt: z.string(),
  contentHash: z.string(),
  signatureHash: z.string(),
  /** Whether the signature still matches the version's content (recomputed on every read). */
  valid: z.boolean(),
});
export type Signature = z.infer<typeof signatureSchema>;

const person = z.object({ id: z.string(), name: z.string() });

export const ruleVersionSchema = z.object({
  id: z.string(),
  ruleId: z.string(),
  ruleName: z.string(),
  number: z.number().int(),
  state: ruleVersionStateSchema,
  document: z.unknown(),
  contentHash: z.string(),
  author: person,
  authorNote: z.string(),
  editedAt: z.string(),
  submittedAt: z.string().nullable(),
  submittedTrialId: z.string().nullable(),
  reviewer: person.nullable(),
  reviewedAt: z.string().nullable(),
  reviewNote: z.string().nullable(),
  releasedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
  withdrawReason: z.string().nullable(),
  signatures: z.array(signatureSchema),
});
export type RuleVersion = z.infer<typeof ruleVersionSchema>;

/**
 * A draft a supervisor returned from review: it waits for the engineer's changes. Only sending back
 * leaves a draft with a review on it (a resubmitted version is in review again).
 */
export function isSentBack(version: { state: RuleVersionState; reviewedAt: string | Date | null }): boolean {
  return version.state === 'draft' && version.reviewedAt !== null;
}

/** `sentBack`: isSentBack, decided by the server for the rules list. */
const versionBrief = z.object({ id: z.string(), number: z.number().int(), state: ruleVersionStateSchema, editedAt: z.string(), sentBack: z.boolean() });

/** The newest trial of any of the rule's versions, for the list. */
const lastTrialBrief = z.object({
  id: z.string(),
  versionNumber: z.number().int(),
  state: z.enum(['queued', 'running', 'done', 'failed']),
  createdAt: z.string(),
  /** Share of reference images judged as labelled, and the two error rates (null until done). */
  agreement: z.number().nullable(),
  falseRejectRate: z.number().nullable(),
  escapeRate: z.number().nullable(),
});

export const ruleSummarySchema = z.object({
  id: z.string(),
  name: z.string(),
  partType: z.string(),
  smallestDefectMm: z.number().nullable(),
  createdBy: person,
  createdAt: z.string(),
  latestVersion: versionBrief,
  releasedVersion: versionBrief.nullable(),
  lastTrial: lastTrialBrief.nullable(),
});
export type RuleSummary = z.infer<typeof ruleSummarySchema>;

export const ruleDetailSchema = ruleSummarySchema.extend({ versions: z.array(ruleVersionSchema) });
export type RuleDetail = z.infer<typeof ruleDetailSchema>;

export const createRuleRequestSchema = z.strictObject({
  name: z.string().trim().min(1, 'Enter a name').max(120),
  partType: codeSchema,
  smallestDefectMm: z.number().positive('Enter a size in mm above 0, or leave it empty').max(1000, 'Enter a size of at most 1000 mm, or leave it empty').nullable().default(null),
  /** The first draft's rule document (format kernwright-rule/1). */
  document: z.unknown(),
});

export const listRulesQuerySchema = z.strictObject({
  q: z.string().trim().max(120).optional(),
  state: ruleVersionStateSchema.optional(),
  partType: codeSchema.optional(),
  /** "me": rules the signed-in person created or authored a version of; or a person's id. */
  owner: z.union([z.literal('me'), z.uuid()]).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

export const saveDraftRequestSchema = z.strictObject({ document: z.unknown(), authorNote: z.string().trim().max(2000).optional() });
export const newDraftRequestSchema = z.strictObject({ fromVersionId: z.uuid().optional() });
export const submitRequestSchema = z.strictObject({ note: z.string().trim().max(2000).default('') });
export const releaseRequestSchema = z.strictObject({
  password: z.string().min(1, 'Enter your password to sign'),
  meaning: signatureMeaningSchema,
  note: z.string().trim().max(2000).default(''),
});
export const sendBackRequestSchema = z.strictObject({ note: z.string().trim().min(1, 'Say what must change').max(2000) });
export const withdrawRequestSchema = z.strictObject({ reason: z.string().trim().min(1, 'Give the reason').max(2000) });
