// Who may call each route of the API: the authorisation matrix that tests/api/authorisation-matrix.test.ts
// checks against every route the Express app actually registers (issues 8 and 9).
import type { Express } from 'express';
import type { Role } from '../../shared/roles';

export type Access =
  /** Anyone, signed in or not. */
  | { kind: 'public' }
  /** A signed, expiring image address stands in for sign-in (so that <img> can load it); a bearer token gives nothing. */
  | { kind: 'signed-address' }
  /** Any signed-in person, whatever their roles. */
  | { kind: 'signed-in'; revokesTokens?: boolean }
  /** A signed-in person holding at least one of these roles. */
  | { kind: 'roles'; roles: readonly Role[] };

const PUBLIC: Access = { kind: 'public' };
const SIGNED_ADDRESS: Access = { kind: 'signed-address' };
const SIGNED_IN: Access = { kind: 'signed-in' };
const only = (...roles: Role[]): Access => ({ kind: 'roles', roles });

const ADMIN = only('admin');
const AUDIT_TRAIL = only('auditor', 'admin');
const RULES_READ = only('engineer', 'supervisor', 'auditor', 'operator');
const ENGINEER = only('engineer');
const SUPERVISOR = only('supervisor');
const DESK_READ = only('engineer', 'supervisor', 'auditor');
const STATIONS_MANAGE = only('supervisor', 'admin');
const RECORDS_READ = only('auditor', 'supervisor');
const OPERATOR = only('operator');
const TRENDS_READ = only('supervisor', 'engineer', 'auditor');
const ALERTS_READ = only('supervisor', 'auditor');
const STUDIES_WRITE = only('engineer', 'supervisor');

/** "METHOD /api/path" (Express path syntax) → who may call it. */
export const ROUTE_MATRIX: Readonly<Record<string, Access>> = {
  'GET /api/health': PUBLIC,
  'POST /api/auth/sign-in': PUBLIC,
  'GET /api/auth/me': SIGNED_IN,
  'POST /api/auth/sign-out': { kind: 'signed-in', revokesTokens: true },
  'GET /api/images/:hash/samples': SIGNED_ADDRESS,
  'GET /api/images/:hash': SIGNED_ADDRESS,

  'GET /api/users': ADMIN,
  'POST /api/users': ADMIN,
  'PATCH /api/users/:id': ADMIN,

  'GET /api/audit-events': AUDIT_TRAIL,
  'GET /api/audit-events/verify': AUDIT_TRAIL,
  'GET /api/audit-events/export.csv': AUDIT_TRAIL,

  'GET /api/catalogue/part-types': SIGNED_IN,
  'GET /api/catalogue/defect-kinds': SIGNED_IN,
  'POST /api/catalogue/defect-kinds': only('engineer', 'supervisor'),

  'GET /api/kernels': DESK_READ,
  'POST /api/kernels': ENGINEER,

  'GET /api/stations/lines': SIGNED_IN,
  'POST /api/stations/lines': STATIONS_MANAGE,
  'POST /api/stations': STATIONS_MANAGE,
  'GET /api/stations/:id': SIGNED_IN,
  'PATCH /api/stations/:id': STATIONS_MANAGE,
  'POST /api/stations/:id/calibration': STATIONS_MANAGE,

  'GET /api/reference-sets': DESK_READ,
  'POST /api/reference-sets': ENGINEER,
  'GET /api/reference-sets/:id': DESK_READ,
  'GET /api/reference-sets/:id/images': DESK_READ,
  'POST /api/reference-sets/:id/images': ENGINEER,
  'POST /api/reference-sets/:id/labels': ENGINEER,
  'PATCH /api/reference-sets/images/:id': ENGINEER,

  'GET /api/rules': RULES_READ,
  'POST /api/rules': ENGINEER,
  'GET /api/rules/:id': RULES_READ,
  'GET /api/rules/:id/history': DESK_READ,
  'POST /api/rules/:id/versions': ENGINEER,
  'GET /api/rule-versions/:id': RULES_READ,
  'PUT /api/rule-versions/:id/document': ENGINEER,
  'POST /api/rule-versions/:id/submit': ENGINEER,
  'POST /api/rule-versions/:id/release': SUPERVISOR,
  'POST /api/rule-versions/:id/send-back': SUPERVISOR,
  'POST /api/rule-versions/:id/withdraw': SUPERVISOR,

  'POST /api/trials': ENGINEER,
  'GET /api/trials/:id': DESK_READ,
  'GET /api/trials/:id/results': DESK_READ,
  'GET /api/trials/:id/sweep': DESK_READ,
  'GET /api/rule-versions/:id/trials': DESK_READ,

  'POST /api/preview': only('engineer', 'supervisor'),

  'POST /api/inspections': OPERATOR,
  'GET /api/inspections/:id': only('operator', 'supervisor', 'auditor'),
  'POST /api/inspections/:id/dispute': OPERATOR,
  'GET /api/disputes': only('supervisor', 'auditor'),
  'POST /api/disputes/:id/resolve': SUPERVISOR,

  'GET /api/records/inspections': RECORDS_READ,
  'GET /api/records/inspections.csv': RECORDS_READ,
  'GET /api/records/inspections/:id/report.pdf': RECORDS_READ,
  'GET /api/records/rule-versions/:id/report.pdf': RECORDS_READ,

  'GET /api/trends/choices': TRENDS_READ,
  'GET /api/trends/p-chart': TRENDS_READ,
  'GET /api/trends/pareto': TRENDS_READ,

  'GET /api/alerts': ALERTS_READ,
  'GET /api/alerts/subscription': ALERTS_READ,
  'PUT /api/alerts/subscription': SUPERVISOR,
  'GET /api/alerts/:id': ALERTS_READ,
  'POST /api/alerts/:id/acknowledge': SUPERVISOR,
  'GET /api/alert-limits': ALERTS_READ,
  'POST /api/alert-limits': SUPERVISOR,
  'DELETE /api/alert-limits/:id': SUPERVISOR,

  'POST /api/studies/repeatability': STUDIES_WRITE,
  'GET /api/studies/repeatability': DESK_READ,
  'GET /api/studies/repeatability/:id': DESK_READ,
  'GET /api/studies/attribute-agreement': DESK_READ,
};

export interface RegisteredRoute {
  method: string;
  path: string;
}

interface Layer {
  route?: { path: string | string[]; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
  rawPath?: string | string[];
  slash?: boolean;
}

const join = (prefix: string, path: string) => (prefix + (path === '/' ? '' : path)).replace(/\/{2,}/g, '/') || '/';

function walk(stack: Layer[], prefix: string, out: RegisteredRoute[]): void {
  for (const layer of stack) {
    if (layer.route) {
      const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
      for (const method of Object.keys(layer.route.methods).filter((m) => m !== '_all')) {
        for (const path of paths) out.push({ method: method.toUpperCase(), path: join(prefix, path) });
      }
    } else if (layer.handle?.stack) {
      // A mounted router: its own routes sit under the path it was mounted at ("/" when mounted without one).
      const mount = Array.isArray(layer.rawPath) ? layer.rawPath[0] : (layer.rawPath ?? '/');
      walk(layer.handle.stack, layer.slash ? prefix : join(prefix, mount), out);
    }
  }
}

/** Every route the app registers, found by walking Express 5's router stack (router 2.x layers). */
export function registeredRoutes(app: Express): RegisteredRoute[] {
  const out: RegisteredRoute[] = [];
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '', out);
  return out;
}

export const routeKey = (r: RegisteredRoute) => `${r.method} ${r.path}`;
