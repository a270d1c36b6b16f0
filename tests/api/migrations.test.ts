import { makeDataSource } from '../../server/db/data-source';
import { createTestDatabase, type TestDatabase } from '../support/db';

let db: TestDatabase;
beforeAll(async () => {
  db = await createTestDatabase({ empty: true });
});
afterAll(() => db.drop());

test('synchronize is off: the schema changes only through migrations', () => {
  expect(makeDataSource('postgres://unused').options.synchronize).toBe(false);
  expect(db.dataSource.options.synchronize).toBe(false);
});

test('the migrations run on an empty database and leave nothing for the entities to change', async () => {
  const ran = await db.dataSource.runMigrations({ transaction: 'each' });
  expect(ran.length).toBeGreaterThan(0);
  expect(await db.dataSource.showMigrations()).toBe(false);
  const pending = await db.dataSource.driver.createSchemaBuilder().log();
  expect(pending.upQueries.map((q) => q.query)).toEqual([]);
});

test('the database refuses a user without roles or with an unknown role', async () => {
  const insert = (roles: string) =>
    db.dataSource.query(`insert into users (username, display_name, password_hash, roles) values ('x${roles.length}', 'X', 'h', ${roles})`);
  await expect(insert(`'{}'`)).rejects.toThrow(/CHK_users_roles/);
  await expect(insert(`'{wizard}'`)).rejects.toThrow(/CHK_users_roles/);
});
