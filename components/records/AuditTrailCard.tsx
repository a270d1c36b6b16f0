import { StyleSheet } from 'react-native';
import { useChainVerification } from '../../hooks/useRecords';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ErrorBanner } from '../ErrorBanner';
import { ExportButton } from './ExportButton';

/**
 * The audit trail's tamper evidence: every event carries the hash of the one before it; checking
 * recomputes the whole chain and names the first event that does not match.
 */
export function AuditTrailCard() {
  const check = useChainVerification();
  const result = check.data;
  return (
    <Card style={styles.card}>
      <AppText variant="heading" headingLevel={2}>
        Audit trail
      </AppText>
      <AppText tone="muted">
        Every sign-in, change, signature and export is recorded with who, when and what, in a chain of SHA-256 hashes. The database refuses to change or
        delete an event. Checking recomputes the chain from the first event.
      </AppText>
      <Button label={check.isFetching ? 'Checking…' : 'Check the audit trail'} variant="secondary" busy={check.isFetching} onPress={() => check.refetch()} />
      {check.isError ? <ErrorBanner error={check.error} /> : null}
      {result ? (
        <AppText variant="bodyStrong" accessibilityRole="alert" tone={result.ok ? 'default' : 'danger'}>
          {result.ok
            ? `✓ Intact: all ${result.checked.toLocaleString()} events match their hashes and links.`
            : `✕ Broken at event ${result.firstBroken!.seq}: ${result.firstBroken!.reason}. ${result.checked.toLocaleString()} events before it are intact.`}
        </AppText>
      ) : null}
      <ExportButton label="Export the audit trail (CSV)" path="/api/audit-events/export.csv" fallbackName="audit-trail.csv" />
    </Card>
  );
}

const styles = StyleSheet.create({ card: { gap: space.sm } });
