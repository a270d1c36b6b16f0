import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '../../lib/theme';
import type { InspectionMeasurement } from '../../shared/api/inspections';
import { unitSuffix } from '../../shared/rules/units';
import { AppText } from '../AppText';

function formatValue(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const abs = Math.abs(value);
  return abs !== 0 && (abs < 0.01 || abs >= 1e6) ? value.toExponential(2) : String(Number(value.toPrecision(4)));
}

export function describeLimits(min: number | null, max: number | null, unit: string): string {
  const u = unitSuffix(unit);
  if (min !== null && max !== null) return `${formatValue(min)} to ${formatValue(max)}${u}`;
  if (min !== null) return `at least ${formatValue(min)}${u}`;
  if (max !== null) return `at most ${formatValue(max)}${u}`;
  return 'no limit';
}

/** Each gauge's value against its limits, with "within" or "outside" in words. */
export function MeasurementList({ measurements }: { measurements: InspectionMeasurement[] }) {
  if (measurements.length === 0) {
    return <AppText tone="muted">No gauge was measured: the photo did not pass the quality gate.</AppText>;
  }
  return (
    <View style={styles.list} role="list" aria-label="Measurements against limits">
      {measurements.map((m) => (
        <View key={m.gauge} role="listitem" style={[styles.row, !m.pass && styles.rowOutside]}>
          <View style={styles.name}>
            <AppText variant="bodyStrong">{m.gauge}</AppText>
            <AppText variant="caption" tone="muted">{`Limits: ${describeLimits(m.limitMin, m.limitMax, m.unit)}`}</AppText>
          </View>
          <View style={styles.value}>
            <AppText variant="bodyStrong">{`${formatValue(m.value)}${unitSuffix(m.unit)}`}</AppText>
            <AppText variant="label" tone={m.pass ? 'notice' : 'danger'}>
              {m.pass ? '✓ within' : '✕ outside'}
            </AppText>
          </View>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.xs },
  row: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    gap: space.md,
    paddingVertical: space.sm,
    paddingHorizontal: space.md,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  rowOutside: { borderColor: colors.danger, borderLeftWidth: 4 },
  name: { flexShrink: 1, gap: space.xxs },
  value: { alignItems: 'flex-end', gap: space.xxs },
});
