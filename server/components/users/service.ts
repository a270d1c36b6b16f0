import { Brackets, type DataSource, type Repository } from 'typeorm';
import type { User } from '../../../shared/api/auth';
import type { UserList } from '../../../shared/api/users';
import type { z } from 'zod';
import type { createUserRequestSchema, listUsersQuerySchema, updateUserRequestSchema } from '../../../shared/api/users';
import { AppError, notFound } from '../../lib/errors';
import { UserEntity } from '../auth/entities';
import { hashPassword } from '../auth/passwords';
import { toUserDto } from '../auth/service';

type CreateUser = z.output<typeof createUserRequestSchema>;
type UpdateUser = z.output<typeof updateUserRequestSchema>;
type ListUsers = z.output<typeof listUsersQuerySchema>;
const UNIQUE_VIOLATION = '23505';

export class UsersService {
  private readonly users: Repository<UserEntity>;

  constructor(dataSource: DataSource) {
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

  async create(input: CreateUser): Promise<User> {
    const entity = this.users.create({
      username: input.username,
      displayName: input.displayName,
      email: input.email ?? null,
      roles: input.roles,
      passwordHash: await hashPassword(input.password),
    });
    try {
      return toUserDto(await this.users.save(entity));
    } catch (err) {
      if ((err as { code?: string }).code === UNIQUE_VIOLATION)
        throw new AppError('conflict', `The user name "${input.username}" is taken`, { issues: [{ path: 'username', message: 'Already taken' }] });
      throw err;
    }
  }

  async update(actingUserId: string, id: string, input: UpdateUser): Promise<User> {
    const user = await this.users.findOneBy({ id });
    if (!user) throw notFound('The user');
    if (id === actingUserId) {
      if (input.active === false) throw new AppError('conflict', 'You cannot deactivate your own account');
      if (input.roles && !input.roles.includes('admin'))
        throw new AppError('conflict', 'You cannot remove your own administrator role; ask another administrator');
    }
    let revoke = false;
    if (input.displayName !== undefined) user.displayName = input.displayName;
    if (input.email !== undefined) user.email = input.email;
    if (input.roles !== undefined) user.roles = input.roles;
    if (input.active !== undefined) {
      revoke ||= user.active && !input.active;
      user.active = input.active;
    }
    if (input.password !== undefined) {
      user.passwordHash = await hashPassword(input.password);
      revoke = true;
    }
    if (revoke) user.tokenVersion += 1;
    return toUserDto(await this.users.save(user));
  }
}
