import { StyleSheet, View } from 'react-native';
import { useTrial } from '../../hooks/useReview';
import { colors, radius, space } from '../../lib/theme';
import type { TrialSummary } from '../../shared/api/trials';
import { AppText } from '../AppText';
import { ErrorState, LoadingState } from '../StateViews';
import { formatPercent } from '../../lib/format';


/** `alarm`: a rate whose every count is a wrong verdict to act on (escapes), marked when it is not 0. */
function Rate({ label, explanation, p, alarm = false }: { label: string; explanation: string; p: TrialSummary['falseRejectRate']; alarm?: boolean }) {
  const marked = alarm && p.count > 0;
  return (
    <View style={[styles.rate, marked && styles.alarm]}>
      <AppText variant="label">{label}</AppText>
      <AppText variant="heading" tone={marked ? 'danger' : undefined}>{`${marked ? '⚠ ' : ''}${formatPercent(p.rate)}`}</AppText>
      <AppText variant="caption">{`${p.count} of ${p.of} · 95 % interval ${formatPercent(p.low)} to ${formatPercent(p.high)}`}</AppText>
      <AppText variant="caption" tone="muted">{explanation}</AppText>
    </View>
  );
}

/** The trial the engineer submitted: confusion table, false reject and escape rates with their 95 % intervals, kappa. */
export function TrialFigures({ trialId }: { trialId: string | null }) {
  const trial = useTrial(trialId);
  if (!trialId) return <AppText tone="danger">⚠ No trial is attached to this version; ask the engineer to run one before release.</AppText>;
  if (trial.isPending) return <LoadingState label="Loading the trial…" />;
  if (trial.error) return <ErrorState error={trial.error} onRetry={() => void trial.refetch()} />;
  const t = trial.data;
  if (!t.summary) return <AppText>{`The trial is ${t.state}${t.error ? `: ${t.error}` : ''}. Its figures appear when it has finished.`}</AppText>;
  const s = t.summary;
  const rows = [
    { label: 'Labelled good', counts: s.table.good },
    { label: 'Labelled defective', counts: s.table.defective },
    { label: 'Labelled retake', counts: s.table.retake },
  ];
  return (
    <View style={styles.column}>
      <AppText tone="muted">{`Reference set “${t.referenceSetName}”, ${s.images} photos${s.unlabelled ? ` (${s.unlabelled} unlabelled)` : ''}${t.mmPerPx ? `, at ${t.mmPerPx} mm/px` : ''}.`}</AppText>
      <View style={styles.table} role="table" aria-label="Confusion table: labels against verdicts">
        <View style={[styles.tr, styles.th]} role="row">
          <AppText variant="label" style={styles.first} role="columnheader">Label \ verdict</AppText>
          {(['PASS', 'FAIL', 'RETAKE'] as const).map((v) => (
            <AppText key={v} variant="label" style={styles.td} role="columnheader">{v}</AppText>
          ))}
        </View>
        {rows.map((r) => (
          <View key={r.label} style={styles.tr} role="row">
            <AppText variant="label" style={styles.first} role="rowheader">{r.label}</AppText>
            {(['PASS', 'FAIL', 'RETAKE'] as const).map((v) => (
              <AppText key={v} style={styles.td} role="cell">{String(r.counts[v])}</AppText>
            ))}
          </View>
        ))}
      </View>
      <View style={styles.rates}>
        <Rate label="False reject rate" explanation="Good parts the rule would reject." p={s.falseRejectRate} />
        <Rate label="Escape rate" explanation="Defective parts the rule would pass." p={s.escapeRate} alarm />
        <Rate label="Agreement" explanation="Verdicts that match the labels." p={s.agreement} />
        <View style={styles.rate}>
          <AppText variant="label">Cohen’s kappa</AppText>
          <AppText variant="heading">{s.kappa === null ? '—' : s.kappa.toFixed(2)}</AppText>
          <AppText variant="caption" tone="muted">Agreement with the labels beyond chance (1 is perfect, 0 is chance).</AppText>
        </View>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  column: { gap: space.md },
  table: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.md, overflow: 'hidden' },
  tr: { flexDirection: 'row', borderBottomWidth: 1, borderColor: colors.line },
  th: { backgroundColor: colors.surfaceSunken },
  first: { flex: 2, padding: space.sm },
  td: { flex: 1, padding: space.sm, textAlign: 'right' },
  rates: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  rate: { flexGrow: 1, flexBasis: 200, gap: space.xxs, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line },
  alarm: { borderColor: colors.danger, borderWidth: 2 },
});
