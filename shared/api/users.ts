import { z } from 'zod';
import { passwordSchema, roleSchema, usernameSchema, userSchema } from './auth';

const rolesSchema = z
  .array(roleSchema)
  .min(1, 'Give the user at least one role')
  .transform((roles) => [...new Set(roles)]);

const displayNameSchema = z.string().trim().min(1, 'Enter the person’s name').max(80, 'Use at most 80 characters');
const emailSchema = z.email('Enter a valid e-mail address').max(200).nullable();

export const createUserRequestSchema = z.strictObject({
  username: usernameSchema,
  displayName: displayNameSchema,
  email: emailSchema.optional().default(null),
  password: passwordSchema,
  roles: rolesSchema,
});
export type CreateUserRequest = z.input<typeof createUserRequestSchema>;

export const updateUserRequestSchema = z
  .strictObject({
    displayName: displayNameSchema.optional(),
    email: emailSchema.optional(),
    roles: rolesSchema.optional(),
    active: z.boolean().optional(),
    password: passwordSchema.optional(),
    /** Lifts a lock-out after failed sign-ins before it runs out. */
    unlock: z.literal(true).optional(),
  })
  .refine((body) => Object.keys(body).length > 0, { message: 'Change at least one field' });
export type UpdateUserRequest = z.input<typeof updateUserRequestSchema>;

export const listUsersQuerySchema = z.strictObject({
  q: z.string().trim().max(80).optional(),
  role: roleSchema.optional(),
  active: z.enum(['true', 'false']).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
export type ListUsersQuery = z.input<typeof listUsersQuerySchema>;

export const userListSchema = z.object({ items: z.array(userSchema), total: z.number().int() });
export type UserList = z.infer<typeof userListSchema>;
