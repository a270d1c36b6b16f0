// Users as a table, for a wide screen.
import { StyleSheet, View } from 'react-native';
import type { User } from '../../shared/api/auth';
import { formatDate } from '../../lib/format';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { RoleChips } from '../RoleChips';
import { UserRowButtons } from './UserRowButtons';
import { UserStatus } from './UserStatus';
import type { UserRowActions } from './userActions';

const COLUMNS = [
  { key: 'name', title: 'Name', style: { flex: 1.7 } },
  { key: 'roles', title: 'Roles', style: { flex: 1.7 } },
  { key: 'email', title: 'E-mail', style: { flex: 3.3 } },
  { key: 'status', title: 'Status', style: { width: 132 } },
  { key: 'added', title: 'Added', style: { width: 116 } },
  { key: 'actions', title: 'Actions', style: { width: 168 } },
] as const;
type ColumnKey = (typeof COLUMNS)[number]['key'];
const columnStyle = (key: ColumnKey) => COLUMNS.find((column) => column.key === key)!.style;

export function UsersTable({ users, actions }: { users: readonly User[]; actions: UserRowActions }) {
  return (
    <View role="table" aria-label="Users" style={styles.table}>
      <View role="row" style={[styles.row, styles.headerRow]}>
        {COLUMNS.map((column) => (
          <View key={column.key} role="columnheader" style={[styles.cell, column.style]}>
            <AppText variant="label" tone="muted">
              {column.title}
            </AppText>
          </View>
        ))}
      </View>
      {users.map((user, index) => (
        <View key={user.id} role="row" style={[styles.row, index > 0 && styles.rowDivider, !user.active && styles.rowInactive]}>
          <View role="cell" style={[styles.cell, columnStyle('name')]}>
            <AppText variant="bodyStrong" numberOfLines={1}>
              {user.id === actions.currentUserId ? `${user.displayName} (you)` : user.displayName}
            </AppText>
            <AppText variant="caption" tone="muted" numberOfLines={1}>
              {user.username}
            </AppText>
          </View>
          <View role="cell" style={[styles.cell, columnStyle('roles')]}>
            <RoleChips roles={user.roles} />
          </View>
          <View role="cell" style={[styles.cell, columnStyle('email')]}>
            <AppText tone={user.email ? 'default' : 'muted'} numberOfLines={1}>
              {user.email ?? 'None'}
            </AppText>
          </View>
          <View role="cell" style={[styles.cell, columnStyle('status')]}>
            <UserStatus active={user.active} lockedUntil={user.lockedUntil} />
          </View>
          <View role="cell" style={[styles.cell, columnStyle('added')]}>
            <AppText numberOfLines={1}>{formatDate(user.createdAt)}</AppText>
          </View>
          <View role="cell" style={[styles.cell, columnStyle('actions')]}>
            <UserRowButtons user={user} actions={actions} />
          </View>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  table: {
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radius.lg,
    overflow: 'hidden',
  },
  row: { flexDirection: 'row', alignItems: 'center', paddingHorizontal: space.sm, minHeight: 60 },
  headerRow: { backgroundColor: colors.surfaceSunken, minHeight: 44 },
  rowDivider: { borderTopWidth: 1, borderTopColor: colors.line },
  rowInactive: { backgroundColor: colors.surfaceMuted },
  cell: { paddingHorizontal: space.sm, paddingVertical: space.sm, justifyContent: 'center', minWidth: 0 },
});
