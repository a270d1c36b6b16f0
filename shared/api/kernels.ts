import { z } from 'zod';

export const kernelInfoSchema = z.object({
  name: z.string(),
  matrix: z.array(z.array(z.number())),
  divisor: z.number(),
  offset: z.number(),
  description: z.string(),
  source: z.string(),
  builtIn: z.boolean(),
});
export type KernelInfo = z.infer<typeof kernelInfoSchema>;

const odd = (n: number) => n % 2 === 1;
export const createKernelRequestSchema = z
  .strictObject({
    name: z.string().trim().toLowerCase().min(2).max(60).regex(/^[a-z0-9-]+$/, 'Use lower-case letters, digits and dashes'),
    matrix: z
      .array(z.array(z.number().finite('Every weight must be a number')).min(1).max(31))
      .min(1)
      .max(31)
      .refine((m) => m.every((row) => row.length === m[0].length), 'Every row needs the same number of weights')
      .refine((m) => odd(m.length) && odd(m[0].length), 'Use an odd number of rows and columns'),
    divisor: z.number().finite().refine((d) => d !== 0, 'The divisor cannot be 0').default(1),
    offset: z.number().finite().default(0),
    description: z.string().trim().min(1, 'Say what the kernel is for').max(1000),
  });
