import { Link } from 'expo-router';
import { formatDateTime } from '../../lib/format';
import { Image, Pressable, StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import { useInspectionRecord } from '../../hooks/useRecords';
import { usePartTypeName } from '../../hooks/useReferenceSets';
import { minTouchTarget, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Card } from '../Card';
import { VerdictPanel } from '../inspect/VerdictPanel';
import { Screen } from '../Screen';
import { ErrorState, LoadingState } from '../StateViews';
import { ExportButton } from './ExportButton';
import { recordReference } from '../../shared/api/records';

/** One inspection as recorded: verdict and measurements, the photo, who did what when, the exact rule version. */
export function InspectionRecord({ id }: { id: string }) {
  const record = useInspectionRecord(id);
  const partTypeName = usePartTypeName();
  const phone = useLayout() === 'phone';
  if (record.isPending) return <LoadingState label="Loading the inspection…" />;
  if (record.isError) return <ErrorState error={record.error} onRetry={() => record.refetch()} />;
  const i = record.data;
  return (
    <Screen
      title={`Inspection record ${recordReference(i.id)}`}
      subtitle={`${formatDateTime(i.createdAt)} · ${i.lineName}, ${i.stationName}`}
      actions={<ExportButton label="PDF report" path={`/api/records/inspections/${i.id}/report.pdf`} fallbackName={`inspection-${i.id}.pdf`} />}
    >
      <VerdictPanel inspection={i} recorded />
      <Card style={styles.facts}>
        <AppText variant="heading" headingLevel={2}>
          Who, what, when
        </AppText>
        <AppText>{`Operator: ${i.operator.name}`}</AppText>
        <AppText>{`Part type: ${partTypeName(i.partType)}`}</AppText>
        <Link href={`/rules/${i.ruleId}`} asChild>
          <Pressable accessibilityRole="link" accessibilityLabel={`Open the rule ${i.ruleName}`} style={styles.link}>
            <AppText tone="steel" variant="bodyStrong">{`Rule: ${i.ruleName}, version ${i.ruleVersionNumber} ›`}</AppText>
          </Pressable>
        </Link>
        <Link href={`/rules/${i.ruleId}/history?version=${i.ruleVersionId}`} asChild>
          <Pressable
            accessibilityRole="link"
            accessibilityLabel={`History of ${i.ruleName}, opened at version ${i.ruleVersionNumber}: its signatures, trials and changes`}
            style={styles.link}
          >
            <AppText tone="steel">{`History of version ${i.ruleVersionNumber}: signatures, trials, changes ›`}</AppText>
          </Pressable>
        </Link>
        <AppText>{`Calibration: ${i.mmPerPx ? `${Number(i.mmPerPx.toPrecision(5))} mm/px` : 'none'}`}</AppText>
        <AppText tone="muted" variant="caption">{`Recorded in ${Math.round(i.durationMs)} ms · idempotency key ${i.idempotencyKey}`}</AppText>
        {i.dispute ? (
          <AppText>{`Disputed: “${i.dispute.note}”${i.dispute.resolvedAt ? ` — judged ${i.dispute.judgement} (${i.dispute.resolutionNote})` : ' — waiting for a qualified person'}`}</AppText>
        ) : null}
      </Card>
      <Card style={styles.facts}>
        <AppText variant="heading" headingLevel={2}>
          Photo as taken
        </AppText>
        <View style={[styles.photo, phone && styles.photoPhone]}>
          <Image source={{ uri: i.imageUrl }} style={styles.image} resizeMode="contain" accessibilityLabel="The photo the verdict was made on" />
        </View>
      </Card>
    </Screen>
  );
}

const styles = StyleSheet.create({
  facts: { gap: space.xs },
  link: { minHeight: minTouchTarget, justifyContent: 'center' },
  photo: { width: '100%', aspectRatio: 4 / 3, maxWidth: 720 },
  photoPhone: { maxWidth: '100%' },
  image: { width: '100%', height: '100%' },
});
