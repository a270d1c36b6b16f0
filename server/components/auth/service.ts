import type { DataSource, Repository } from 'typeorm';
import type { SignInRequest, SignInResponse, User } from '../../../shared/api/auth';
import { AppError } from '../../lib/errors';
import { UserEntity } from './entities';
import { verifyPassword } from './passwords';
import { issueToken } from './tokens';

export function toUserDto(user: UserEntity): User {
  return {
    id: user.id,
    username: user.username,
    displayName: user.displayName,
    email: user.email,
    roles: user.roles,
    active: user.active,
    createdAt: user.createdAt.toISOString(),
    updatedAt: user.updatedAt.toISOString(),
  };
}

const WRONG_CREDENTIALS = 'Wrong user name or password';

export class AuthService {
  private readonly users: Repository<UserEntity>;

  constructor(
    dataSource: DataSource,
    private readonly jwtSecret: string,
    private readonly tokenTtlSeconds: number,
  ) {
    this.users = dataSource.getRepository(UserEntity);
  }

  async signIn({ username, password }: SignInRequest): Promise<SignInResponse> {
    const user = await this.users.findOneBy({ username });
    const passwordOk = await verifyPassword(password, user?.passwordHash ?? null);
    if (!user || !passwordOk) throw new AppError('unauthenticated', WRONG_CREDENTIALS);
    if (!user.active) throw new AppError('unauthenticated', 'This account is deactivated; ask an administrator');
    const { token, expiresAt } = issueToken({ sub: user.id, tv: user.tokenVersion }, this.jwtSecret, this.tokenTtlSeconds);
    return { token, expiresAt: expiresAt.toISOString(), user: toUserDto(user) };
  }

  /** The signed-in user behind a verified token, or null when the account is gone, inactive or the token revoked. */
  async userForToken(userId: string, tokenVersion: number): Promise<UserEntity | null> {
    const user = await this.users.findOneBy({ id: userId });
    if (!user || !user.active || user.tokenVersion !== tokenVersion) return null;
    return user;
  }

  /** Signing out revokes every token the user holds. */
  async signOut(userId: string): Promise<void> {
    await this.users.increment({ id: userId }, 'tokenVersion', 1);
  }
}
