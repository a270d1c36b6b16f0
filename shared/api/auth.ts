import { z } from 'zod';
import { ROLES } from '../roles';

export const roleSchema = z.enum(ROLES);

export const usernameSchema = z
  .string()
  .trim()
  .toLowerCase()
  .min(3, 'Use at least 3 characters')
  .max(40, 'Use at most 40 characters')
  .regex(/^[a-z0-9._-]+$/, 'Use letters, digits, dots, dashes or underscores');

export const passwordSchema = z.string().min(10, 'Use at least 10 characters').max(200, 'Use at most 200 characters');

export const signInRequestSchema = z.strictObject({
  username: z.string().trim().toLowerCase().min(1, 'Enter your user name').max(40),
  password: z.string().min(1, 'Enter your password').max(200),
});
export type SignInRequest = z.infer<typeof signInRequestSchema>;

export const userSchema = z.object({
  id: z.string(),
  username: z.string(),
  displayName: z.string(),
  email: z.string().nullable(),
  roles: z.array(roleSchema),
  active: z.boolean(),
  /** Set while the account is locked after repeated failed sign-ins. */
  lockedUntil: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type User = z.infer<typeof userSchema>;

export const signInResponseSchema = z.object({
  token: z.string(),
  expiresAt: z.string(),
  user: userSchema,
});
export type SignInResponse = z.infer<typeof signInResponseSchema>;
