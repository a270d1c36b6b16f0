import { z } from 'zod';

export const healthSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  database: z.object({ status: z.enum(['up', 'down']), latencyMs: z.number().nullable() }),
  version: z.string(),
  time: z.string(),
});
export type Health = z.infer<typeof healthSchema>;
