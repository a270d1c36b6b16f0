import { StyleSheet, View } from 'react-native';
import type { User } from '../../shared/api/auth';
import { space } from '../../lib/theme';
import { Button } from '../Button';
import { canToggleActive, type UserRowActions } from './userActions';

export function UserRowButtons({ user, actions }: { user: User; actions: UserRowActions }) {
  const togglable = canToggleActive(user, actions.currentUserId);
  return (
    <View style={styles.row}>
      <Button label="Edit" variant="secondary" compact onPress={() => actions.onEdit(user)} accessibilityLabel={`Edit ${user.displayName}`} />
      {togglable ? (
        <Button
          label={user.active ? 'Deactivate' : 'Reactivate'}
          variant="quiet"
          compact
          onPress={() => actions.onToggleActive(user)}
          accessibilityLabel={`${user.active ? 'Deactivate' : 'Reactivate'} ${user.displayName}`}
        />
      ) : null}
      {user.lockedUntil ? (
        <Button label="Unlock" variant="quiet" compact onPress={() => actions.onUnlock(user)} accessibilityLabel={`Unlock ${user.displayName}'s account now`} />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
});
