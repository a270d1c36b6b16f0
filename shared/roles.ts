// The people who use Kernwright (DESIGN.md, "People and roles"). A person may hold several roles.
export const ROLES = ['engineer', 'operator', 'supervisor', 'auditor', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  engineer: 'Quality engineer',
  operator: 'Line operator',
  supervisor: 'Supervisor',
  auditor: 'Auditor',
  admin: 'Administrator',
};

export function hasAnyRole(userRoles: readonly Role[], allowed: readonly Role[]): boolean {
  return userRoles.some((role) => allowed.includes(role));
}
