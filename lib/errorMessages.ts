// Plain-words explanation of a failed request, with what the person can do next.
import { ROUTE_ID_PARAM } from '../shared/api/params';
import { ApiError } from './api';

export interface ErrorExplanation {
  message: string;
  nextStep: string;
}

const NEXT_STEPS: Record<string, string> = {
  network_error: 'Check the network connection of this device, then try again.',
  unauthenticated: 'Sign in again to continue.',
  forbidden: 'Your roles do not allow this. Ask an administrator if your work needs it.',
  not_found: 'It may have been removed. Go back to the list and reload it.',
  conflict: 'Change the marked field and try again.',
  validation_failed: 'Correct the marked fields and try again.',
  bad_request: 'Check what you entered and try again.',
  too_many_requests: 'Wait a minute, then try again.',
  payload_too_large: 'Use a smaller file and try again.',
  unsupported_media: 'Use a JPEG, PNG, TIFF or WebP photo and try again.',
  service_unavailable: 'Try again in a minute. If it keeps happening, tell your administrator.',
  unreadable_response: 'Reload the page to get the current version of the app, then try again.',
};

const GENERIC_NEXT_STEP = 'Try again. If it happens again, tell your administrator what you were doing.';

/** A conflict with the record's state (a version in review, a station not calibrated): no field to change. */
const STATE_CONFLICT_NEXT_STEP = 'The message says what has to happen first. Reload to see the current state, then try again.';

export function explainError(error: unknown): ErrorExplanation {
  if (error instanceof ApiError) {
    if (error.code === 'conflict' && error.fieldIssues.length === 0) return { message: error.message, nextStep: STATE_CONFLICT_NEXT_STEP };
    // A malformed id in the page's address (a mistyped or cut link): every route's path parameter
    // (idParamsSchema, shared/api/params.ts) has a name no request body's field has.
    if (error.code === 'validation_failed' && error.fieldIssues.length > 0 && error.fieldIssues.every((issue) => issue.path === ROUTE_ID_PARAM)) {
      return { message: 'This page’s address is not valid.', nextStep: 'Go back to the list and open it from there.' };
    }
    return { message: error.message, nextStep: NEXT_STEPS[error.code] ?? GENERIC_NEXT_STEP };
  }
  return { message: 'Something went wrong in the app.', nextStep: GENERIC_NEXT_STEP };
}

/** Retrying makes sense for server and network trouble, not for a refused request. */
export function isWorthRetrying(error: unknown): boolean {
  if (!(error instanceof ApiError)) return false;
  return error.status === 0 || error.status >= 500 || error.code === 'too_many_requests';
}
