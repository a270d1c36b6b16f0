import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import type { User } from '../shared/api/auth';
import { useLayout } from '../hooks/useLayout';
import { colors } from '../lib/theme';
import { LeaveGuardDialog } from './LeaveGuardDialog';
import { NavRail } from './NavRail';
import { TabBar } from './TabBar';

/** The frame of the signed-in area: a side rail on a wide screen, bottom tabs on a phone. */
export function AppShell({ user, children }: { user: User; children: ReactNode }) {
  const layout = useLayout();
  if (layout === 'wide') {
    return (
      <View style={[styles.root, styles.row]}>
        <NavRail user={user} />
        <View style={styles.main}>{children}</View>
        <LeaveGuardDialog />
      </View>
    );
  }
  return (
    <View style={styles.root}>
      <View style={styles.main}>{children}</View>
      <TabBar user={user} />
      <LeaveGuardDialog />
    </View>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: colors.paper },
  row: { flexDirection: 'row' },
  main: { flex: 1 },
});
