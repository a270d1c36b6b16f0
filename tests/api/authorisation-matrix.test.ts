// Every route the app registers, asked by eight callers: nobody, an expired token, a deactivated user's
// token, and one person of each role. The expected answer comes from tests/support/route-matrix.ts:
// 401 without a valid sign-in, 403 for a role the route does not serve, and otherwise anything but
// 401/403 (400/404/409 from an empty request count as let through). No request may cause a 500.
// 21 CFR 11.10(d) and (g) (REFERENCES.md §10) ask for access limited to authorised people and authority checks.
import type { Server } from 'node:http';
import jwt from 'jsonwebtoken';
import request from 'supertest';
import { ROLES, type Role } from '../../shared/roles';
import { createTestApp, type TestApp } from '../support/app';
import { registeredRoutes, routeKey, ROUTE_MATRIX, type Access, type RegisteredRoute } from '../support/route-matrix';

jest.setTimeout(120_000);

type Caller = 'nobody' | 'expired token' | 'deactivated user' | Role;
const CALLERS: readonly Caller[] = ['nobody', 'expired token', 'deactivated user', ...ROLES];
const WRITE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
// Signing in and out changes no record, only the caller's own session.
const SESSION_ROUTES = new Set(['POST /api/auth/sign-in', 'POST /api/auth/sign-out']);
const NO_SUCH_ID = '00000000-0000-4000-8000-000000000000';
const NO_SUCH_HASH = 'f'.repeat(64);

let t: TestApp;
let server: Server;
let routes: RegisteredRoute[];
const tokens = new Map<Caller, string>();

/** A concrete address for a route path: ids that exist nowhere, a well-formed image hash. */
function concrete(path: string): string {
  return path.replace(/:hash/g, NO_SUCH_HASH).replace(/:[A-Za-z]+/g, NO_SUCH_ID);
}

type Expected = 401 | 403 | 'let through';

function expected(access: Access, caller: Caller): Expected {
  if (access.kind === 'public') return 'let through';
  // Without a valid signature the image routes refuse everyone, whatever token comes along.
  if (access.kind === 'signed-address') return 403;
  if (caller === 'nobody' || caller === 'expired token' || caller === 'deactivated user') return 401;
  if (access.kind === 'signed-in') return 'let through';
  return access.roles.includes(caller) ? 'let through' : 403;
}

async function call(route: RegisteredRoute, caller: Caller): Promise<request.Response> {
  const agent = request(server);
  const url = concrete(route.path) + (route.path.startsWith('/api/images/') ? '?exp=1&sig=not-a-signature' : '');
  const method = route.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
  let req = agent[method](url);
  const token = tokens.get(caller);
  if (token) req = req.set('Authorization', `Bearer ${token}`);
  return WRITE_METHODS.has(route.method) ? req.send({}) : req;
}

async function signIn(username: string): Promise<string> {
  return t.tokenFor(username);
}

beforeAll(async () => {
  t = await createTestApp();
  server = t.app.listen(0, '127.0.0.1');
  routes = registeredRoutes(t.app);
  for (const role of ROLES) {
    await t.createUser(`m-${role}`, [role]);
    tokens.set(role, await signIn(`m-${role}`));
  }
  // Every role, so that only the expiry or the deactivation can be the reason for a refusal.
  await t.createUser('m-expired', [...ROLES]);
  const live = jwt.decode(await signIn('m-expired')) as { sub: string; tv: number };
  tokens.set('expired token', jwt.sign({ sub: live.sub, tv: live.tv, exp: Math.floor(Date.now() / 1000) - 60 }, t.config.jwtSecret, { algorithm: 'HS256' }));
  const leaver = await t.createUser('m-leaver', [...ROLES]);
  tokens.set('deactivated user', await signIn('m-leaver'));
  await t.db.dataSource.query('update users set active = false where id = $1', [leaver.id]);
});
afterAll(async () => {
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await t.close();
});

test('the app registers routes, and the walk finds routes of routers mounted with and without a path', () => {
  const keys = routes.map(routeKey);
  expect(keys).toEqual(expect.arrayContaining(['GET /api/health', 'GET /api/rules/:id/history', 'PATCH /api/users/:id', 'GET /api/records/inspections.csv']));
  expect(new Set(keys).size).toBe(keys.length);
});

test('every registered route has an entry in the matrix', () => {
  const missing = routes.map(routeKey).filter((key) => !(key in ROUTE_MATRIX));
  expect(missing).toEqual([]);
});

test('every entry of the matrix is a route the app registers', () => {
  const registered = new Set(routes.map(routeKey));
  expect(Object.keys(ROUTE_MATRIX).filter((key) => !registered.has(key))).toEqual([]);
});

test('each route answers each caller as the matrix says, and never with a server error', async () => {
  const wrong: string[] = [];
  // Routes that revoke the caller's tokens go last; the caller signs in again after each.
  const ordered = [...routes].filter((r) => routeKey(r) in ROUTE_MATRIX).sort((a, b) => Number(!!revokes(a)) - Number(!!revokes(b)));
  for (const route of ordered) {
    const access = ROUTE_MATRIX[routeKey(route)];
    for (const caller of CALLERS) {
      const res = await call(route, caller);
      const want = expected(access, caller);
      const ok = res.status < 500 && (want === 'let through' ? res.status !== 401 && res.status !== 403 : res.status === want);
      if (!ok) wrong.push(`${routeKey(route)} as ${caller}: expected ${want}, got ${res.status} ${JSON.stringify(res.body?.error?.message ?? '')}`);
      if (revokes(route) && (ROLES as readonly string[]).includes(caller)) tokens.set(caller, await signIn(`m-${caller}`));
    }
  }
  expect(wrong).toEqual([]);
});

function revokes(route: RegisteredRoute): boolean {
  const access = ROUTE_MATRIX[routeKey(route)];
  return access?.kind === 'signed-in' && access.revokesTokens === true;
}

test('auditors are read-only everywhere: every write route refuses them with 403', async () => {
  const writes = routes.filter((r) => WRITE_METHODS.has(r.method) && !SESSION_ROUTES.has(routeKey(r)));
  expect(writes.length).toBeGreaterThan(20);
  const answers = await Promise.all(writes.map(async (r) => `${routeKey(r)} → ${(await call(r, 'auditor')).status}`));
  expect(answers.filter((a) => !a.endsWith('→ 403'))).toEqual([]);
});

test('a signed image address stands in for sign-in: no token needed, only a valid signature', async () => {
  const { exp, sig } = Object.fromEntries(new URL(t.services.signer.url(NO_SUCH_HASH), 'http://x').searchParams) as { exp: string; sig: string };
  const res = await request(server).get(`/api/images/${NO_SUCH_HASH}?exp=${exp}&sig=${encodeURIComponent(sig)}`);
  expect(res.status).toBe(404);
});
