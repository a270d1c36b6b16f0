import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useAcknowledgeAlert, useAlertPages, type AlertState } from '../../hooks/useAlerts';
import { space } from '../../lib/theme';
import type { Alert } from '../../shared/api/alerts';
import { Button } from '../Button';
import { NoteDialog } from '../review/NoteDialog';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { AlertCard } from './AlertCard';

interface AlertListProps {
  state: AlertState;
  /** Whether the signed-in person may acknowledge (supervisors). */
  canAcknowledge: boolean;
}

const EMPTY: Record<AlertState, { title: string; body: string }> = {
  open: {
    title: 'No open alerts',
    body: 'Every alert has been acknowledged. New ones appear here when a run rule fires or a day passes a limit you set below.',
  },
  acknowledged: { title: 'Nothing acknowledged yet', body: 'Alerts you and other supervisors acknowledge are kept here with their notes.' },
};

/** Alerts newest first, continued page by page; open ones can be acknowledged with a note. */
export function AlertList({ state, canAcknowledge }: AlertListProps) {
  const pages = useAlertPages(state);
  const acknowledge = useAcknowledgeAlert();
  const [target, setTarget] = useState<Alert | null>(null);
  const alerts = pages.data?.pages.flatMap((p) => p.items) ?? [];

  if (pages.isPending) return <LoadingState label={state === 'open' ? 'Loading open alerts…' : 'Loading acknowledged alerts…'} />;
  if (pages.isError) return <ErrorState error={pages.error} onRetry={() => pages.refetch()} />;
  if (alerts.length === 0) return <EmptyState {...EMPTY[state]} />;
  return (
    <View style={styles.list}>
      {alerts.map((alert) => (
        <AlertCard
          key={alert.id}
          alert={alert}
          onAcknowledge={
            canAcknowledge
              ? () => {
                  acknowledge.reset();
                  setTarget(alert);
                }
              : undefined
          }
        />
      ))}
      {pages.hasNextPage ? (
        <Button label={state === 'open' ? 'Show more open alerts' : 'Show older alerts'} variant="secondary" busy={pages.isFetchingNextPage} onPress={() => pages.fetchNextPage()} />
      ) : null}
      <NoteDialog
        visible={target !== null}
        title="Acknowledge the alert"
        message={
          target
            ? `${target.description} at ${target.stationName} (${target.lineName}). Say what was checked or done. The note is kept with the alert and cannot be changed.`
            : ''
        }
        fieldLabel="What was checked or done"
        confirmLabel="Acknowledge"
        requiredMessage="Write what was checked or done (at least 3 characters)."
        busy={acknowledge.isPending}
        error={acknowledge.error}
        onConfirm={(note) => acknowledge.mutate({ id: target!.id, note }, { onSuccess: () => setTarget(null) })}
        onCancel={() => setTarget(null)}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.md },
});
