import { z } from 'zod';

export const ALERT_KINDS = ['run-rule', 'limit'] as const;
export const alertKindSchema = z.enum(ALERT_KINDS);

/** A defect-fraction limit a supervisor sets for a rule at a station (or at every station when stationId is null). */
export const alertLimitSchema = z.object({
  id: z.string(),
  ruleId: z.string(),
  ruleName: z.string(),
  stationId: z.string().nullable(),
  stationName: z.string().nullable(),
  /** Alert when a day's defect fraction is above this (0..1). */
  maxDefectFraction: z.number(),
  createdBy: z.string(),
  createdAt: z.string(),
});
export type AlertLimit = z.infer<typeof alertLimitSchema>;
export const alertLimitListSchema = z.object({ items: z.array(alertLimitSchema) });

export const createAlertLimitSchema = z.strictObject({
  ruleId: z.uuid(),
  stationId: z.uuid().nullable().default(null),
  maxDefectFraction: z.number().gt(0, 'Give a fraction above 0').max(1, 'A fraction is at most 1'),
});
export type CreateAlertLimit = z.output<typeof createAlertLimitSchema>;

export const alertSchema = z.object({
  id: z.string(),
  kind: alertKindSchema,
  ruleId: z.string(),
  ruleName: z.string(),
  stationId: z.string(),
  stationName: z.string(),
  lineName: z.string(),
  /** "WE1" … / "N1" … for run rules, "limit" for a limit. */
  signal: z.string(),
  /** Start and end of the subgroup (day, UTC) that raised it. */
  periodStart: z.string(),
  periodEnd: z.string(),
  description: z.string(),
  createdAt: z.string(),
  acknowledgedAt: z.string().nullable(),
  acknowledgedBy: z.string().nullable(),
  acknowledgementNote: z.string().nullable(),
});
export type Alert = z.infer<typeof alertSchema>;

export const listAlertsQuerySchema = z.strictObject({
  state: z.enum(['open', 'acknowledged', 'all']).default('open'),
  after: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export const alertPageSchema = z.object({ items: z.array(alertSchema), next: z.string().nullable() });
export type AlertPage = z.infer<typeof alertPageSchema>;

export const acknowledgeAlertSchema = z.strictObject({
  note: z.string().trim().min(3, 'Say what was done or decided (at least 3 characters)').max(2000),
});

/** Whether the signed-in supervisor receives alert e-mails. */
export const alertSubscriptionSchema = z.strictObject({ subscribed: z.boolean() });
export type AlertSubscription = z.infer<typeof alertSubscriptionSchema>;
