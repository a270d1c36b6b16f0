import { ROLE_LABELS, ROLES, type Role } from '../shared/roles';
import { CheckList } from './CheckList';

// What each role does, from the product's description of the people who use it.
const ROLE_DUTIES: Record<Role, string> = {
  engineer: 'Builds rules and reference sets, runs trials, submits for review',
  operator: 'Inspects parts at a station with released rules',
  supervisor: 'Reviews and releases rules, watches trends, manages stations',
  auditor: 'Reads and exports records and rule history',
  admin: 'Manages users and roles',
};

const ROLE_ITEMS = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role], detail: ROLE_DUTIES[role], accessibilityHint: ROLE_DUTIES[role] }));

interface RolePickerProps {
  value: readonly Role[];
  onChange: (roles: Role[]) => void;
  error?: string;
}

/** Tick any number of roles; a person may hold several. */
export function RolePicker({ value, onChange, error }: RolePickerProps) {
  return <CheckList label="Roles" items={ROLE_ITEMS} value={value} onChange={onChange} error={error} />;
}
