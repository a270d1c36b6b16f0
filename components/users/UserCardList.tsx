// Users as a list of cards, for a phone: the table's columns become labelled lines.
import { StyleSheet, View } from 'react-native';
import type { User } from '../../shared/api/auth';
import { formatDate } from '../../lib/format';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Card } from '../Card';
import { RoleChips } from '../RoleChips';
import { UserRowButtons } from './UserRowButtons';
import { UserStatus } from './UserStatus';
import type { UserRowActions } from './userActions';

export function UserCardList({ users, actions }: { users: readonly User[]; actions: UserRowActions }) {
  return (
    <View role="list" aria-label="Users" style={styles.list}>
      {users.map((user) => (
        <Card key={user.id} role="listitem" style={styles.card}>
          <View style={styles.top}>
            <View style={styles.name}>
              <AppText variant="bodyStrong">{user.id === actions.currentUserId ? `${user.displayName} (you)` : user.displayName}</AppText>
              <AppText variant="caption" tone="muted">
                {user.username}
              </AppText>
            </View>
            <UserStatus active={user.active} lockedUntil={user.lockedUntil} />
          </View>
          <RoleChips roles={user.roles} />
          <AppText variant="caption" tone="muted">
            {`${user.email ?? 'No e-mail'} · added ${formatDate(user.createdAt)}`}
          </AppText>
          <UserRowButtons user={user} actions={actions} />
        </Card>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.md },
  card: { gap: space.sm },
  top: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-start', gap: space.md },
  name: { flexShrink: 1 },
});
