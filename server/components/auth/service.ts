import type { DataSource, Repository } from 'typeorm';
import type { SignInRequest, SignInResponse, User } from '../../../shared/api/auth';
import { AppError } from '../../lib/errors';
import type { AuditService } from '../audit/service';
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
const DEACTIVATED = 'This account is deactivated; ask an administrator';

export function actorOf(user: Pick<UserEntity, 'id' | 'username'>): { id: string; name: string } {
  return { id: user.id, name: user.username };
}

export class AuthService {
  private readonly users: Repository<UserEntity>;

  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly jwtSecret: string,
    private readonly tokenTtlSeconds: number,
  ) {
    this.users = dataSource.getRepository(UserEntity);
  }

  async signIn({ username, password }: SignInRequest, context: { ip?: string } = {}): Promise<SignInResponse> {
    const user = await this.users.findOneBy({ username });
    const passwordOk = await verifyPassword(password, user?.passwordHash ?? null);
    const refusal = !user || !passwordOk ? WRONG_CREDENTIALS : !user.active ? DEACTIVATED : null;
    if (!user || refusal) {
      await this.audit.recordAlone({
        actor: { id: user?.id ?? null, name: username },
        action: 'sign-in.refused',
        entityType: 'user',
        entityId: user?.id ?? null,
        details: { reason: !user ? 'unknown user name' : !passwordOk ? 'wrong password' : 'account deactivated', ...context },
      });
      throw new AppError('unauthenticated', refusal ?? WRONG_CREDENTIALS);
    }
    const { token, expiresAt } = issueToken({ sub: user.id, tv: user.tokenVersion }, this.jwtSecret, this.tokenTtlSeconds);
    await this.audit.recordAlone({ actor: actorOf(user), action: 'sign-in', entityType: 'user', entityId: user.id, details: context });
    return { token, expiresAt: expiresAt.toISOString(), user: toUserDto(user) };
  }

  /** The signed-in user behind a verified token, or null when the account is gone, inactive or the token revoked. */
  async userForToken(userId: string, tokenVersion: number): Promise<UserEntity | null> {
    const user = await this.users.findOneBy({ id: userId });
    if (!user || !user.active || user.tokenVersion !== tokenVersion) return null;
    return user;
  }

  /** Signing out revokes every token the user holds. */
  async signOut(user: UserEntity): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      await manager.getRepository(UserEntity).increment({ id: user.id }, 'tokenVersion', 1);
      await this.audit.record(manager, { actor: actorOf(user), action: 'sign-out', entityType: 'user', entityId: user.id });
    });
  }
}
