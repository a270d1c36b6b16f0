import { ScrollView, StyleSheet, View } from 'react-native';
import { colors, radius, space } from '../../lib/theme';
import type { AttributeAgreement } from '../../shared/api/studies';
import { AppText } from '../AppText';
import { AcceptanceMark } from './AcceptanceMark';
import { formatPercent } from '../../lib/format';

type FigureKey = 'effectiveness' | 'missRate' | 'falseAlarmRate' | 'kappa';

/** Each figure, what it measures, and the AIAG MSA acceptance band it is judged by (REFERENCES.md §9). */
const FIGURES: readonly { key: FigureKey; name: string; meaning: string; band: string; asShare: boolean }[] = [
  { key: 'effectiveness', name: 'Effectiveness', meaning: 'Parts the rule judged as the person did.', band: 'AIAG: ≥ 90 % acceptable · ≥ 80 % marginal · below 80 % unacceptable', asShare: true },
  { key: 'missRate', name: 'Miss rate', meaning: 'Defective parts the rule passed.', band: 'AIAG: ≤ 2 % acceptable · ≤ 5 % marginal · above 5 % unacceptable', asShare: true },
  { key: 'falseAlarmRate', name: 'False-alarm rate', meaning: 'Good parts the rule failed.', band: 'AIAG: ≤ 5 % acceptable · ≤ 10 % marginal · above 10 % unacceptable', asShare: true },
  { key: 'kappa', name: 'Cohen’s kappa', meaning: 'Agreement beyond what chance alone would give.', band: 'AIAG: ≥ 0.75 good agreement · below 0.40 poor', asShare: false },
];

/** The four figures of an attribute agreement study beside their acceptance bands, and the counts they come from. */
export function AgreementFigures({ result }: { result: AttributeAgreement }) {
  const c = result.counts;
  const pairs = c.defectiveFailed + c.defectivePassed + c.goodFailed + c.goodPassed;
  if (pairs === 0) {
    return (
      <AppText tone="muted">
        {result.source === 'disputes'
          ? `No resolved dispute of this rule in the range${c.retakes ? ` (${c.retakes} RETAKE left out)` : ''}. Widen the range, or compare with a finished trial on a labelled set; disputes are resolved in Review.`
          : 'The trial judged no labelled good or defective photo, so there is nothing to compare.'}
      </AppText>
    );
  }
  return (
    <View style={styles.column}>
      <AppText tone="muted">{`${pairs} parts judged by both the rule and a person${c.retakes ? `; ${c.retakes} RETAKE left out` : ''}. “Defective” is the class the rule must catch.`}</AppText>
      <View style={styles.figures}>
        {FIGURES.map((f) => {
          const figure = result[f.key];
          const value = figure.value === null ? '—' : f.asShare ? formatPercent(figure.value) : figure.value.toFixed(2);
          return (
            <View key={f.key} style={styles.figure} accessibilityLabel={`${f.name}: ${value}, ${figure.acceptance ?? 'not enough data'}. ${f.band}`}>
              <AppText variant="label">{f.name}</AppText>
              <View style={styles.valueRow}>
                <AppText variant="title" headingLevel={null}>
                  {value}
                </AppText>
                <AcceptanceMark acceptance={figure.acceptance} />
              </View>
              <AppText variant="caption">{f.meaning}</AppText>
              <AppText variant="caption" tone="muted">
                {f.band}
              </AppText>
            </View>
          );
        })}
      </View>
      <ScrollView horizontal>
        <View role="table" aria-label="Counts: the person's judgement against the rule's verdict" style={styles.table}>
          <View role="row" style={[styles.tr, styles.th]}>
            <AppText role="columnheader" variant="label" style={styles.first}>
              Judged by a person \ verdict
            </AppText>
            <AppText role="columnheader" variant="label" style={styles.td}>
              FAIL
            </AppText>
            <AppText role="columnheader" variant="label" style={styles.td}>
              PASS
            </AppText>
          </View>
          <View role="row" style={styles.tr}>
            <AppText role="rowheader" variant="label" style={styles.first}>
              Defective
            </AppText>
            <AppText role="cell" style={styles.td}>{`${c.defectiveFailed} caught`}</AppText>
            <AppText role="cell" style={styles.td}>{`${c.defectivePassed} missed`}</AppText>
          </View>
          <View role="row" style={styles.tr}>
            <AppText role="rowheader" variant="label" style={styles.first}>
              Good
            </AppText>
            <AppText role="cell" style={styles.td}>{`${c.goodFailed} false alarms`}</AppText>
            <AppText role="cell" style={styles.td}>{`${c.goodPassed} passed`}</AppText>
          </View>
        </View>
      </ScrollView>
    </View>
  );
}

const styles = StyleSheet.create({
  column: { gap: space.md },
  figures: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  figure: { flexGrow: 1, flexBasis: 220, gap: space.xs, padding: space.md, borderWidth: 1, borderColor: colors.line, borderRadius: radius.md },
  valueRow: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: space.sm },
  table: { borderWidth: 1, borderColor: colors.line },
  tr: { flexDirection: 'row', borderBottomWidth: 1, borderBottomColor: colors.line },
  th: { backgroundColor: colors.surfaceSunken },
  first: { width: 200, padding: space.sm },
  td: { width: 130, padding: space.sm },
});
