import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { colors, radius, space } from '../../lib/theme';
import type { Alert } from '../../shared/api/alerts';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { recordsHref } from './recordsLink';
import { runRuleName } from './runRuleNames';
import { describeSpan } from './trendRange';

interface AlertCardProps {
  alert: Alert;
  /** Shown for open alerts to people who may acknowledge them. */
  onAcknowledge?: () => void;
}

function when(iso: string): string {
  return new Date(iso).toLocaleString(undefined, { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });
}

/** One alert: what fired where and when, and either the way to acknowledge it or who did, with their note. */
export function AlertCard({ alert, onAcknowledge }: AlertCardProps) {
  const router = useRouter();
  const open = alert.acknowledgedAt === null;
  const place = `${alert.stationName} · ${alert.lineName}`;
  return (
    <Card style={[styles.card, open && styles.openCard]}>
      <View style={styles.head}>
        <View style={[styles.state, open ? styles.stateOpen : styles.stateDone]}>
          <AppText variant="label" tone={open ? 'danger' : 'notice'}>
            {open ? '⚠ Open' : '✓ Acknowledged'}
          </AppText>
        </View>
        <AppText variant="caption" tone="muted">{`Raised ${when(alert.createdAt)}`}</AppText>
      </View>
      <AppText variant="bodyStrong">{`${runRuleName(alert.signal)}${alert.kind === 'run-rule' ? ` (${alert.signal})` : ''} · ${place}`}</AppText>
      <AppText>{alert.description}</AppText>
      <AppText variant="caption" tone="muted">{`Rule ${alert.ruleName} · ${describeSpan(alert.periodStart, alert.periodEnd)}`}</AppText>
      {!open ? (
        <View style={styles.note}>
          <AppText variant="caption" tone="muted">{`${alert.acknowledgedBy ?? 'Someone'} acknowledged it ${when(alert.acknowledgedAt!)}:`}</AppText>
          <AppText>{alert.acknowledgementNote ?? ''}</AppText>
        </View>
      ) : null}
      <View style={styles.actions}>
        <Button
          label="Failed inspections"
          variant="secondary"
          compact
          accessibilityLabel={`Open the failed inspections behind the alert at ${place}`}
          onPress={() => router.push(recordsHref({ from: alert.periodStart, to: alert.periodEnd, ruleId: alert.ruleId, stationId: alert.stationId, verdict: 'FAIL' }))}
        />
        {open && onAcknowledge ? (
          <Button label="Acknowledge" compact accessibilityLabel={`Acknowledge the alert at ${place}`} onPress={onAcknowledge} />
        ) : null}
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.xs },
  openCard: { borderLeftWidth: 4, borderLeftColor: colors.danger },
  head: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between', gap: space.sm },
  state: { paddingHorizontal: space.sm, paddingVertical: space.xxs, borderRadius: radius.sm, borderWidth: 1 },
  stateOpen: { borderColor: colors.danger, backgroundColor: colors.dangerTint },
  stateDone: { borderColor: colors.notice, backgroundColor: colors.noticeTint },
  note: { padding: space.sm, borderRadius: radius.md, backgroundColor: colors.surfaceMuted, gap: space.xxs },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, justifyContent: 'flex-end', marginTop: space.xs },
});
