import { z } from 'zod';

export const auditEventSchema = z.object({
  seq: z.string(),
  occurredAt: z.string(),
  actorId: z.string().nullable(),
  actorName: z.string(),
  action: z.string(),
  entityType: z.string(),
  entityId: z.string().nullable(),
  beforeDigest: z.string().nullable(),
  afterDigest: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
  prevHash: z.string(),
  hash: z.string(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;

export const listAuditEventsQuerySchema = z.strictObject({
  entityType: z.string().max(40).optional(),
  entityId: z.string().max(80).optional(),
  action: z.string().max(60).optional(),
  /** Keyset pagination: events older than this sequence number. */
  before: z.string().regex(/^\d+$/, 'A sequence number').optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

export const auditEventPageSchema = z.object({ items: z.array(auditEventSchema), nextBefore: z.string().nullable() });
export type AuditEventPage = z.infer<typeof auditEventPageSchema>;

export const chainVerificationSchema = z.object({
  ok: z.boolean(),
  checked: z.number().int(),
  firstBroken: z.object({ seq: z.string(), reason: z.string() }).nullable(),
});
export type ChainVerificationResult = z.infer<typeof chainVerificationSchema>;
