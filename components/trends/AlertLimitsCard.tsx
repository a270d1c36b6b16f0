import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useAlertLimits, useDeleteAlertLimit } from '../../hooks/useAlerts';
import { colors, minTouchTarget, space } from '../../lib/theme';
import type { AlertLimit } from '../../shared/api/alerts';
import type { TrendChoices } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ConfirmDialog } from '../ConfirmDialog';
import { ErrorState, LoadingState } from '../StateViews';
import { AddLimitDialog } from './AddLimitDialog';
import { formatPercent } from '../../lib/format';

interface AlertLimitsCardProps {
  choices: TrendChoices;
  /** Supervisors add and delete limits; others read them. */
  canEdit: boolean;
}

function describeLimit(limit: AlertLimit): string {
  return `${limit.ruleName} · ${limit.stationName ?? 'every station'}`;
}

/** The defect-fraction limits that raise alerts, besides the run rules. */
export function AlertLimitsCard({ choices, canEdit }: AlertLimitsCardProps) {
  const limits = useAlertLimits();
  const remove = useDeleteAlertLimit();
  const [adding, setAdding] = useState(false);
  const [deleting, setDeleting] = useState<AlertLimit | null>(null);

  let body;
  if (limits.isPending) body = <LoadingState label="Loading alert limits…" />;
  else if (limits.isError) body = <ErrorState error={limits.error} onRetry={() => limits.refetch()} />;
  else if (limits.data.length === 0)
    body = <AppText tone="muted">{canEdit ? 'No limits yet: only run rules raise alerts. Add a limit to be told when a day fails more parts than you accept.' : 'No limits set: only run rules raise alerts.'}</AppText>;
  else
    body = (
      <View role="list" style={styles.list}>
        {limits.data.map((limit) => (
          <View key={limit.id} role="listitem" style={styles.row}>
            <View style={styles.text}>
              <AppText variant="bodyStrong">{describeLimit(limit)}</AppText>
              <AppText variant="caption" tone="muted">{`Alert above ${formatPercent(limit.maxDefectFraction)} failed in a day · set by ${limit.createdBy}`}</AppText>
            </View>
            {canEdit ? (
              <Button
                label="Delete"
                variant="quiet"
                compact
                accessibilityLabel={`Delete the limit for ${describeLimit(limit)}`}
                onPress={() => {
                  remove.reset();
                  setDeleting(limit);
                }}
              />
            ) : null}
          </View>
        ))}
      </View>
    );

  return (
    <Card style={styles.card}>
      <View style={styles.header}>
        <AppText variant="heading" style={styles.text}>
          Alert limits
        </AppText>
        {canEdit ? <Button label="Add a limit" variant="secondary" compact onPress={() => setAdding(true)} /> : null}
      </View>
      {body}
      <AddLimitDialog visible={adding} choices={choices} onClose={() => setAdding(false)} />
      <ConfirmDialog
        visible={deleting !== null}
        title="Delete this alert limit?"
        message={deleting ? `${describeLimit(deleting)}: no more alerts will be raised above ${formatPercent(deleting.maxDefectFraction)} a day. Alerts already raised are kept.` : ''}
        confirmLabel="Delete limit"
        destructive
        busy={remove.isPending}
        error={remove.error}
        onConfirm={() => remove.mutate(deleting!.id, { onSuccess: () => setDeleting(null) })}
        onCancel={() => setDeleting(null)}
      />
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  header: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
  list: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: minTouchTarget, borderBottomWidth: 1, borderBottomColor: colors.line, paddingVertical: space.xs },
  text: { flex: 1, gap: space.xxs },
});
