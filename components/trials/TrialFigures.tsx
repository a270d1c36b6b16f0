// A finished trial's figures: the confusion table (labels × verdicts), false reject and escape
// rates with their 95 % Wilson score intervals, agreement and Cohen's kappa against the labels.
import { StyleSheet, View } from 'react-native';
import type { TrialSummary } from '../../shared/api/trials';
import { colors, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { formatPercent } from '../../lib/format';

type Proportion = TrialSummary['falseRejectRate'];


export function describeProportion(p: Proportion): string {
  if (p.of === 0 || p.rate === null) return 'no photos to count';
  return `${formatPercent(p.rate)} (${p.count} of ${p.of}; 95 % interval ${formatPercent(p.low)} to ${formatPercent(p.high)})`;
}

const VERDICTS = ['PASS', 'FAIL', 'RETAKE'] as const;
const LABELS = [
  ['good', 'Labelled good'],
  ['defective', 'Labelled defective'],
  ['retake', 'Labelled retake'],
] as const;

export function TrialFigures({ summary }: { summary: TrialSummary }) {
  return (
    <View style={styles.figures}>
      <View role="table" accessibilityLabel="Confusion table: labels against verdicts" style={styles.table}>
        <View role="row" style={[styles.row, styles.headRow]}>
          <AppText role="columnheader" variant="label" style={styles.first}>Label \ verdict</AppText>
          {VERDICTS.map((v) => (
            <AppText key={v} role="columnheader" variant="label" style={styles.cell}>{v}</AppText>
          ))}
        </View>
        {LABELS.map(([key, title]) => (
          <View role="row" key={key} style={styles.row}>
            <AppText role="rowheader" variant="label" style={styles.first}>{title}</AppText>
            {VERDICTS.map((v) => {
              const count = summary.table[key][v];
              const wrong = (key === 'good' && v === 'FAIL') || (key === 'defective' && v === 'PASS');
              return (
                <AppText key={v} role="cell" style={styles.cell} variant={wrong && count > 0 ? 'bodyStrong' : 'body'} tone={wrong && count > 0 ? 'danger' : 'default'}>
                  {wrong && count > 0 ? `${count} ✕` : String(count)}
                </AppText>
              );
            })}
          </View>
        ))}
      </View>
      <View style={styles.list}>
        <AppText><AppText variant="bodyStrong">False reject rate</AppText>{` (good parts failed): ${describeProportion(summary.falseRejectRate)}`}</AppText>
        <AppText tone={summary.escapeRate.count > 0 ? 'danger' : undefined}>
          <AppText variant="bodyStrong" tone={summary.escapeRate.count > 0 ? 'danger' : undefined}>{`${summary.escapeRate.count > 0 ? '⚠ ' : ''}Escape rate`}</AppText>
          {` (defective parts passed): ${describeProportion(summary.escapeRate)}`}
        </AppText>
        <AppText><AppText variant="bodyStrong">Agreement with labels</AppText>{`: ${describeProportion(summary.agreement)}`}</AppText>
        <AppText><AppText variant="bodyStrong">Cohen’s kappa</AppText>{`: ${summary.kappa === null ? '— (not enough variety in labels or verdicts)' : summary.kappa.toFixed(3)}`}</AppText>
        <AppText variant="caption" tone="muted">
          {`${summary.images} photos${summary.unlabelled ? `, ${summary.unlabelled} unlabelled and left out of the figures` : ''}; median ${summary.medianMs === null ? '—' : `${summary.medianMs.toFixed(0)} ms`} per photo. Intervals are Wilson score intervals (Wilson 1927). A rule is a decision aid: released limits must also follow the customer’s drawing and the plant’s quality procedures.`}
        </AppText>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  figures: { gap: space.md },
  // Columns share the width, so that the table fits a phone (390 px) and stays compact on a wide screen.
  table: { borderWidth: 1, borderColor: colors.line, alignSelf: 'stretch', maxWidth: 440 },
  row: { flexDirection: 'row', borderBottomWidth: 1, borderBottomColor: colors.line },
  headRow: { backgroundColor: colors.surfaceSunken },
  first: { flex: 2, minWidth: 0, padding: space.xs },
  cell: { flex: 1, minWidth: 0, padding: space.xs, textAlign: 'right' },
  list: { gap: space.xs },
});
