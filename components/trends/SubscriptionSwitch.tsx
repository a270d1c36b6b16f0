import { Pressable, StyleSheet, View } from 'react-native';
import { useAlertSubscription, useSetAlertSubscription } from '../../hooks/useAlerts';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Card } from '../Card';
import { ErrorBanner } from '../ErrorBanner';

const LABEL = 'E-mail me each new alert';

/** Whether the signed-in supervisor receives alert e-mails. */
export function SubscriptionSwitch() {
  const subscription = useAlertSubscription();
  const change = useSetAlertSubscription();
  const subscribed = change.isPending ? change.variables : subscription.data?.subscribed;
  const ready = !subscription.isPending && !subscription.isError && !change.isPending;
  return (
    <Card style={styles.card}>
      <Pressable
        role="switch"
        aria-checked={!!subscribed}
        accessibilityLabel={LABEL}
        accessibilityState={{ checked: !!subscribed, disabled: !ready, busy: change.isPending }}
        disabled={!ready}
        onPress={() => change.mutate(!subscribed)}
        // A switch also answers the space bar (WAI-ARIA switch pattern); Enter comes with the press.
        {...({
          onKeyDown: (event: { key: string; preventDefault: () => void }) => {
            if (event.key !== ' ' || !ready) return;
            event.preventDefault();
            change.mutate(!subscribed);
          },
        } as object)}
        style={({ pressed }) => [styles.row, pressed && styles.pressed]}
      >
        <View style={styles.text}>
          <AppText variant="bodyStrong">{LABEL}</AppText>
          <AppText variant="caption" tone="muted">
            {subscription.isPending
              ? 'Checking your setting…'
              : subscribed
                ? 'On: each alert is sent to your e-mail address once, when it is raised.'
                : 'Off: alerts only appear here.'}
          </AppText>
        </View>
        <View style={[styles.track, subscribed ? styles.trackOn : styles.trackOff]} aria-hidden>
          <View style={[styles.thumb, subscribed ? styles.thumbOn : styles.thumbOff]} />
        </View>
      </Pressable>
      {subscription.isError ? <ErrorBanner error={subscription.error} onRetry={() => subscription.refetch()} /> : null}
      {change.isError ? <ErrorBanner error={change.error} /> : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: minTouchTarget, borderRadius: radius.md, padding: space.xs },
  pressed: { backgroundColor: colors.steelTint },
  // Drawn here rather than with the platform switch, so that the whole row is the one control.
  track: { width: 44, height: 24, borderRadius: radius.pill, padding: 2, justifyContent: 'center' },
  trackOn: { backgroundColor: colors.steel },
  trackOff: { backgroundColor: colors.control },
  thumb: { width: 20, height: 20, borderRadius: radius.pill, backgroundColor: colors.surface },
  thumbOn: { alignSelf: 'flex-end' },
  thumbOff: { alignSelf: 'flex-start' },
  text: { flex: 1, gap: space.xxs },
});
