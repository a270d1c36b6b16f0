import { StyleSheet, View } from 'react-native';
import { colors, space } from '../../lib/theme';
import { AppText } from '../AppText';

/** Active or deactivated, told by word and by shape (filled or hollow dot), never by colour alone. */
export function UserStatus({ active }: { active: boolean }) {
  return (
    <View style={styles.row}>
      <View aria-hidden style={[styles.dot, active ? styles.dotActive : styles.dotInactive]} />
      <AppText variant="label" tone={active ? 'notice' : 'muted'}>
        {active ? 'Active' : 'Deactivated'}
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  dot: { width: 10, height: 10, borderRadius: 5, borderWidth: 2 },
  dotActive: { backgroundColor: colors.notice, borderColor: colors.notice },
  dotInactive: { backgroundColor: 'transparent', borderColor: colors.inkMuted },
});
