import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import { useReviewQueue } from '../../hooks/useReview';
import { formatDate } from '../../lib/format';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';

/** Rule versions submitted by engineers, oldest submission first. */
export function ReviewQueue() {
  const queue = useReviewQueue();
  if (queue.isPending) return <LoadingState label="Loading versions in review…" />;
  if (queue.error) return <ErrorState error={queue.error} onRetry={queue.refetch} />;
  if (queue.versions.length === 0)
    return <EmptyState title="Nothing waiting for review" body="When an engineer submits a rule version with its trial, it appears here for you to release or send back." />;
  return (
    <View style={styles.list} role="list" aria-label="Versions in review">
      {queue.versions.map((version) => (
        <View key={version.id} role="listitem">
        <Link href={`/review/${version.id}`} asChild>
          <Pressable
            accessibilityRole="link"
            accessibilityLabel={`Review ${version.ruleName} version ${version.number}, submitted by ${version.author.name}`}
            style={styles.item}
          >
            <View style={styles.head}>
              <AppText variant="heading">{`${version.ruleName} · v${version.number}`}</AppText>
              <AppText variant="label" tone="steel">Review ›</AppText>
            </View>
            <AppText tone="muted">{`Submitted by ${version.author.name}${version.submittedAt ? ` on ${formatDate(version.submittedAt)}` : ''}`}</AppText>
            {version.authorNote ? <AppText numberOfLines={2}>{`“${version.authorNote}”`}</AppText> : null}
          </Pressable>
        </Link>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm },
  item: { gap: space.xs, padding: space.lg, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.surface, minHeight: 44 },
  head: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm },
});
