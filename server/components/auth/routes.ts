import { Router, type RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit, type Store } from 'express-rate-limit';
import { signInRequestSchema } from '../../../shared/api/auth';
import { AppError } from '../../lib/errors';
import { parse } from '../../lib/validate';
import type { AuthService } from './service';
import { toUserDto } from './service';

export interface AuthRouteOptions {
  auth: AuthService;
  requireSignIn: RequestHandler;
  signInLimit: { windowMs: number; maxFailures: number };
  /** Where failed sign-ins are counted; shared by every API process (default: this process's memory). */
  signInStore?: Store;
}

export function authRoutes({ auth, requireSignIn, signInLimit, signInStore }: AuthRouteOptions): Router {
  const router = Router();
  // Counts failed sign-ins per address and user name; successful ones do not count.
  const limiter = rateLimit({
    windowMs: signInLimit.windowMs,
    limit: signInLimit.maxFailures,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: signInStore,
    // A fault in the store lets the request through: the route itself then answers (503 while the database is down).
    passOnStoreError: true,
    // User names are at most 40 characters; a longer guess is cut rather than given its own count.
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.username ?? '').toLowerCase().slice(0, 64)}`,
    handler: (_req, _res, next) =>
      next(new AppError('too_many_requests', 'Too many failed sign-ins; wait a few minutes and try again')),
  });

  router.post('/sign-in', limiter, async (req, res) => {
    res.json(await auth.signIn(parse(signInRequestSchema, req.body), { ip: req.ip }));
  });
  router.get('/me', requireSignIn, (req, res) => {
    res.json({ user: toUserDto(req.user!) });
  });
  router.post('/sign-out', requireSignIn, async (req, res) => {
    await auth.signOut(req.user!);
    res.status(204).end();
  });
  return router;
}
