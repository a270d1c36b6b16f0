import { Pressable, StyleSheet, View } from 'react-native';
import { ROLE_LABELS, ROLES, type Role } from '../shared/roles';
import { colors, minTouchTarget, radius, space } from '../lib/theme';
import { AppText } from './AppText';

// What each role does, from the product's description of the people who use it.
const ROLE_DUTIES: Record<Role, string> = {
  engineer: 'Builds rules and reference sets, runs trials, submits for review',
  operator: 'Inspects parts at a station with released rules',
  supervisor: 'Reviews and releases rules, watches trends, manages stations',
  auditor: 'Reads and exports records and rule history',
  admin: 'Manages users and roles',
};

interface RolePickerProps {
  value: readonly Role[];
  onChange: (roles: Role[]) => void;
  error?: string;
}

/** Tick any number of roles; a person may hold several. */
export function RolePicker({ value, onChange, error }: RolePickerProps) {
  const toggle = (role: Role) =>
    onChange(value.includes(role) ? value.filter((held) => held !== role) : ROLES.filter((r) => r === role || value.includes(r)));
  return (
    <View style={styles.group}>
      <AppText variant="label">Roles</AppText>
      <View role="group" aria-label="Roles" style={styles.list}>
        {ROLES.map((role) => {
          const checked = value.includes(role);
          return (
            <Pressable
              key={role}
              role="checkbox"
              aria-label={ROLE_LABELS[role]}
              aria-checked={checked}
              accessibilityHint={ROLE_DUTIES[role]}
              onPress={() => toggle(role)}
              style={({ pressed }) => [styles.option, pressed && styles.optionPressed]}
            >
              <View style={[styles.box, checked && styles.boxChecked]}>
                {checked ? (
                  <AppText variant="label" tone="onSteel" style={styles.tick}>
                    ✓
                  </AppText>
                ) : null}
              </View>
              <View style={styles.optionText}>
                <AppText variant="bodyStrong">{ROLE_LABELS[role]}</AppText>
                <AppText variant="caption" tone="muted">
                  {ROLE_DUTIES[role]}
                </AppText>
              </View>
            </Pressable>
          );
        })}
      </View>
      {error ? (
        <AppText variant="caption" tone="danger" accessibilityRole="alert">
          {`⚠ ${error}`}
        </AppText>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  group: { gap: space.xs },
  list: { gap: space.xxs },
  option: {
    minHeight: minTouchTarget,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingVertical: space.xs,
    paddingHorizontal: space.sm,
    borderRadius: radius.md,
  },
  optionPressed: { backgroundColor: colors.steelTint },
  box: {
    width: 24,
    height: 24,
    borderRadius: radius.sm,
    borderWidth: 2,
    borderColor: colors.control,
    alignItems: 'center',
    justifyContent: 'center',
    backgroundColor: colors.surface,
  },
  boxChecked: { backgroundColor: colors.steel, borderColor: colors.steel },
  tick: { lineHeight: 18 },
  optionText: { flexShrink: 1 },
});
