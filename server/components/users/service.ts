import { Brackets, type DataSource, type Repository } from 'typeorm';
import type { User } from '../../../shared/api/auth';
import type { UserList } from '../../../shared/api/users';
import type { z } from 'zod';
import type { createUserRequestSchema, listUsersQuerySchema, updateUserRequestSchema } from '../../../shared/api/users';
import { AppError, notFound } from '../../lib/errors';
import { UserEntity } from '../auth/entities';
import { hashPassword } from '../auth/passwords';
import { actorOf, toUserDto } from '../auth/service';
import type { AuditService } from '../audit/service';

type CreateUser = z.output<typeof createUserRequestSchema>;
type UpdateUser = z.output<typeof updateUserRequestSchema>;
type ListUsers = z.output<typeof listUsersQuerySchema>;
const UNIQUE_VIOLATION = '23505';

export class UsersService {
  private readonly users: Repository<UserEntity>;

  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {
    this.users = dataSource.getRepository(UserEntity);
  }

  async list(query: ListUsers): Promise<UserList> {
    const qb = this.users.createQueryBuilder('u');
    if (query.q) {
      const pattern = `%${query.q.replace(/[\\%_]/g, (c) => '\\' + c)}%`;
      qb.andWhere(new Brackets((w) => w.where('u.username ILIKE :p', { p: pattern }).orWhere('u.display_name ILIKE :p', { p: pattern })));
    }
    if (query.role) qb.andWhere(':role = ANY(u.roles)', { role: query.role });
    if (query.active) qb.andWhere('u.active = :active', { active: query.active === 'true' });
    const [rows, total] = await qb.orderBy('u.username', 'ASC').take(query.limit).skip(query.offset).getManyAndCount();
    return { items: rows.map(toUserDto), total };
  }

  async create(actor: UserEntity, input: CreateUser): Promise<User> {
    const entity = this.users.create({
      username: input.username,
      displayName: input.displayName,
      email: input.email ?? null,
      roles: input.roles,
      passwordHash: await hashPassword(input.password),
    });
    try {
      return await this.dataSource.transaction(async (manager) => {
        const saved = toUserDto(await manager.getRepository(UserEntity).save(entity));
        await this.audit.record(manager, {
          actor: actorOf(actor),
          action: 'user.create',
          entityType: 'user',
          entityId: saved.id,
          after: saved,
          details: { username: saved.username, roles: saved.roles },
        });
        return saved;
      });
    } catch (err) {
      if ((err as { code?: string }).code === UNIQUE_VIOLATION)
        throw new AppError('conflict', `The user name "${input.username}" is taken`, { issues: [{ path: 'username', message: 'Already taken' }] });
      throw err;
    }
  }

  async update(actor: UserEntity, id: string, input: UpdateUser): Promise<User> {
    const passwordHash = input.password === undefined ? undefined : await hashPassword(input.password);
    return this.dataSource.transaction(async (manager) => {
      const repo = manager.getRepository(UserEntity);
      const user = await repo.findOne({ where: { id }, lock: { mode: 'pessimistic_write' } });
      if (!user) throw notFound('The user');
      const before = toUserDto(user);
      const changes = this.apply(actor, user, input, passwordHash);
      const after = toUserDto(await repo.save(user));
      await this.audit.record(manager, { actor: actorOf(actor), action: 'user.update', entityType: 'user', entityId: id, before, after, details: { changes } });
      return after;
    });
  }

  /** Applies the change to the entity and describes it field by field (a new password only as "changed"). */
  private apply(actor: UserEntity, user: UserEntity, input: UpdateUser, passwordHash: string | undefined): Record<string, unknown> {
    if (user.id === actor.id) {
      if (input.active === false) throw new AppError('conflict', 'You cannot deactivate your own account');
      if (input.roles && !input.roles.includes('admin'))
        throw new AppError('conflict', 'You cannot remove your own administrator role; ask another administrator');
    }
    const changes: Record<string, unknown> = {};
    const set = <K extends 'displayName' | 'email' | 'roles' | 'active'>(key: K, value: UserEntity[K] | undefined) => {
      if (value === undefined || JSON.stringify(value) === JSON.stringify(user[key])) return;
      changes[key] = { from: user[key], to: value };
      user[key] = value;
    };
    set('displayName', input.displayName);
    set('email', input.email);
    set('roles', input.roles);
    const deactivating = user.active && input.active === false;
    set('active', input.active);
    if (passwordHash !== undefined) {
      user.passwordHash = passwordHash;
      changes.password = 'changed';
    }
    if (input.unlock && (user.lockedUntil || user.failedSignIns > 0)) {
      changes.unlocked = { lockedUntil: user.lockedUntil?.toISOString() ?? null };
      user.lockedUntil = null;
      user.failedSignIns = 0;
    }
    // A token carries the access of the moment it was issued: changed roles need a fresh sign-in.
    if (deactivating || passwordHash !== undefined || 'roles' in changes) user.tokenVersion += 1;
    return changes;
  }
}
