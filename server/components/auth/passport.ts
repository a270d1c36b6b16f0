import type { RequestHandler } from 'express';
import passport from 'passport';
import { ExtractJwt, Strategy as JwtStrategy } from 'passport-jwt';
import { AppError } from '../../lib/errors';
import type { UserEntity } from './entities';
import type { AuthService } from './service';
import type { TokenClaims } from './tokens';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface User extends UserEntity {}
  }
}

/** Builds the middleware that requires a valid, unrevoked token of an active user. */
export function createRequireSignIn(auth: AuthService, secret: string): RequestHandler {
  const authenticator = new passport.Passport();
  authenticator.use(
    new JwtStrategy(
      { jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(), secretOrKey: secret, algorithms: ['HS256'] },
      (claims: TokenClaims, done: (err: unknown, user?: UserEntity | false) => void) => {
        auth.userForToken(claims.sub, claims.tv).then((user) => done(null, user ?? false), done);
      },
    ),
  );
  const middleware = authenticator.initialize();
  return (req, res, next) => {
    middleware(req, res, () => {
      authenticator.authenticate('jwt', { session: false }, (err: unknown, user: UserEntity | false, info?: { name?: string }) => {
        if (err) return next(err);
        if (!user) {
          const expired = info?.name === 'TokenExpiredError';
          return next(new AppError('unauthenticated', expired ? 'Your session has expired; sign in again' : 'Sign in to continue'));
        }
        req.user = user;
        next();
      })(req, res, next);
    });
  };
}
