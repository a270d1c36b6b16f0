import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import type { PChart } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { CHART_LOOK } from './chartLook';
import { runRuleName } from './runRuleNames';

const SHOWN_AT_FIRST = 8;

interface SignalListProps {
  chart: PChart;
  onOpenPoint: (index: number) => void;
}

/** Every run rule that fired, newest first, in words; each opens the inspections of the subgroup that completed it. */
export function SignalList({ chart, onOpenPoint }: SignalListProps) {
  const [showAll, setShowAll] = useState(false);
  const signals = [...chart.signals].sort((a, b) => b.pointIndex - a.pointIndex || a.rule.localeCompare(b.rule));
  if (signals.length === 0) {
    return (
      <AppText tone="muted">
        {`✓ No run rule fired in this range (${chart.runRules === 'nelson' ? 'Nelson rules 1–8' : 'Western Electric rules 1–4'}). The process looks in control for these filters.`}
      </AppText>
    );
  }
  const shown = showAll ? signals : signals.slice(0, SHOWN_AT_FIRST);
  return (
    <View style={styles.list}>
      <AppText variant="label">{`${signals.length} signal${signals.length === 1 ? '' : 's'}, newest first`}</AppText>
      {shown.map((signal) => {
        const point = chart.points[signal.pointIndex];
        const label = point?.label ?? `point ${signal.pointIndex + 1}`;
        return (
          <Pressable
            key={`${signal.rule}-${signal.pointIndex}`}
            accessibilityRole="link"
            accessibilityLabel={`${runRuleName(signal.rule)} at ${label}: ${signal.description}. Open the failed inspections of ${label}.`}
            onPress={() => onOpenPoint(signal.pointIndex)}
            style={({ pressed }) => [styles.row, pressed && styles.rowPressed]}
          >
            <View style={styles.mark} aria-hidden />
            <View style={styles.text}>
              <AppText variant="bodyStrong">{`${label} · ${runRuleName(signal.rule)} (${signal.rule})`}</AppText>
              <AppText tone="muted">{signal.description}</AppText>
            </View>
            <AppText variant="label" tone="steel">
              Inspections ›
            </AppText>
          </Pressable>
        );
      })}
      {signals.length > SHOWN_AT_FIRST ? (
        <Button
          label={showAll ? 'Show fewer signals' : `Show all ${signals.length} signals`}
          variant="quiet"
          onPress={() => setShowAll(!showAll)}
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: minTouchTarget, paddingVertical: space.sm, paddingHorizontal: space.sm, borderRadius: radius.md, borderBottomWidth: 1, borderBottomColor: colors.line },
  rowPressed: { backgroundColor: colors.steelTint },
  mark: { width: CHART_LOOK.signal.size, height: CHART_LOOK.signal.size, backgroundColor: CHART_LOOK.signal.colour },
  text: { flex: 1, gap: space.xxs },
});
