// What a screen shows while it waits, when there is nothing to show, and when loading failed.
import type { ReactNode } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { isWorthRetrying } from '../lib/errorMessages';
import { colors, space } from '../lib/theme';
import { AppText } from './AppText';
import { Card } from './Card';
import { ErrorBanner } from './ErrorBanner';

export function LoadingState({ label = 'Loading…' }: { label?: string }) {
  return (
    <View role="status" aria-live="polite" style={styles.centred}>
      <ActivityIndicator color={colors.steel} size="large" />
      <AppText tone="muted">{label}</AppText>
    </View>
  );
}

interface EmptyStateProps {
  title: string;
  body: string;
  /** A real next action, if there is one; never a button that does nothing. */
  action?: ReactNode;
}

export function EmptyState({ title, body, action }: EmptyStateProps) {
  return (
    <Card style={styles.empty}>
      <View style={styles.emptyMark} aria-hidden>
        <View style={styles.emptyMarkInner} />
      </View>
      <AppText variant="heading">{title}</AppText>
      <AppText tone="muted" style={styles.emptyBody}>
        {body}
      </AppText>
      {action}
    </Card>
  );
}

/** A failed load; "Try again" only where trying again can help (network and server trouble), not for a refused or malformed request. */
export function ErrorState({ error, onRetry }: { error: unknown; onRetry?: () => void }) {
  return <ErrorBanner error={error} onRetry={isWorthRetrying(error) ? onRetry : undefined} />;
}

const styles = StyleSheet.create({
  centred: { alignItems: 'center', justifyContent: 'center', gap: space.md, padding: space.xxl, flexGrow: 1 },
  empty: { alignItems: 'center', paddingVertical: space.xxl, gap: space.md },
  emptyBody: { textAlign: 'center', maxWidth: 520 },
  emptyMark: {
    width: 48,
    height: 48,
    borderRadius: 10,
    borderWidth: 2,
    borderStyle: 'dashed',
    borderColor: colors.control,
    alignItems: 'center',
    justifyContent: 'center',
  },
  emptyMarkInner: { width: 12, height: 12, borderRadius: 2, backgroundColor: colors.control },
});
