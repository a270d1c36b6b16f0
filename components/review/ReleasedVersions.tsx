import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import { usePartTypeName } from '../../hooks/useReferenceSets';
import { useReleasedRules } from '../../hooks/useReview';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';

/** Versions on the line now, each opening its page (signatures, trial, withdraw). */
export function ReleasedVersions() {
  const rules = useReleasedRules();
  const partTypeName = usePartTypeName();
  if (rules.isPending) return <LoadingState label="Loading released versions…" />;
  if (rules.error) return <ErrorState error={rules.error} onRetry={() => void rules.refetch()} />;
  const released = rules.data.filter((rule) => rule.releasedVersion);
  if (released.length === 0) return <EmptyState title="No released versions" body="Versions you release appear here; operators inspect with them." />;
  return (
    <View style={styles.list} role="list" aria-label="Released versions">
      {released.map((rule) => (
        <View key={rule.id} role="listitem">
        <Link href={`/review/${rule.releasedVersion!.id}`} asChild>
          <Pressable
            accessibilityRole="link"
            accessibilityLabel={`Open ${rule.name} version ${rule.releasedVersion!.number}, released`}
            style={styles.item}
          >
            <AppText variant="bodyStrong" style={styles.name}>{`✓ ${rule.name} · v${rule.releasedVersion!.number}`}</AppText>
            <AppText variant="caption" tone="muted">{`Part type: ${partTypeName(rule.partType)}`}</AppText>
          </Pressable>
        </Link>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.xs },
  item: {
    minHeight: minTouchTarget,
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    justifyContent: 'space-between',
    gap: space.sm,
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  name: { flexShrink: 1 },
});
