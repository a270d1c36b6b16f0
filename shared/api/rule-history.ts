import { z } from 'zod';
import { ruleVersionStateSchema, signatureSchema } from './rules';

const person = z.object({ id: z.string().nullable(), name: z.string() });

/** One entry of the audit trail about the rule or one of its versions, in words. */
export const ruleHistoryEventSchema = z.object({
  /** The audit event's sequence number: look it up in the audit trail's export. */
  seq: z.string(),
  occurredAt: z.string(),
  action: z.string(),
  /** The action as a reviewer reads it ("Submitted for review", "Released"). */
  label: z.string(),
  actor: person,
  /** The author's, reviewer's or withdrawer's note or reason, if one was given. */
  note: z.string().nullable(),
  /** For a release: the signature's meaning. */
  meaning: z.string().nullable(),
  /** For a new version: the number of the version it started from. */
  fromVersion: z.number().int().nullable(),
  /** SHA-256 of the record after the change, as the audit trail keeps it. */
  afterDigest: z.string().nullable(),
});
export type RuleHistoryEvent = z.infer<typeof ruleHistoryEventSchema>;

const rate = z.number().nullable();

/** A trial of a version: when, on which reference set, and its summary figures. */
export const ruleHistoryTrialSchema = z.object({
  id: z.string(),
  state: z.enum(['queued', 'running', 'done', 'failed']),
  referenceSetName: z.string(),
  startedBy: person,
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
  /** Whether the trial ran on the version's current content (a later edit makes it stale). */
  onCurrentContent: z.boolean(),
  /** The trial the version was submitted with. */
  submitted: z.boolean(),
  images: z.number().int().nullable(),
  agreement: rate,
  falseRejectRate: rate,
  escapeRate: rate,
  kappa: rate,
});
export type RuleHistoryTrial = z.infer<typeof ruleHistoryTrialSchema>;

export const diffRowSchema = z.object({
  section: z.enum(['Settings', 'Steps', 'Gauges']),
  label: z.string(),
  before: z.string().nullable(),
  after: z.string().nullable(),
  change: z.enum(['same', 'changed', 'added', 'removed']),
});

export const ruleHistoryVersionSchema = z.object({
  id: z.string(),
  number: z.number().int(),
  state: ruleVersionStateSchema,
  contentHash: z.string(),
  author: person,
  authorNote: z.string(),
  editedAt: z.string(),
  submittedAt: z.string().nullable(),
  reviewer: person.nullable(),
  reviewedAt: z.string().nullable(),
  reviewNote: z.string().nullable(),
  releasedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
  withdrawReason: z.string().nullable(),
  signatures: z.array(signatureSchema),
  /** State changes and other audit events of this version, oldest first. */
  events: z.array(ruleHistoryEventSchema),
  trials: z.array(ruleHistoryTrialSchema),
  /** What differs from the version numbered one lower (only the rows that differ); null for the first version. */
  changes: z.object({ fromNumber: z.number().int(), rows: z.array(diffRowSchema) }).nullable(),
});
export type RuleHistoryVersion = z.infer<typeof ruleHistoryVersionSchema>;

/** Every version of a rule with its state changes, signatures, trials and the diff to the version before. */
export const ruleHistorySchema = z.object({
  rule: z.object({ id: z.string(), name: z.string(), partType: z.string(), createdBy: person, createdAt: z.string() }),
  /** Events about the rule itself (its creation), oldest first. */
  events: z.array(ruleHistoryEventSchema),
  /** Newest version first. */
  versions: z.array(ruleHistoryVersionSchema),
});
export type RuleHistory = z.infer<typeof ruleHistorySchema>;
