// The one error shape of the whole API: { error: { code, message, details } }.
import { z } from 'zod';

export const ERROR_CODES = [
  'bad_request',
  'validation_failed',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'too_many_requests',
  'payload_too_large',
  'unsupported_media',
  'service_unavailable',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export const fieldIssueSchema = z.object({ path: z.string(), message: z.string() });
export type FieldIssue = z.infer<typeof fieldIssueSchema>;

export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof apiErrorSchema>;

/** JSON path of a zod issue, e.g. `steps[2].sigma` (`(root)` for the document itself). */
export function formatIssuePath(path: readonly PropertyKey[]): string {
  if (path.length === 0) return '(root)';
  return path
    // An empty key would vanish from a dotted path: it is written as [""] instead.
    .map((part, i) => (typeof part === 'number' ? `[${part}]` : part === '' ? '[""]' : i === 0 ? String(part) : `.${String(part)}`))
    .join('');
}

export function zodIssues(error: z.ZodError): FieldIssue[] {
  return error.issues.map((issue) => ({ path: formatIssuePath(issue.path), message: issue.message }));
}
