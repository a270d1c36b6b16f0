// Field issues (from zod on this side, or from the API's details.issues) keyed by form field.
import type { z } from 'zod';
import { zodIssues, type FieldIssue } from '../shared/api/errors';

export type FieldErrors = Partial<Record<string, string>>;

/** `roles[0]` and `roles` both belong to the roles field; the first message per field wins. */
export function fieldErrorsFrom(issues: readonly FieldIssue[]): FieldErrors {
  const errors: FieldErrors = {};
  for (const issue of issues) {
    const field = issue.path.split(/[.[]/)[0] || '(root)';
    if (!errors[field]) errors[field] = issue.message;
  }
  return errors;
}

/** Validates a form with the shared request schema, so the screen and the API agree on every rule. */
export function validateForm<S extends z.ZodType>(
  schema: S,
  values: unknown,
): { ok: true; data: z.output<S> } | { ok: false; errors: FieldErrors } {
  const result = schema.safeParse(values);
  if (result.success) return { ok: true, data: result.data };
  return { ok: false, errors: fieldErrorsFrom(zodIssues(result.error)) };
}
