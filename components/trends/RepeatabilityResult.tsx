import { ScrollView, StyleSheet, View } from 'react-native';
import { formatDateTime } from '../../lib/format';
import { calloutStyle, colors, minTouchTarget, radius, space } from '../../lib/theme';
import type { RepeatabilityStudy } from '../../shared/api/studies';
import { unitSuffix } from '../../shared/rules/units';
import { AppText } from '../AppText';
import { VerdictMark } from '../inspect/VerdictMark';

const KNOWN_WORDS: Record<RepeatabilityStudy['knownLabel'], string> = { good: 'known good', defective: 'known defective', unknown: 'not judged by a person' };

function number(value: number): string {
  const size = Math.abs(value);
  return size !== 0 && (size < 0.01 || size >= 1e5) ? value.toExponential(2) : value.toFixed(size < 10 ? 3 : 1);
}

/** A sentence on what the verdicts mean for a part someone qualified has judged. */
function againstKnown(study: RepeatabilityStudy): string | null {
  if (study.knownLabel === 'good' && study.verdicts.FAIL > 0) return `${study.verdicts.FAIL} of the photos failed a part known to be good (false rejects).`;
  if (study.knownLabel === 'defective' && study.verdicts.PASS > 0) return `${study.verdicts.PASS} of the photos passed a part known to be defective (escapes).`;
  return null;
}

const GAUGE_COLUMNS = [
  { title: 'Gauge', width: 150 },
  { title: 'n', width: 44 },
  { title: 'Mean', width: 84 },
  { title: 'Std dev (s)', width: 92 },
  { title: 'Range', width: 84 },
  { title: 'Limits', width: 120 },
  { title: '% tolerance', width: 96 },
] as const;

/** How one part fared when photographed again and again: verdict counts, consistency, and the spread of each gauge. */
export function RepeatabilityResult({ study }: { study: RepeatabilityStudy }) {
  const judged = study.verdicts.PASS + study.verdicts.FAIL;
  const warning = againstKnown(study);
  return (
    <View style={styles.result}>
      <AppText tone="muted">{`Part “${study.partLabel}” (${KNOWN_WORDS[study.knownLabel]}) · ${study.ruleName} v${study.ruleVersionNumber} at ${study.stationName} · ${study.photos} photos · ${study.createdBy}, ${formatDateTime(study.createdAt)}`}</AppText>
      <View style={[styles.verdictLine, study.consistent ? styles.same : styles.differs]}>
        <AppText variant="bodyStrong" tone={study.consistent ? 'notice' : 'danger'}>
          {judged === 0
            ? '– No photo could be judged: every one was a RETAKE.'
            : study.consistent
              ? `✓ Consistent: every judged photo got the same verdict (${study.verdicts.PASS > 0 ? 'PASS' : 'FAIL'}).`
              : `✕ Not consistent: the same part got ${study.verdicts.PASS} PASS and ${study.verdicts.FAIL} FAIL.`}
        </AppText>
        {study.verdicts.RETAKE > 0 ? <AppText variant="caption">{`${study.verdicts.RETAKE} RETAKE (photo unusable) left out of the comparison.`}</AppText> : null}
        {warning ? <AppText variant="caption" tone="danger">{`⚠ ${warning}`}</AppText> : null}
      </View>
      <View style={styles.counts} role="list" aria-label="Verdict counts">
        {(['PASS', 'FAIL', 'RETAKE'] as const).map((verdict) => (
          <View key={verdict} role="listitem" style={styles.count} accessibilityLabel={`${verdict}: ${study.verdicts[verdict]}`}>
            <VerdictMark verdict={verdict} size={24} />
            <AppText variant="bodyStrong">{`${study.verdicts[verdict]} ${verdict}`}</AppText>
          </View>
        ))}
      </View>
      <AppText variant="label">Photo by photo</AppText>
      <View style={styles.photos}>
        {study.results.map((r) => (
          <View key={r.position} style={styles.photo} accessibilityLabel={`Photo ${r.position}: ${r.verdict}${r.cause ? `, ${r.cause}` : ''}`}>
            <VerdictMark verdict={r.verdict} size={16} />
            <AppText variant="caption">{`${r.position}${r.cause ? ` · ${r.cause}` : ''}`}</AppText>
          </View>
        ))}
      </View>
      <AppText variant="label">Spread of each gauge</AppText>
      {study.gauges.length === 0 ? (
        <AppText tone="muted">No gauge values: no photo passed the quality gate.</AppText>
      ) : (
        <ScrollView horizontal>
          <View role="table" aria-label="Spread of each gauge over the photos" style={styles.table}>
            <View role="row" style={[styles.row, styles.head]}>
              {GAUGE_COLUMNS.map((c) => (
                <View key={c.title} role="columnheader" style={[styles.cell, { width: c.width }]}>
                  <AppText variant="label">{c.title}</AppText>
                </View>
              ))}
            </View>
            {study.gauges.map((g) => {
              const unit = unitSuffix(g.unit);
              const limits = g.limitMin === null && g.limitMax === null ? '—' : `${g.limitMin === null ? '' : `${number(g.limitMin)} ≤ `}x${g.limitMax === null ? '' : ` ≤ ${number(g.limitMax)}`}`;
              const cells = [g.gauge, String(g.n), `${number(g.mean)}${unit}`, number(g.standardDeviation), number(g.range), limits, g.shareOfTolerance === null ? '—' : `${(g.shareOfTolerance * 100).toFixed(1)} %`];
              return (
                <View key={g.gauge} role="row" style={styles.row}>
                  {cells.map((text, i) => (
                    <View key={GAUGE_COLUMNS[i].title} role="cell" style={[styles.cell, { width: GAUGE_COLUMNS[i].width }]}>
                      <AppText variant="caption">{text}</AppText>
                    </View>
                  ))}
                </View>
              );
            })}
          </View>
        </ScrollView>
      )}
      <AppText variant="caption" tone="muted">
        % tolerance is 6·s as a share of the band between the gauge’s two limits (AIAG MSA, 4th edition). The manual’s guidance for a measurement system: under 10 % acceptable, 10–30 % may be acceptable depending on the use, over 30 % unacceptable.
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  result: { gap: space.sm },
  verdictLine: { gap: space.xxs },
  same: calloutStyle('notice'),
  differs: calloutStyle('danger'),
  counts: { flexDirection: 'row', flexWrap: 'wrap', gap: space.lg },
  count: { flexDirection: 'row', alignItems: 'center', gap: space.sm, minHeight: minTouchTarget },
  photos: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  photo: { flexDirection: 'row', alignItems: 'center', gap: space.xs, paddingHorizontal: space.xs, paddingVertical: space.xxs, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line },
  table: { borderWidth: 1, borderColor: colors.line },
  row: { flexDirection: 'row', borderBottomWidth: 1, borderBottomColor: colors.line },
  head: { backgroundColor: colors.surfaceSunken },
  cell: { paddingHorizontal: space.sm, paddingVertical: space.xs, justifyContent: 'center' },
});
