// Which areas of Kernwright each role may use, and what each person can do next there.
// The navigation, the home screen and every area screen's access check read this one module.
import type { Role } from '../shared/roles';

export type AreaKey =
  | 'home'
  | 'inspect'
  | 'review'
  | 'rules'
  | 'reference-sets'
  | 'stations'
  | 'trends'
  | 'records'
  | 'users';

export interface Area {
  key: AreaKey;
  /** Name in the navigation and the screen title. */
  title: string;
  href: string;
  /** Roles that may use the area; `everyone` for any signed-in person. */
  roles: readonly Role[] | 'everyone';
  /** One line on what happens there, for the home screen and the area's empty state. */
  purpose: string;
  /** What the area shows while nothing has been recorded in it yet. */
  emptyTitle: string;
}

/** In navigation order. */
export const AREAS: readonly Area[] = [
  {
    key: 'home',
    title: 'Home',
    href: '/',
    roles: 'everyone',
    purpose: 'What you can do next with your roles.',
    emptyTitle: '',
  },
  {
    key: 'inspect',
    title: 'Inspect',
    href: '/inspect',
    roles: ['operator'],
    purpose:
      'Choose your station and a released rule, photograph a part and get its verdict: PASS, FAIL, or RETAKE when the photo is unusable.',
    emptyTitle: 'No released rules to inspect with yet',
  },
  {
    key: 'review',
    title: 'Review',
    href: '/review',
    roles: ['supervisor'],
    purpose:
      'Rule versions submitted by engineers wait here to be released or sent back with a note. Nobody releases a version they authored.',
    emptyTitle: 'Nothing waiting for review',
  },
  {
    key: 'rules',
    title: 'Rules',
    href: '/rules',
    roles: ['engineer', 'supervisor', 'auditor'],
    purpose:
      'Inspection rules: a pipeline of image steps followed by gauges with limits, versioned from draft to in review, released and withdrawn.',
    emptyTitle: 'No rules yet',
  },
  {
    key: 'reference-sets',
    title: 'Reference sets',
    href: '/reference-sets',
    roles: ['engineer'],
    purpose:
      'Labelled photos of known good and known defective parts, used to try a rule and tune its limits before it reaches the line.',
    emptyTitle: 'No reference sets yet',
  },
  {
    key: 'stations',
    title: 'Stations',
    href: '/stations',
    roles: ['supervisor', 'admin'],
    purpose:
      'The inspection stations on each line, with their calibration in millimetres per pixel so that gauges report mm and mm².',
    emptyTitle: 'No stations yet',
  },
  {
    key: 'trends',
    title: 'Trends',
    href: '/trends',
    // Auditors read the charts and alerts (and the records behind them); only supervisors act on alerts.
    roles: ['supervisor', 'auditor'],
    purpose:
      'Defect rates per rule, station and shift on p-charts with control limits, and the causes of defects ranked by count.',
    emptyTitle: 'No inspections to chart yet',
  },
  {
    key: 'records',
    title: 'Records',
    href: '/records',
    roles: ['supervisor', 'auditor'],
    purpose:
      'Every inspection, kept unchanged with its measurements and the exact rule version used, ready to export.',
    emptyTitle: 'No inspection records yet',
  },
  {
    key: 'users',
    title: 'Users',
    href: '/admin/users',
    roles: ['admin'],
    purpose: 'The people who use Kernwright, their roles, and whether their account is active.',
    emptyTitle: 'No users match',
  },
];

export function findArea(key: AreaKey): Area {
  const area = AREAS.find((candidate) => candidate.key === key);
  if (!area) throw new Error(`Unknown area ${key}`);
  return area;
}

export function canUseArea(roles: readonly Role[], key: AreaKey): boolean {
  const area = findArea(key);
  return area.roles === 'everyone' || area.roles.some((role) => roles.includes(role));
}

/** The union of the areas of every role the person holds, in navigation order. */
export function areasForRoles(roles: readonly Role[]): Area[] {
  return AREAS.filter((area) => canUseArea(roles, area.key));
}

/** The area a path belongs to (`/rules/12` belongs to Rules), for marking the current place. */
export function areaForPath(pathname: string): Area | undefined {
  const path = pathname.replace(/\/+$/, '') || '/';
  if (path === '/') return findArea('home');
  return AREAS.find((area) => area.href !== '/' && (path === area.href || path.startsWith(`${area.href}/`)));
}

export interface NextStep {
  text: string;
  area: AreaKey;
}

/** The home screen's "what you can do next", per role, in the plant's words. */
export const NEXT_STEPS: Record<Role, readonly NextStep[]> = {
  engineer: [
    { text: 'Build an inspection rule: smoothing, edge detection, thresholding and clean-up steps, then gauges with limits.', area: 'rules' },
    { text: 'Gather a reference set of labelled photos, known good and known defective, to try your rules on.', area: 'reference-sets' },
    { text: 'Submit a rule version for review once its trial shows acceptable false rejects and escapes.', area: 'rules' },
  ],
  operator: [
    { text: 'Choose your station and a released rule, then photograph parts to get PASS, FAIL or RETAKE.', area: 'inspect' },
    { text: 'Flag a verdict you disagree with: a qualified person decides on disputed parts.', area: 'inspect' },
  ],
  supervisor: [
    { text: 'Review rule versions submitted by engineers, then release them or send them back with a note.', area: 'review' },
    { text: 'Watch defect rates per rule, station and shift, and act on out-of-control signals.', area: 'trends' },
    { text: 'Keep the stations and their calibration up to date.', area: 'stations' },
    { text: 'Look up inspection records.', area: 'records' },
  ],
  auditor: [
    { text: 'Look up inspection records and export them.', area: 'records' },
    { text: 'Read the change history of every rule: who changed, reviewed and released which version, and why.', area: 'rules' },
  ],
  admin: [
    { text: 'Add people, give them their roles, and deactivate the accounts of people who have left.', area: 'users' },
    { text: 'Set up the stations on each line.', area: 'stations' },
  ],
};

/** Where to go after signing in: the page the person asked for, if it is one of ours; else Home. */
export function safeReturnPath(next: string | undefined): string {
  // Only a path on this site: "//host" and "/\\host" would leave it.
  if (!next || !/^\/(?![/\\])\S*$/.test(next) || next.startsWith('/sign-in')) return '/';
  return next;
}
