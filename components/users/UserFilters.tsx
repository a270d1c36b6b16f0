import { StyleSheet, View } from 'react-native';
import { ROLE_LABELS, ROLES, type Role } from '../../shared/roles';
import { space } from '../../lib/theme';
import { ChoiceChips, type Choice } from '../ChoiceChips';
import { TextField } from '../TextField';

export interface UserFilterValues {
  search: string;
  role: Role | null;
  active: boolean | null;
}

const ROLE_CHOICES: readonly Choice<Role | null>[] = [
  { value: null, label: 'Any role' },
  ...ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role] })),
];

const STATUS_CHOICES: readonly Choice<boolean | null>[] = [
  { value: null, label: 'Any status' },
  { value: true, label: 'Active' },
  { value: false, label: 'Deactivated' },
];

interface UserFiltersProps {
  values: UserFilterValues;
  onChange: (values: UserFilterValues) => void;
}

export function UserFilters({ values, onChange }: UserFiltersProps) {
  return (
    <View accessibilityRole="search" style={styles.filters}>
      <TextField
        label="Search"
        placeholder="Name or user name"
        value={values.search}
        onChangeText={(search) => onChange({ ...values, search })}
        autoCapitalize="none"
        autoCorrect={false}
        inputMode="search"
      />
      <ChoiceChips label="Role" choices={ROLE_CHOICES} value={values.role} onChange={(role) => onChange({ ...values, role })} />
      <ChoiceChips label="Status" choices={STATUS_CHOICES} value={values.active} onChange={(active) => onChange({ ...values, active })} />
    </View>
  );
}

const styles = StyleSheet.create({
  filters: { gap: space.md },
});
