// SQL injection attempts through every filter, sort and cursor parameter of the list routes, and
// secrets kept out of answers and logs. Injection strings are the classic ones (OWASP Testing
// Guide v4.2, WSTG-INPV-05, "SQL Injection": tautologies, stacked queries, comment truncation).
import { Writable } from 'node:stream';
import request from 'supertest';
import { createApp } from '../../server/app';
import { createLogger } from '../../server/lib/logger';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

let t: TestApp;
const auth: Record<string, { Authorization: string }> = {};

const PAYLOADS = [
  `' OR '1'='1`,
  `' OR 1=1 --`,
  `'; DROP TABLE users; --`,
  `1); DELETE FROM audit_events; --`,
  `" OR ""="`,
  `') UNION SELECT password_hash, username FROM users --`,
  `%' AND pg_sleep(5) IS NULL AND '%'='`,
  `\\'; SELECT 1; --`,
  `$1`,
];

/** Every list route and the query parameters it reads, with the role that may read it. */
const RANGE = { from: '2026-10-01T00:00:00Z', to: '2026-11-01T00:00:00Z' };
const TREND_PARAMS = ['from', 'to', 'ruleId', 'stationId', 'lineId', 'partType'];

const TARGETS: { path: string; role: string; params: string[]; base?: Record<string, string> }[] = [
  { path: '/api/users', role: 'admin', params: ['q', 'role', 'active', 'limit', 'offset'] },
  { path: '/api/rules', role: 'engineer', params: ['q', 'state', 'partType', 'owner', 'limit', 'offset'] },
  {
    path: '/api/records/inspections',
    role: 'auditor',
    params: ['from', 'to', 'lineId', 'stationId', 'ruleId', 'ruleVersionId', 'verdict', 'operatorId', 'disputed', 'partType', 'cause', 'order', 'after', 'limit'],
  },
  { path: '/api/records/inspections.csv', role: 'auditor', params: ['cause', 'partType', 'order', 'after'] },
  { path: '/api/audit-events', role: 'auditor', params: ['entityType', 'entityId', 'action', 'before', 'limit'] },
  { path: '/api/disputes', role: 'supervisor', params: ['state', 'limit', 'offset'] },
  { path: '/api/trends/p-chart', role: 'supervisor', params: [...TREND_PARAMS, 'bucket', 'runRules'], base: RANGE },
  { path: '/api/trends/pareto', role: 'supervisor', params: TREND_PARAMS, base: RANGE },
  { path: '/api/alerts', role: 'supervisor', params: ['state', 'after', 'limit'] },
  { path: '/api/studies/attribute-agreement', role: 'supervisor', params: ['ruleId', 'from', 'to'], base: { source: 'disputes', ruleId: '00000000-0000-4000-8000-000000000000' } },
];

/** The rows an answer lists, whatever the route calls them. */
function listed(body: Record<string, unknown>): number | null {
  for (const key of ['items', 'points', 'bars']) if (Array.isArray(body[key])) return (body[key] as unknown[]).length;
  return null;
}

async function tableCounts(): Promise<unknown> {
  const [row] = await t.db.dataSource.query(`select (select count(*) from users) as users, (select count(*) from rules) as rules`);
  return row;
}

beforeAll(async () => {
  t = await createTestApp();
  for (const role of ['admin', 'engineer', 'auditor', 'supervisor'] as const) {
    await t.createUser(role, [role]);
    auth[role] = { Authorization: `Bearer ${await t.tokenFor(role)}` };
  }
});
afterAll(() => t.close());

test.each(TARGETS)('$path: injection strings in every parameter are refused or match nothing, and change nothing', async ({ path, role, params, base }) => {
  const before = await tableCounts();
  const changes = () => t.db.dataSource.query(`select count(*)::int as n from audit_events where action not like 'export.%'`);
  const changesBefore = await changes();
  for (const param of params) {
    for (const payload of PAYLOADS) {
      const res = await request(t.app).get(path).query({ ...base, [param]: payload }).set(auth[role]);
      // 400: the parameter's schema refused it. 200: it was taken as plain text and matched nothing.
      expect({ param, payload, refusedOrRead: [200, 400].includes(res.status) }).toEqual({ param, payload, refusedOrRead: true });
      if (res.status === 200) expect({ param, payload, listed: listed(res.body) ?? 0 }).toEqual({ param, payload, listed: 0 });
      expect(res.text).not.toMatch(/\$2[aby]\$/); // no bcrypt hash ever comes back
    }
  }
  expect(await tableCounts()).toEqual(before);
  // Only reads happened: nothing but export events entered the audit trail.
  expect(await changes()).toEqual(changesBefore);
});

test('no answer carries a password or its hash, and the log holds no password, token or hash', async () => {
  const lines: string[] = [];
  const sink = new Writable({
    write(chunk, _encoding, done) {
      lines.push(String(chunk));
      done();
    },
  });
  const logged = createApp({ config: t.config, services: t.services, logger: createLogger('debug', sink) });
  const signIn = await request(logged).post('/api/auth/sign-in').send({ username: 'admin', password: TEST_PASSWORD });
  expect(signIn.status).toBe(200);
  const token: string = signIn.body.token;
  const wrong = await request(logged).post('/api/auth/sign-in').send({ username: 'admin', password: 'wrong-but-secret-42' });
  expect(wrong.status).toBe(401);
  const created = await request(logged)
    .post('/api/users')
    .set('Authorization', `Bearer ${token}`)
    .send({ username: 'newbie', displayName: 'New Person', password: 'a-long-new-password-7', roles: ['operator'] });
  expect(created.status).toBe(201);
  const list = await request(logged).get('/api/users').set('Authorization', `Bearer ${token}`);
  const [{ password_hash: hash }] = await t.db.dataSource.query(`select password_hash from users where username = 'newbie'`);

  for (const body of [signIn.text, created.text, list.text]) {
    expect(body).not.toMatch(/password/i);
    expect(body).not.toContain(hash);
  }
  const log = lines.join('');
  expect(log.length).toBeGreaterThan(0);
  for (const secret of [TEST_PASSWORD, 'wrong-but-secret-42', 'a-long-new-password-7', token, hash, t.config.jwtSecret]) expect(log).not.toContain(secret);
});
