import { Pressable, ScrollView, StyleSheet, View } from 'react-native';
import { colors, minTouchTarget, space } from '../../lib/theme';
import type { PChart } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { formatPercent } from '../../lib/format';

const COLUMNS = [
  { key: 'start', title: 'Subgroup', width: 132, numeric: false },
  { key: 'n', title: 'n judged', width: 72, numeric: true },
  { key: 'defectives', title: 'Failed', width: 64, numeric: true },
  { key: 'p', title: 'p', width: 72, numeric: true },
  { key: 'lcl', title: 'LCL', width: 72, numeric: true },
  { key: 'ucl', title: 'UCL', width: 72, numeric: true },
  { key: 'signal', title: 'Signal', width: 112, numeric: false },
  { key: 'open', title: 'Inspections', width: 96, numeric: false },
] as const;

interface PChartTableProps {
  chart: PChart;
  onOpenPoint: (index: number) => void;
}

/** The chart's numbers, one row per subgroup, for screen readers and for reading exact values. */
export function PChartTable({ chart, onOpenPoint }: PChartTableProps) {
  const rulesAt = new Map<number, string[]>();
  for (const s of chart.signals) rulesAt.set(s.pointIndex, [...(rulesAt.get(s.pointIndex) ?? []), s.rule]);
  return (
    <ScrollView horizontal contentContainerStyle={styles.scroller}>
      <View role="table" aria-label={`p-chart values, ${chart.points.length} subgroups; centre line p̄ ${chart.center === null ? 'none' : formatPercent(chart.center, 2)}`} style={styles.table}>
        <View role="row" style={[styles.row, styles.head]}>
          {COLUMNS.map((c) => (
            <View key={c.key} role="columnheader" style={[styles.cell, c.numeric && styles.number, { width: c.width }]}>
              <AppText variant="label">{c.title}</AppText>
            </View>
          ))}
        </View>
        {chart.points.map((point, i) => {
          const rules = rulesAt.get(i) ?? [];
          return (
            <View key={point.start} role="row" style={styles.row}>
              <View role="cell" style={[styles.cell, { width: COLUMNS[0].width }]}>
                <AppText variant="caption">{point.label}</AppText>
              </View>
              {[String(point.n), String(point.defectives), formatPercent(point.p, 2), formatPercent(point.lcl, 2), formatPercent(point.ucl, 2)].map((text, c) => (
                <View key={COLUMNS[c + 1].key} role="cell" style={[styles.cell, styles.number, { width: COLUMNS[c + 1].width }]}>
                  <AppText variant="caption">{text}</AppText>
                </View>
              ))}
              <View role="cell" style={[styles.cell, { width: COLUMNS[6].width }]}>
                <AppText variant="caption" tone={point.signal ? 'danger' : 'muted'}>
                  {point.signal ? `■ ${rules.join(', ') || 'yes'}` : '—'}
                </AppText>
              </View>
              <View role="cell" style={[styles.cell, { width: COLUMNS[7].width }]}>
                <Pressable
                  accessibilityRole="link"
                  accessibilityLabel={`Open the failed inspections of ${point.label}`}
                  onPress={() => onOpenPoint(i)}
                  style={styles.open}
                >
                  <AppText variant="label" tone="steel">
                    Open ›
                  </AppText>
                </Pressable>
              </View>
            </View>
          );
        })}
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  scroller: { flexGrow: 1 },
  table: { borderWidth: 1, borderColor: colors.line, flexGrow: 1 },
  row: { flexDirection: 'row', alignItems: 'center', borderBottomWidth: 1, borderBottomColor: colors.line, minHeight: minTouchTarget },
  head: { backgroundColor: colors.surfaceSunken },
  cell: { paddingHorizontal: space.sm, paddingVertical: space.xs, justifyContent: 'center' },
  number: { alignItems: 'flex-end' },
  open: { minHeight: minTouchTarget, justifyContent: 'center' },
});
