import { StyleSheet, View } from 'react-native';
import { ROLE_LABELS, type Role } from '../shared/roles';
import { colors, radius, space } from '../lib/theme';
import { AppText } from './AppText';

/** The roles a person holds, as small labelled chips (read-only). */
export function RoleChips({ roles, tone = 'light' }: { roles: readonly Role[]; tone?: 'light' | 'onSteel' }) {
  return (
    <View style={styles.row} accessibilityLabel={`Roles: ${roles.map((role) => ROLE_LABELS[role]).join(', ')}`}>
      {roles.map((role) => (
        <View key={role} style={[styles.chip, tone === 'onSteel' && styles.chipOnSteel]}>
          <AppText variant="caption" tone={tone === 'onSteel' ? 'onSteel' : 'steel'}>
            {ROLE_LABELS[role]}
          </AppText>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  chip: {
    paddingHorizontal: space.sm,
    paddingVertical: space.xxs,
    borderRadius: radius.pill,
    backgroundColor: colors.steelTint,
  },
  chipOnSteel: { backgroundColor: 'rgba(255,255,255,0.14)' },
});
