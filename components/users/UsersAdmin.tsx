// The administrator's screen for users and roles: search, filter, page through, add, edit, deactivate.
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { User } from '../../shared/api/auth';
import { findArea } from '../../lib/navigation';
import { colors, radius, space } from '../../lib/theme';
import { useDebouncedValue } from '../../hooks/useDebouncedValue';
import { useLayout } from '../../hooks/useLayout';
import { useSession } from '../../hooks/useSession';
import { useUpdateUser, useUserList } from '../../hooks/useUsers';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ConfirmDialog } from '../ConfirmDialog';
import { Pagination } from '../Pagination';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { UserCardList } from './UserCardList';
import { UserFilters, type UserFilterValues } from './UserFilters';
import { UserFormDialog } from './UserFormDialog';
import { UsersTable } from './UsersTable';
import type { UserRowActions } from './userActions';

const PAGE_SIZE = 20;
const NO_FILTERS: UserFilterValues = { search: '', role: null, active: null };

type Editing = { kind: 'create' } | { kind: 'edit'; user: User } | null;

function confirmationText(user: User): { title: string; message: string; confirmLabel: string } {
  if (user.active) {
    return {
      title: `Deactivate ${user.displayName}?`,
      message: `${user.displayName} (${user.username}) will be signed out at once and can no longer sign in. Their inspections, rules and audit events stay in the records. You can reactivate the account later.`,
      confirmLabel: 'Deactivate',
    };
  }
  return {
    title: `Reactivate ${user.displayName}?`,
    message: `${user.displayName} (${user.username}) will be able to sign in again with their current password and roles.`,
    confirmLabel: 'Reactivate',
  };
}

export function UsersAdmin() {
  const layout = useLayout();
  const { user: me } = useSession();
  const [filters, setFilters] = useState<UserFilterValues>(NO_FILTERS);
  const [offset, setOffset] = useState(0);
  const [editing, setEditing] = useState<Editing>(null);
  const [toggling, setToggling] = useState<User | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const search = useDebouncedValue(filters.search, 300);
  const list = useUserList({ search, role: filters.role, active: filters.active, limit: PAGE_SIZE, offset });
  const toggleActive = useUpdateUser();

  if (!me) return null;

  const changeFilters = (next: UserFilterValues) => {
    setFilters(next);
    setOffset(0);
  };
  const actions: UserRowActions = {
    currentUserId: me.id,
    onEdit: (user) => setEditing({ kind: 'edit', user }),
    onToggleActive: (user) => {
      toggleActive.reset();
      setToggling(user);
    },
    onUnlock: (user) =>
      toggleActive.mutate({ id: user.id, changes: { unlock: true } }, { onSuccess: (saved) => setNotice(`${saved.displayName} can sign in again.`) }),
  };
  const confirmToggle = () => {
    if (!toggling) return;
    toggleActive.mutate(
      { id: toggling.id, changes: { active: !toggling.active } },
      {
        onSuccess: (saved) => {
          setNotice(`${saved.displayName} is now ${saved.active ? 'active' : 'deactivated'}.`);
          setToggling(null);
        },
      },
    );
  };

  const filtered = filters.search !== '' || filters.role !== null || filters.active !== null;
  const data = list.data;

  return (
    <Screen
      title={findArea('users').title}
      subtitle="The people who use Kernwright, their roles, and whether they can sign in."
      actions={<Button label="Add user" onPress={() => setEditing({ kind: 'create' })} />}
    >
      <View style={styles.filterBand}>
        <UserFilters values={filters} onChange={changeFilters} />
      </View>
      {notice ? (
        <View role="status" style={styles.notice}>
          <AppText variant="bodyStrong" tone="notice" style={styles.noticeText}>{`✓ ${notice}`}</AppText>
          <Button label="Dismiss" variant="quiet" compact onPress={() => setNotice(null)} />
        </View>
      ) : null}
      {list.isError && !data ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : !data ? (
        <LoadingState label="Loading users…" />
      ) : data.items.length === 0 ? (
        <EmptyState
          title={filtered ? 'No users match' : 'No users yet'}
          body={filtered ? 'Nobody matches this search and these filters.' : 'Add the first person who will use Kernwright.'}
          action={filtered ? <Button label="Clear search and filters" variant="secondary" onPress={() => changeFilters(NO_FILTERS)} /> : undefined}
        />
      ) : (
        <View style={[styles.results, list.isPlaceholderData && styles.stale]} aria-busy={list.isFetching}>
          {list.isError ? <ErrorState error={list.error} onRetry={() => void list.refetch()} /> : null}
          {layout === 'wide' ? <UsersTable users={data.items} actions={actions} /> : <UserCardList users={data.items} actions={actions} />}
          <Pagination offset={offset} limit={PAGE_SIZE} shown={data.items.length} total={data.total} noun="users" onChange={setOffset} />
        </View>
      )}

      {editing ? (
        <UserFormDialog
          user={editing.kind === 'edit' ? editing.user : undefined}
          currentUserId={me.id}
          onClose={() => setEditing(null)}
          onSaved={(saved, created) => {
            setEditing(null);
            setNotice(created ? `Added ${saved.displayName}.` : `Saved changes to ${saved.displayName}.`);
          }}
        />
      ) : null}
      {toggling ? (
        <ConfirmDialog
          visible
          {...confirmationText(toggling)}
          destructive={toggling.active}
          busy={toggleActive.isPending}
          error={toggleActive.error}
          onConfirm={confirmToggle}
          onCancel={() => setToggling(null)}
        />
      ) : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  filterBand: {
    padding: space.lg,
    borderRadius: radius.lg,
    backgroundColor: colors.surfaceSunken,
  },
  notice: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingLeft: space.md,
    borderRadius: radius.md,
    borderLeftWidth: 4,
    borderLeftColor: colors.notice,
    backgroundColor: colors.noticeTint,
  },
  noticeText: { flex: 1 },
  results: { gap: space.md },
  stale: { opacity: 0.6 },
});
