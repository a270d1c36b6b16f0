import cors from 'cors';
import type { RequestHandler } from 'express';
import { rateLimit, type Store } from 'express-rate-limit';
import { AppError } from './errors';

/**
 * Cross-origin reads only from the origins the plant lists (KW_ALLOWED_ORIGINS); the app itself is
 * served from the API's own origin and needs none. Other origins get no CORS headers, so browsers
 * keep their pages from reading the answers.
 */
export function corsForApp(allowedOrigins: readonly string[]): RequestHandler {
  return cors({
    origin: (origin, done) => done(null, origin !== undefined && allowedOrigins.includes(origin)),
    methods: ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'],
    allowedHeaders: ['Authorization', 'Content-Type'],
    maxAge: 600,
  });
}

/** Photo uploads per signed-in person and minute; a station photographs a few parts a minute. */
export function uploadRateLimit(perMinute: number, store?: Store): RequestHandler {
  return rateLimit({
    windowMs: 60_000,
    limit: perMinute,
    store,
    passOnStoreError: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skip: (req) => req.method !== 'POST',
    keyGenerator: (req) => req.user?.id ?? 'anonymous',
    handler: (_req, _res, next) => next(new AppError('too_many_requests', `More than ${perMinute} uploads in a minute; wait a moment and send again`)),
  });
}

/**
 * Load shedding: at most `maxInFlight` requests of one kind are worked on at once; beyond that the
 * server answers 503 with Retry-After at once, before reading the upload, so that memory stays
 * bounded under overload and clients (the operator's photo queue) send again later.
 */
export function admissionLimit(maxInFlight: number, busyMessage: string): RequestHandler {
  let inFlight = 0;
  return (req, res, next) => {
    if (req.method !== 'POST') return next();
    if (inFlight >= maxInFlight) return next(new AppError('service_unavailable', busyMessage));
    inFlight += 1;
    let done = false;
    const release = () => {
      if (done) return;
      done = true;
      inFlight -= 1;
    };
    res.once('finish', release);
    res.once('close', release);
    next();
  };
}
