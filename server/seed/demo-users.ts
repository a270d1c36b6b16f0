import type { DataSource } from 'typeorm';
import type { Role } from '../../shared/roles';
import { UserEntity } from '../components/auth/entities';
import { hashPassword } from '../components/auth/passwords';

/** The demo plant's people, one per role (README, "Demo accounts"). */
export const DEMO_PASSWORD = 'kernwright-demo';
export const DEMO_USERS: { username: string; displayName: string; roles: Role[] }[] = [
  { username: 'engineer', displayName: 'Ines Varga', roles: ['engineer'] },
  { username: 'operator', displayName: 'Tomas Reyes', roles: ['operator'] },
  { username: 'supervisor', displayName: 'Mara Lindqvist', roles: ['supervisor'] },
  { username: 'auditor', displayName: 'Kofi Mensah', roles: ['auditor'] },
  { username: 'admin', displayName: 'Priya Nair', roles: ['admin'] },
];

/** Creates the demo users that do not exist yet; returns the ones it created. */
export async function seedDemoUsers(dataSource: DataSource): Promise<string[]> {
  const repo = dataSource.getRepository(UserEntity);
  const created: string[] = [];
  const hash = await hashPassword(DEMO_PASSWORD);
  for (const person of DEMO_USERS) {
    if (await repo.existsBy({ username: person.username })) continue;
    await repo.save(repo.create({ ...person, email: `${person.username}@fernwick.example`, passwordHash: hash }));
    created.push(person.username);
  }
  return created;
}
