// Gauge values against their limits: the word and a symbol say within or outside, never colour alone.
import { StyleSheet, View } from 'react-native';
import type { Limits } from '../../shared/rules/schema';
import { describeLimits, unitSuffix } from '../../shared/rules/units';
import { colors, space } from '../../lib/theme';
import { formatGaugeValue } from '../../lib/format';
import { AppText } from '../AppText';

export interface ShownMeasurement {
  name: string;
  value: number;
  unit: string | null;
  limits: Limits;
  pass: boolean;
}

/** A gauge value with its unit, as the table shows it. */
export function valueWithUnit(value: number, unit: string | null): string {
  return `${formatGaugeValue(value)}${unitSuffix(unit)}`;
}

export function MeasurementTable({ measurements }: { measurements: ShownMeasurement[] }) {
  if (measurements.length === 0) return <AppText tone="muted">No gauges: add one to judge the photo.</AppText>;
  return (
    <View role="table" accessibilityLabel="Gauge values" style={styles.table}>
      {measurements.map((m) => (
        <View role="row" key={m.name} style={styles.row}>
          <AppText role="cell" variant="bodyStrong" style={styles.name}>{m.name}</AppText>
          <AppText role="cell" style={styles.value}>{valueWithUnit(m.value, m.unit)}</AppText>
          <AppText role="cell" tone="muted" style={styles.limits}>{describeLimits(m.limits.min, m.limits.max, m.unit)}</AppText>
          <AppText role="cell" variant="label" tone={m.pass ? 'notice' : 'danger'} style={styles.outcome}>
            {m.pass ? '✓ within limits' : '✕ outside limits'}
          </AppText>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  table: { gap: space.xxs },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, paddingVertical: space.xs, borderBottomWidth: 1, borderBottomColor: colors.line },
  name: { flexBasis: 160, flexGrow: 1 },
  value: { flexBasis: 100 },
  limits: { flexBasis: 120 },
  outcome: { flexBasis: 120 },
});
