import type { DataSource, EntityManager, Repository } from 'typeorm';
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
    lockedUntil: user.lockedUntil && user.lockedUntil > new Date() ? user.lockedUntil.toISOString() : null,
    createdAt: user.createdAt.toISOString(),
    updatedAt: user.updatedAt.toISOString(),
  };
}

const WRONG_CREDENTIALS = 'Wrong user name or password';
const DEACTIVATED = 'This account is deactivated; ask an administrator';

function lockedMessage(until: Date): string {
  return `This account is locked after repeated failed sign-ins until ${until.toISOString().slice(11, 16)} UTC; an administrator can unlock it sooner`;
}

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
    private readonly lockout: { failures: number; minutes: number },
  ) {
    this.users = dataSource.getRepository(UserEntity);
  }

  async signIn({ username, password }: SignInRequest, context: { ip?: string } = {}): Promise<SignInResponse> {
    const found = await this.users.findOneBy({ username });
    const passwordOk = await verifyPassword(password, found?.passwordHash ?? null);
    type Outcome = { refused: string } | { granted: SignInResponse };
    const outcome = await this.dataSource.transaction(async (manager): Promise<Outcome> => {
      // Locked row: concurrent failures for one account count one by one.
      const user = found ? await manager.findOne(UserEntity, { where: { id: found.id }, lock: { mode: 'pessimistic_write' } }) : null;
      const now = new Date();
      const locked = user?.lockedUntil && user.lockedUntil > now ? user.lockedUntil : null;
      const reason = !user ? 'unknown user name' : locked ? 'account locked' : !passwordOk ? 'wrong password' : !user.active ? 'account deactivated' : null;
      if (reason) {
        await this.audit.record(manager, { actor: { id: user?.id ?? null, name: username }, action: 'sign-in.refused', entityType: 'user', entityId: user?.id ?? null, details: { reason, ...context } });
        if (user && reason === 'wrong password') await this.countFailure(manager, user, now);
        // The refusal is committed with its audit event; only then is the caller told.
        return { refused: locked ? lockedMessage(locked) : reason === 'account deactivated' ? DEACTIVATED : WRONG_CREDENTIALS };
      }
      if (user!.failedSignIns > 0 || user!.lockedUntil) await manager.update(UserEntity, { id: user!.id }, { failedSignIns: 0, lockedUntil: null });
      const { token, expiresAt } = issueToken({ sub: user!.id, tv: user!.tokenVersion }, this.jwtSecret, this.tokenTtlSeconds);
      await this.audit.record(manager, { actor: actorOf(user!), action: 'sign-in', entityType: 'user', entityId: user!.id, details: context });
      return { granted: { token, expiresAt: expiresAt.toISOString(), user: toUserDto(user!) } };
    });
    if ('refused' in outcome) throw new AppError('unauthenticated', outcome.refused);
    return outcome.granted;
  }

  private async countFailure(manager: EntityManager, user: UserEntity, now: Date): Promise<void> {
    const failures = user.failedSignIns + 1;
    if (failures < this.lockout.failures) {
      await manager.update(UserEntity, { id: user.id }, { failedSignIns: failures });
      return;
    }
    const lockedUntil = new Date(now.getTime() + this.lockout.minutes * 60_000);
    await manager.update(UserEntity, { id: user.id }, { failedSignIns: 0, lockedUntil });
    await this.audit.record(manager, {
      actor: { id: null, name: 'system' },
      action: 'account.locked',
      entityType: 'user',
      entityId: user.id,
      details: { username: user.username, failures, lockedUntil: lockedUntil.toISOString() },
    });
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
