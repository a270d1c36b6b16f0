import jwt from 'jsonwebtoken';
import request from 'supertest';
import { signInResponseSchema } from '../../shared/api/auth';
import { apiErrorSchema } from '../../shared/api/errors';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  await t.createUser('ines', ['engineer']);
  await t.createUser('dora', ['operator'], { active: false });
  await t.createUser('adam', ['admin']);
});
afterAll(() => t.close());

const signIn = (body: unknown) => request(t.app).post('/api/auth/sign-in').send(body as object);

describe('sign-in', () => {
  test('right user name and password give a token and the user with roles', async () => {
    const res = await signIn({ username: 'ines', password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    const body = signInResponseSchema.parse(res.body);
    expect(body.user).toMatchObject({ username: 'ines', roles: ['engineer'], active: true });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    expect(new Date(body.expiresAt).getTime()).toBeGreaterThan(Date.now());
  });

  test('user names are matched without regard to case or surrounding spaces', async () => {
    const res = await signIn({ username: '  INES ', password: TEST_PASSWORD });
    expect(res.status).toBe(200);
  });

  test('a wrong password is refused with 401 and the one error shape', async () => {
    const res = await signIn({ username: 'ines', password: 'not-the-password' });
    expect(res.status).toBe(401);
    expect(apiErrorSchema.parse(res.body).error).toMatchObject({ code: 'unauthenticated', message: 'Wrong user name or password' });
  });

  test('an unknown user gets the same answer as a wrong password', async () => {
    const res = await signIn({ username: 'nobody', password: TEST_PASSWORD });
    expect(res.status).toBe(401);
    expect(res.body.error.message).toBe('Wrong user name or password');
  });

  test('a deactivated user is refused', async () => {
    const res = await signIn({ username: 'dora', password: TEST_PASSWORD });
    expect(res.status).toBe(401);
    expect(res.body.error.message).toMatch(/deactivated/);
  });

  test('a malformed body is refused with 400 naming the field', async () => {
    const res = await signIn({ username: 'ines' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.issues).toEqual([expect.objectContaining({ path: 'password' })]);
  });

  test('unknown fields are refused', async () => {
    const res = await signIn({ username: 'ines', password: TEST_PASSWORD, admin: true });
    expect(res.status).toBe(400);
    expect(res.body.error.details.issues[0].message).toMatch(/admin/);
  });

  test('a body that is not JSON gets 400, not a crash', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"username":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
  });
});

describe('tokens', () => {
  test('a route behind sign-in answers 401 without a token', async () => {
    const res = await request(t.app).get('/api/auth/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  test('a valid token reaches /me', async () => {
    const token = await t.tokenFor('ines');
    const res = await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);
    expect(res.status).toBe(200);
    expect(res.body.user.username).toBe('ines');
  });

  test('a token signed with another secret is refused', async () => {
    const forged = jwt.sign({ sub: 'x', tv: 0 }, 'another-secret');
    const res = await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${forged}`);
    expect(res.status).toBe(401);
  });

  test('an expired token is refused and the message says the session expired', async () => {
    const me = await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${await t.tokenFor('ines')}`);
    const expired = jwt.sign({ sub: me.body.user.id, tv: 0, exp: Math.floor(Date.now() / 1000) - 10 }, t.config.jwtSecret);
    const res = await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${expired}`);
    expect(res.status).toBe(401);
    expect(res.body.error.message).toMatch(/expired/);
  });

  test('the token carries the configured expiry', async () => {
    const token = await t.tokenFor('ines');
    const { iat, exp } = jwt.decode(token) as { iat: number; exp: number };
    expect(exp - iat).toBe(t.config.tokenTtlSeconds);
  });

  test('signing out revokes the token', async () => {
    const user = await t.createUser('sam', ['supervisor']);
    const token = await t.tokenFor(user.username);
    const auth = { Authorization: `Bearer ${token}` };
    expect((await request(t.app).post('/api/auth/sign-out').set(auth)).status).toBe(204);
    expect((await request(t.app).get('/api/auth/me').set(auth)).status).toBe(401);
  });

  test('a deactivated user is refused at once, even with an unexpired token', async () => {
    const user = await t.createUser('otto', ['operator']);
    const token = await t.tokenFor('otto');
    await t.db.dataSource.query('update users set active = false where id = $1', [user.id]);
    const res = await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);
    expect(res.status).toBe(401);
  });
});

describe('roles', () => {
  test('a signed-in user without the admin role gets 403 on an admin route', async () => {
    const token = await t.tokenFor('ines');
    const res = await request(t.app).get('/api/users').set('Authorization', `Bearer ${token}`);
    expect(res.status).toBe(403);
    expect(res.body.error).toMatchObject({ code: 'forbidden', message: expect.stringMatching(/Administrator/) });
  });

  test('no token on an admin route is 401, not 403', async () => {
    expect((await request(t.app).get('/api/users')).status).toBe(401);
  });

  test('an unknown API path answers JSON 404 in the error shape (after sign-in)', async () => {
    const token = await t.tokenFor('adam');
    const res = await request(t.app).get('/api/no-such-thing').set('Authorization', `Bearer ${token}`);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('sign-in rate limit', () => {
  test('repeated failures for one user name are refused with 429; other names are not affected', async () => {
    const limited = await createTestApp({ signInLimit: { windowMs: 60_000, maxFailures: 3 } });
    try {
      await limited.createUser('lena', ['engineer']);
      for (let i = 0; i < 3; i++) {
        expect((await request(limited.app).post('/api/auth/sign-in').send({ username: 'lena', password: 'wrong-password' })).status).toBe(401);
      }
      const blocked = await request(limited.app).post('/api/auth/sign-in').send({ username: 'lena', password: TEST_PASSWORD });
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.code).toBe('too_many_requests');
      const other = await request(limited.app).post('/api/auth/sign-in').send({ username: 'nobody', password: 'x' });
      expect(other.status).toBe(401);
    } finally {
      await limited.close();
    }
  });
});

describe('account lock-out', () => {
  // Locking an account after a few consecutive failures is common practice (NIST SP 800-63B §5.2.2
  // asks verifiers to limit failed attempts); the limit here is the test config's 5.
  test('five wrong passwords in a row lock the account, audited; even the right password is refused until an administrator unlocks it', async () => {
    const user = await t.createUser('lotte', ['engineer']);
    for (let i = 0; i < 4; i++) expect((await signIn({ username: 'lotte', password: 'wrong-password' })).status).toBe(401);
    // A success in between starts the count again.
    expect((await signIn({ username: 'lotte', password: TEST_PASSWORD })).status).toBe(200);
    for (let i = 0; i < 5; i++) expect((await signIn({ username: 'lotte', password: 'wrong-password' })).status).toBe(401);

    const locked = await signIn({ username: 'lotte', password: TEST_PASSWORD });
    expect(locked.status).toBe(401);
    expect(locked.body.error.message).toMatch(/locked after repeated failed sign-ins/);
    const events = await t.db.dataSource.query(`select action, details from audit_events where entity_id = $1 order by seq`, [user.id]);
    expect(events.filter((e: { action: string }) => e.action === 'account.locked')).toHaveLength(1);
    expect(events.at(-1)).toMatchObject({ action: 'sign-in.refused', details: { reason: 'account locked' } });

    const admin = { Authorization: `Bearer ${await t.tokenFor('adam')}` };
    const listed = await request(t.app).get('/api/users?q=lotte').set(admin);
    expect(listed.body.items[0].lockedUntil).toEqual(expect.any(String));
    const unlocked = await request(t.app).patch(`/api/users/${user.id}`).set(admin).send({ unlock: true });
    expect(unlocked.status).toBe(200);
    expect(unlocked.body.lockedUntil).toBeNull();
    expect((await signIn({ username: 'lotte', password: TEST_PASSWORD })).status).toBe(200);
  });

  test('a change of roles revokes the tokens issued before it', async () => {
    const user = await t.createUser('rolf', ['operator']);
    const token = await t.tokenFor('rolf');
    const admin = { Authorization: `Bearer ${await t.tokenFor('adam')}` };
    expect((await request(t.app).patch(`/api/users/${user.id}`).set(admin).send({ roles: ['operator', 'engineer'] })).status).toBe(200);
    expect((await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`)).status).toBe(401);
    // A change that touches no role leaves the token alone.
    const fresh = await t.tokenFor('rolf');
    expect((await request(t.app).patch(`/api/users/${user.id}`).set(admin).send({ displayName: 'Rolf Brandt' })).status).toBe(200);
    expect((await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${fresh}`)).status).toBe(200);
  });
});
