import type { ErrorRequestHandler, RequestHandler } from 'express';
import { z } from 'zod';
import { zodIssues, type ErrorCode } from '../../shared/api/errors';
import { MAX_FILES_PER_UPLOAD, MAX_PHOTO_BYTES } from './uploads';

const STATUS: Record<ErrorCode, number> = {
  bad_request: 400,
  validation_failed: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media: 415,
  too_many_requests: 429,
  internal: 500,
  service_unavailable: 503,
};

/** An error the API reports to the client as { error: { code, message, details } }. */
export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
  get status(): number {
    return STATUS[this.code];
  }
}

export const notFound = (what: string) => new AppError('not_found', `${what} was not found`);

function fromZod(error: z.ZodError): AppError {
  const issues = zodIssues(error);
  const first = issues[0];
  const message = first ? `${first.path}: ${first.message}` : 'The request is not valid';
  return new AppError('validation_failed', message, { issues });
}

/** Multer's limits, in words that name the limit (server/lib/uploads.ts). */
function fromUploadLimit(code: string, field: string | undefined): AppError {
  switch (code) {
    case 'LIMIT_FILE_SIZE':
      return new AppError('payload_too_large', `A photo may be at most ${MAX_PHOTO_BYTES / (1024 * 1024)} MB; this one is larger`);
    case 'LIMIT_FILE_COUNT':
      return new AppError('payload_too_large', `Send at most ${MAX_FILES_PER_UPLOAD} photos at once`);
    case 'LIMIT_UNEXPECTED_FILE':
      return new AppError('bad_request', `Unexpected file field "${field ?? ''}"`);
    default:
      return new AppError('bad_request', `The upload is not valid (${code.toLowerCase().replace(/_/g, ' ')})`);
  }
}

/** Connection-level codes: refused or reset sockets, PostgreSQL shutting down (57P01-57P03) or the link lost (08xxx). */
const UNAVAILABLE_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', '57P01', '57P02', '57P03', '08000', '08001', '08003', '08006']);

/**
 * The database went away under the request. A lost connection shows up in several guises: the
 * driver's code, pg's "Connection terminated" without one, or TypeORM failing to roll back on the
 * dead connection (QueryRunnerAlreadyReleasedError), which hides the first error.
 */
function isDatabaseUnavailable(err: unknown): boolean {
  const e = err as { code?: string; name?: string; message?: string; driverError?: { code?: string; message?: string } } | null;
  if (!e) return false;
  if (UNAVAILABLE_CODES.has(e.code ?? '') || UNAVAILABLE_CODES.has(e.driverError?.code ?? '')) return true;
  if (e.name === 'QueryRunnerAlreadyReleasedError') return true;
  return /Connection terminated|connection is closed|Client has encountered a connection error|timeout exceeded when trying to connect/i.test(`${e.message ?? ''} ${e.driverError?.message ?? ''}`);
}

function toAppError(err: unknown): AppError | null {
  if (err instanceof AppError) return err;
  if (err instanceof z.ZodError) return fromZod(err);
  const e = err as { type?: string; status?: number; code?: string; message?: string };
  if (e?.type === 'entity.parse.failed') return new AppError('bad_request', 'The request body is not valid JSON');
  if (e?.type === 'entity.too.large') return new AppError('payload_too_large', 'The request body is too large');
  if ((err as { name?: string })?.name === 'MulterError') return fromUploadLimit(e.code ?? '', (err as { field?: string }).field);
  if (isDatabaseUnavailable(err)) return new AppError('service_unavailable', 'The database is not reachable; try again in a moment');
  return null;
}

/**
 * The one error answer. `databaseDown` is asked about an error nobody recognised: when the database
 * does not answer either, the request failed because of it, and the client is told to try again (503)
 * rather than that something broke (500), whatever guise the lost connection took.
 */
export function createErrorHandler(databaseDown: () => Promise<boolean> = async () => false): ErrorRequestHandler {
  return (err, req, res, _next) => {
    if (res.headersSent) {
      // A streamed answer (an export) failed midway: cut it off so the client sees an incomplete download.
      req.log?.error({ err }, 'error after the answer had started');
      res.destroy(err instanceof Error ? err : undefined);
      return;
    }
    const answer = (error: AppError) => {
      if (error.code === 'service_unavailable') res.set('Retry-After', '5');
      res.status(error.status).json({ error: { code: error.code, message: error.message, details: error.details } });
    };
    const known = toAppError(err);
    if (known) return answer(known);
    void databaseDown().then((down) => {
      req.log?.error({ err, databaseDown: down }, 'unhandled error');
      if (down) return answer(new AppError('service_unavailable', 'The database is not reachable; try again in a moment'));
      res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server; it has been logged' } });
    });
  };
}


export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', `No API route ${req.method} ${req.originalUrl}`));
};
