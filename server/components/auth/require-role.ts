import type { RequestHandler } from 'express';
import { hasAnyRole, ROLE_LABELS, type Role } from '../../../shared/roles';
import { AppError } from '../../lib/errors';

/** Lets the request through when the signed-in user holds at least one of the roles. */
export function requireRole(...allowed: Role[]): RequestHandler {
  const names = allowed.map((role) => ROLE_LABELS[role]).join(', ');
  return (req, _res, next) => {
    if (!req.user) return next(new AppError('unauthenticated', 'Sign in to continue'));
    if (!hasAnyRole(req.user.roles, allowed)) return next(new AppError('forbidden', `Your roles do not allow this; it needs: ${names}`));
    next();
  };
}
