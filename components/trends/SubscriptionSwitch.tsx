import { StyleSheet, Switch, View } from 'react-native';
import { useAlertSubscription, useSetAlertSubscription } from '../../hooks/useAlerts';
import { colors, minTouchTarget, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Card } from '../Card';
import { ErrorBanner } from '../ErrorBanner';

const LABEL = 'E-mail me each new alert';

/** Whether the signed-in supervisor receives alert e-mails. */
export function SubscriptionSwitch() {
  const subscription = useAlertSubscription();
  const change = useSetAlertSubscription();
  const subscribed = change.isPending ? change.variables : subscription.data?.subscribed;
  return (
    <Card style={styles.card}>
      <View style={styles.row}>
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
        <Switch
          accessibilityLabel={LABEL}
          accessibilityState={{ checked: !!subscribed, busy: change.isPending }}
          value={!!subscribed}
          disabled={subscription.isPending || subscription.isError || change.isPending}
          onValueChange={(value) => change.mutate(value)}
          trackColor={{ false: colors.control, true: colors.steel }}
          thumbColor={colors.surface}
          // react-native-web names the thumb's colour when on separately from thumbColor.
          {...({ activeThumbColor: colors.surface } as object)}
          style={styles.switch}
        />
      </View>
      {subscription.isError ? <ErrorBanner error={subscription.error} onRetry={() => subscription.refetch()} /> : null}
      {change.isError ? <ErrorBanner error={change.error} /> : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: minTouchTarget },
  text: { flex: 1, gap: space.xxs },
  // react-native-web lays its checkbox over the whole switch, so a taller box is a taller target.
  switch: { minWidth: minTouchTarget, minHeight: minTouchTarget },
});
