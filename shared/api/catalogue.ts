import { z } from 'zod';

export const partTypeSchema = z.object({ code: z.string(), name: z.string(), family: z.string() });
export type PartType = z.infer<typeof partTypeSchema>;

export const defectKindSchema = z.object({ code: z.string(), name: z.string() });
export type DefectKind = z.infer<typeof defectKindSchema>;

export const codeSchema = z
  .string()
  .trim()
  .toLowerCase()
  .min(2, 'Use at least 2 characters')
  .max(40, 'Use at most 40 characters')
  .regex(/^[a-z0-9-]+$/, 'Use lower-case letters, digits and dashes');

export const createDefectKindRequestSchema = z.strictObject({
  code: codeSchema,
  name: z.string().trim().min(1, 'Enter a name').max(80),
});
