import { StyleSheet, View } from 'react-native';
import { formatGaugeValue } from '../../lib/format';
import { colors, radius, space } from '../../lib/theme';
import type { InspectionMeasurement } from '../../shared/api/inspections';
import { describeLimits, unitSuffix } from '../../shared/rules/units';
import { AppText } from '../AppText';

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
            <AppText variant="bodyStrong">{`${formatGaugeValue(m.value)}${unitSuffix(m.unit)}`}</AppText>
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
