// Navigation on a wide screen: a rail on the left with every area the person may use.
import { Pressable, StyleSheet, View } from 'react-native';
import { Link, router, usePathname } from 'expo-router';
import type { User } from '../shared/api/auth';
import { guardLinkPress } from '../lib/leaveGuard';
import { areaForPath, areasForRoles } from '../lib/navigation';
import { colors, minTouchTarget, radius, space } from '../lib/theme';
import { AppText } from './AppText';
import { KernwrightWordmark } from './KernwrightMark';
import { RoleChips } from './RoleChips';
import { SignOutButton } from './SignOutButton';

export function NavRail({ user }: { user: User }) {
  const current = areaForPath(usePathname());
  return (
    <View role="navigation" aria-label="Main" style={styles.rail}>
      <View style={styles.brand}>
        <KernwrightWordmark />
      </View>
      <View style={styles.items}>
        {areasForRoles(user.roles).map((area) => {
          const selected = area.key === current?.key;
          return (
            // Link's asChild hands the style straight to the web element: one plain object, no array or function.
            <Link key={area.key} href={area.href} asChild onPress={(e) => guardLinkPress(e, () => router.navigate(area.href))}>
              <Pressable
                accessibilityRole="link"
                accessibilityLabel={area.title}
                aria-current={selected ? 'page' : undefined}
                style={StyleSheet.flatten([styles.item, selected && styles.itemSelected])}
              >
                <View style={[styles.marker, selected && styles.markerSelected]} />
                <AppText variant={selected ? 'bodyStrong' : 'body'} tone={selected ? 'steel' : 'default'}>
                  {area.title}
                </AppText>
              </Pressable>
            </Link>
          );
        })}
      </View>
      <View style={styles.account}>
        <AppText variant="bodyStrong" numberOfLines={1}>
          {user.displayName}
        </AppText>
        <AppText variant="caption" tone="muted" numberOfLines={1}>
          {user.username}
        </AppText>
        <RoleChips roles={user.roles} />
        <SignOutButton />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  rail: {
    width: 248,
    backgroundColor: colors.surface,
    borderRightWidth: 1,
    borderRightColor: colors.line,
    paddingVertical: space.xl,
    paddingHorizontal: space.md,
    gap: space.xl,
  },
  brand: { paddingHorizontal: space.sm },
  items: { gap: space.xxs, flexGrow: 1 },
  item: {
    minHeight: minTouchTarget,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingRight: space.md,
    borderRadius: radius.md,
  },
  itemSelected: { backgroundColor: colors.steelTint },
  marker: { width: 4, alignSelf: 'stretch', borderRadius: 2, marginVertical: space.sm, backgroundColor: 'transparent' },
  markerSelected: { backgroundColor: colors.steel },
  account: { gap: space.sm, paddingHorizontal: space.sm, paddingTop: space.lg, borderTopWidth: 1, borderTopColor: colors.line },
});
