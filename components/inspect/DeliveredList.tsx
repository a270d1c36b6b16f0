import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import type { Inspection } from '../../shared/api/inspections';
import type { QueueRefusal } from '../../hooks/useInspections';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { VERDICT_LOOK } from './VerdictMark';

interface DeliveredListProps {
  delivered: Inspection[];
  refused: QueueRefusal[];
  onDismiss: () => void;
}

/** Verdicts of photos that waited on the device, once the server has judged them, and any it refused. */
export function DeliveredList({ delivered, refused, onDismiss }: DeliveredListProps) {
  if (delivered.length === 0 && refused.length === 0) return null;
  return (
    <Card style={styles.card} role="status" aria-live="polite">
      <AppText variant="heading">Verdicts of waiting photos</AppText>
      {delivered.map((inspection) => (
        <View key={inspection.id} style={styles.row}>
          <AppText variant="bodyStrong">{`${VERDICT_LOOK[inspection.verdict].symbol} ${inspection.verdict}`}</AppText>
          <AppText variant="caption" tone="muted">
            {`${inspection.ruleName} · ${new Date(inspection.createdAt).toLocaleTimeString()}${inspection.cause ? ` · ${inspection.cause}` : ''}`}
          </AppText>
        </View>
      ))}
      {refused.map((refusal) => (
        <AppText key={refusal.fileName + refusal.message} tone="danger">{`⚠ ${refusal.fileName}: ${refusal.message} Photograph the part again.`}</AppText>
      ))}
      <View style={styles.actions}>
        <Button label="Done" variant="secondary" compact onPress={onDismiss} accessibilityLabel="Clear the list of waiting photos’ verdicts" />
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm },
  row: { gap: space.xxs },
  actions: { flexDirection: 'row', justifyContent: 'flex-end' },
});
