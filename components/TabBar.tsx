// Navigation on a phone: tabs along the bottom edge. Home and the first areas get a tab of their
// own; the rest, the signed-in person and Sign out sit behind the last tab, "Menu".
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { Link, router, usePathname } from 'expo-router';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import type { User } from '../shared/api/auth';
import { guardLinkPress } from '../lib/leaveGuard';
import { areaForPath, areasForRoles, type Area } from '../lib/navigation';
import { colors, fonts, minTouchTarget, radius, space } from '../lib/theme';
import { AppText } from './AppText';
import { Dialog } from './Dialog';
import { RoleChips } from './RoleChips';
import { SignOutButton } from './SignOutButton';

/** Four tabs plus Menu stay at least 72 px wide on a 360 px phone. */
const MAX_AREA_TABS = 4;

function TabMarker({ selected }: { selected: boolean }) {
  return <View style={[styles.marker, selected && styles.markerSelected]} />;
}

function AreaTab({ area, selected }: { area: Area; selected: boolean }) {
  return (
    <Link href={area.href} asChild onPress={(e) => guardLinkPress(e, () => router.navigate(area.href))}>
      <Pressable
        accessibilityRole="link"
        accessibilityLabel={area.title}
        aria-current={selected ? 'page' : undefined}
        style={styles.tab}
      >
        <TabMarker selected={selected} />
        <AppText variant="label" tone={selected ? 'steel' : 'muted'} style={[styles.tabLabel, selected && styles.tabLabelSelected]} numberOfLines={2}>
          {area.title}
        </AppText>
      </Pressable>
    </Link>
  );
}

export function TabBar({ user }: { user: User }) {
  const insets = useSafeAreaInsets();
  const current = areaForPath(usePathname());
  const [menuOpen, setMenuOpen] = useState(false);
  const areas = areasForRoles(user.roles);
  const tabbed = areas.slice(0, MAX_AREA_TABS);
  const overflow = areas.slice(MAX_AREA_TABS);
  const menuHoldsCurrent = overflow.some((area) => area.key === current?.key);

  return (
    <View role="navigation" aria-label="Main" style={[styles.bar, { paddingBottom: insets.bottom }]}>
      {tabbed.map((area) => (
        <AreaTab key={area.key} area={area} selected={area.key === current?.key} />
      ))}
      <Pressable
        accessibilityRole="button"
        accessibilityLabel={overflow.length > 0 ? 'Menu: more areas and sign out' : 'Menu: your account and sign out'}
        aria-haspopup="dialog"
        onPress={() => setMenuOpen(true)}
        style={({ pressed }) => [styles.tab, pressed && styles.tabPressed]}
      >
        <TabMarker selected={menuHoldsCurrent} />
        <AppText variant="label" tone={menuHoldsCurrent ? 'steel' : 'muted'} style={[styles.tabLabel, menuHoldsCurrent && styles.tabLabelSelected]}>
          Menu
        </AppText>
      </Pressable>

      <Dialog visible={menuOpen} title="Menu" onClose={() => setMenuOpen(false)}>
        {overflow.length > 0 ? (
          <View style={styles.menuList}>
            {overflow.map((area) => {
              const selected = area.key === current?.key;
              return (
                <Link
                  key={area.key}
                  href={area.href}
                  asChild
                  onPress={(e) => {
                    setMenuOpen(false);
                    guardLinkPress(e, () => router.navigate(area.href));
                  }}
                >
                  <Pressable
                    accessibilityRole="link"
                    accessibilityLabel={area.title}
                    aria-current={selected ? 'page' : undefined}
                    style={StyleSheet.flatten([styles.menuItem, selected && styles.menuItemSelected])}
                  >
                    <AppText variant={selected ? 'bodyStrong' : 'body'}>{area.title}</AppText>
                    <AppText variant="caption" tone="muted" numberOfLines={2}>
                      {area.purpose}
                    </AppText>
                  </Pressable>
                </Link>
              );
            })}
          </View>
        ) : null}
        <View style={styles.account}>
          <AppText variant="caption" tone="muted">
            Signed in as
          </AppText>
          <AppText variant="bodyStrong">{`${user.displayName} (${user.username})`}</AppText>
          <RoleChips roles={user.roles} />
        </View>
        <View style={styles.menuActions}>
          <SignOutButton />
        </View>
      </Dialog>
    </View>
  );
}

const styles = StyleSheet.create({
  bar: {
    flexDirection: 'row',
    backgroundColor: colors.surface,
    borderTopWidth: 1,
    borderTopColor: colors.line,
  },
  tab: {
    flex: 1,
    minHeight: 56,
    minWidth: minTouchTarget,
    alignItems: 'center',
    justifyContent: 'center',
    paddingHorizontal: space.xs,
    paddingBottom: space.xs,
  },
  tabPressed: { backgroundColor: colors.surfaceSunken },
  tabLabel: { textAlign: 'center', fontSize: 13, lineHeight: 16 },
  tabLabelSelected: { fontFamily: fonts.semiBold },
  marker: { position: 'absolute', top: 0, left: space.md, right: space.md, height: 3, borderBottomLeftRadius: 2, borderBottomRightRadius: 2 },
  markerSelected: { backgroundColor: colors.steel },
  menuList: { gap: space.xs },
  menuItem: { minHeight: minTouchTarget, justifyContent: 'center', paddingVertical: space.sm, paddingHorizontal: space.md, borderRadius: radius.md, gap: space.xxs },
  menuItemSelected: { backgroundColor: colors.steelTint },
  account: { gap: space.xs, paddingTop: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  menuActions: { flexDirection: 'row' },
});
