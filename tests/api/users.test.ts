import request from 'supertest';
import { userListSchema } from '../../shared/api/users';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

let t: TestApp;
let admin: { Authorization: string };
beforeAll(async () => {
  t = await createTestApp();
  await t.createUser('root.admin', ['admin']);
  await t.createUser('ines', ['engineer']);
  admin = { Authorization: `Bearer ${await t.tokenFor('root.admin')}` };
});
afterAll(() => t.close());

test('an administrator creates a user who can then sign in with those roles', async () => {
  const res = await request(t.app)
    .post('/api/users')
    .set(admin)
    .send({ username: 'New.Person', displayName: 'New Person', password: 'long-enough-pw', roles: ['operator', 'engineer', 'operator'] });
  expect(res.status).toBe(201);
  expect(res.body).toMatchObject({ username: 'new.person', roles: ['operator', 'engineer'], active: true });
  const signIn = await request(t.app).post('/api/auth/sign-in').send({ username: 'new.person', password: 'long-enough-pw' });
  expect(signIn.status).toBe(200);
  expect(signIn.body.user.roles).toEqual(['operator', 'engineer']);
});

test('a taken user name is a 409 conflict naming the field', async () => {
  const res = await request(t.app).post('/api/users').set(admin).send({ username: 'ines', displayName: 'X', password: 'long-enough-pw', roles: ['operator'] });
  expect(res.status).toBe(409);
  expect(res.body.error.details.issues[0].path).toBe('username');
});

test('invalid fields are each named', async () => {
  const res = await request(t.app).post('/api/users').set(admin).send({ username: 'a b', displayName: '', password: 'short', roles: ['wizard'] });
  expect(res.status).toBe(400);
  const paths = res.body.error.details.issues.map((i: { path: string }) => i.path).sort();
  expect(paths).toEqual(['displayName', 'password', 'roles[0]', 'username']);
});

test('the list filters by text, role and active flag and pages', async () => {
  const all = userListSchema.parse((await request(t.app).get('/api/users').set(admin)).body);
  expect(all.total).toBeGreaterThanOrEqual(3);
  const engineers = (await request(t.app).get('/api/users?role=engineer').set(admin)).body;
  expect(engineers.items.every((u: { roles: string[] }) => u.roles.includes('engineer'))).toBe(true);
  const search = (await request(t.app).get('/api/users?q=INE').set(admin)).body;
  expect(search.items.map((u: { username: string }) => u.username)).toContain('ines');
  const page = (await request(t.app).get('/api/users?limit=1&offset=1').set(admin)).body;
  expect(page.items).toHaveLength(1);
  expect(page.total).toBe(all.total);
  const bad = await request(t.app).get('/api/users?limit=5000').set(admin);
  expect(bad.status).toBe(400);
  expect(bad.body.error.details.issues[0].path).toBe('limit');
});

test('a search text with SQL or LIKE characters is treated as text', async () => {
  const res = await request(t.app).get(`/api/users?q=${encodeURIComponent("%' or 1=1 --")}`).set(admin);
  expect(res.status).toBe(200);
  expect(res.body.items).toEqual([]);
});

test('changing roles revokes the old token; the next sign-in carries the new roles', async () => {
  const user = await t.createUser('rolf', ['operator']);
  const token = await t.tokenFor('rolf');
  expect((await request(t.app).get('/api/users').set('Authorization', `Bearer ${token}`)).status).toBe(403);
  const patch = await request(t.app).patch(`/api/users/${user.id}`).set(admin).send({ roles: ['operator', 'admin'] });
  expect(patch.status).toBe(200);
  expect((await request(t.app).get('/api/users').set('Authorization', `Bearer ${token}`)).status).toBe(401);
  const renewed = await t.tokenFor('rolf');
  expect((await request(t.app).get('/api/users').set('Authorization', `Bearer ${renewed}`)).status).toBe(200);
});

test('deactivating a user refuses their existing token and their next sign-in', async () => {
  const user = await t.createUser('gone', ['auditor']);
  const token = await t.tokenFor('gone');
  const res = await request(t.app).patch(`/api/users/${user.id}`).set(admin).send({ active: false });
  expect(res.status).toBe(200);
  expect(res.body.active).toBe(false);
  expect((await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`)).status).toBe(401);
  expect((await request(t.app).post('/api/auth/sign-in').send({ username: 'gone', password: TEST_PASSWORD })).status).toBe(401);
  const back = await request(t.app).patch(`/api/users/${user.id}`).set(admin).send({ active: true });
  expect(back.body.active).toBe(true);
  expect((await request(t.app).post('/api/auth/sign-in').send({ username: 'gone', password: TEST_PASSWORD })).status).toBe(200);
});

test('an administrator cannot lock themselves out', async () => {
  const me = (await request(t.app).get('/api/auth/me').set(admin)).body.user;
  expect((await request(t.app).patch(`/api/users/${me.id}`).set(admin).send({ active: false })).status).toBe(409);
  expect((await request(t.app).patch(`/api/users/${me.id}`).set(admin).send({ roles: ['engineer'] })).status).toBe(409);
});

test('an unknown or malformed user id is answered clearly', async () => {
  expect((await request(t.app).patch('/api/users/00000000-0000-4000-8000-000000000000').set(admin).send({ active: true })).status).toBe(404);
  expect((await request(t.app).patch('/api/users/not-an-id').set(admin).send({ active: true })).status).toBe(400);
  expect((await request(t.app).patch('/api/users/00000000-0000-4000-8000-000000000000').set(admin).send({})).status).toBe(400);
});

test('every user route refuses non-administrators with 403', async () => {
  const engineer = { Authorization: `Bearer ${await t.tokenFor('ines')}` };
  expect((await request(t.app).get('/api/users').set(engineer)).status).toBe(403);
  expect((await request(t.app).post('/api/users').set(engineer).send({})).status).toBe(403);
  expect((await request(t.app).patch('/api/users/00000000-0000-4000-8000-000000000000').set(engineer).send({})).status).toBe(403);
});

test('passwords are never returned', async () => {
  const res = await request(t.app).get('/api/users').set(admin);
  expect(JSON.stringify(res.body)).not.toMatch(/password/i);
});
