import jwt from 'jsonwebtoken';

export interface TokenClaims {
  sub: string;
  /** The user's token version when the token was issued; a raised version revokes it. */
  tv: number;
}

export function issueToken(claims: TokenClaims, secret: string, ttlSeconds: number): { token: string; expiresAt: Date } {
  const token = jwt.sign(claims, secret, { algorithm: 'HS256', expiresIn: ttlSeconds });
  const { exp } = jwt.decode(token) as { exp: number };
  return { token, expiresAt: new Date(exp * 1000) };
}
