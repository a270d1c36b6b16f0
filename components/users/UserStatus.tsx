import { StyleSheet, View } from 'react-native';
import { colors, space } from '../../lib/theme';
import { AppText } from '../AppText';

/** Active or deactivated, told by word and by shape (filled or hollow dot), never by colour alone; and a lock-out, if any. */
export function UserStatus({ active, lockedUntil = null }: { active: boolean; lockedUntil?: string | null }) {
  return (
    <View style={styles.column}>
      <View style={styles.row}>
        <View aria-hidden style={[styles.dot, active ? styles.dotActive : styles.dotInactive]} />
        <AppText variant="label" tone={active ? 'notice' : 'muted'}>
          {active ? 'Active' : 'Deactivated'}
        </AppText>
      </View>
      {lockedUntil ? (
        <AppText variant="caption" tone="danger">{`⚠ Locked after failed sign-ins until ${new Date(lockedUntil).toLocaleTimeString([], { hour: '2-digit', minute: '2-digit' })}`}</AppText>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  column: { gap: space.xxs },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  dot: { width: 10, height: 10, borderRadius: 5, borderWidth: 2 },
  dotActive: { backgroundColor: colors.notice, borderColor: colors.notice },
  dotInactive: { backgroundColor: 'transparent', borderColor: colors.inkMuted },
});
