// Limit tuning: one gauge's limit swept over the trial's values, each limit a dot at its escape rate
// (across) and false reject rate (up); the current limit is ringed and named. Picking a dot sets the draft's limit.
import { StyleSheet, View, Pressable } from 'react-native';
import type { Sweep } from '../../shared/api/trials';
import { colors, radius, space } from '../../lib/theme';
import { formatGaugeValue } from '../../lib/format';
import { AppText } from '../AppText';

interface LimitSweepPlotProps {
  sweep: Sweep;
  onPick: (limit: number) => void;
  /** The limit in the draft now (may differ from the trial's once picked). */
  draftLimit: number | undefined;
}

const PLOT = 240;
const DOT = 14;

function pct(v: number | null): string {
  return v === null ? '—' : `${(v * 100).toFixed(1)} %`;
}

export function LimitSweepPlot({ sweep, onPick, draftLimit }: LimitSweepPlotProps) {
  const points = sweep.points.filter((p) => p.falseRejectRate !== null && p.escapeRate !== null);
  if (points.length === 0) return <AppText tone="muted">The trial has no labelled good and defective photos with this gauge; the curve needs both.</AppText>;
  const current = sweep.current;
  return (
    <View style={styles.wrap}>
      <View style={styles.plotRow}>
        <AppText variant="caption" tone="muted" style={styles.yLabel}>False reject rate ↑</AppText>
        <View style={styles.plot} accessibilityLabel={`Curve of ${points.length} limits: false reject rate against escape rate`}>
          {[0.25, 0.5, 0.75].map((f) => (
            <View key={f} pointerEvents="none" style={[styles.grid, { bottom: f * PLOT }]} />
          ))}
          {points.map((p) => {
            const isCurrent = current !== null && p.limit === current;
            const isDraft = draftLimit !== undefined && p.limit === draftLimit;
            return (
              <Pressable
                key={p.limit}
                accessibilityRole="button"
                accessibilityLabel={`Limit ${formatGaugeValue(p.limit)}: false reject rate ${pct(p.falseRejectRate)}, escape rate ${pct(p.escapeRate)}${isCurrent ? ', the trial’s limit' : ''}`}
                onPress={() => onPick(p.limit)}
                hitSlop={8}
                style={[
                  styles.dot,
                  { left: p.escapeRate! * (PLOT - DOT), bottom: p.falseRejectRate! * (PLOT - DOT) },
                  isCurrent && styles.current,
                  isDraft && styles.draft,
                ]}
              />
            );
          })}
        </View>
      </View>
      <AppText variant="caption" tone="muted" style={styles.xLabel}>Escape rate →  (0 to 100 % on both axes)</AppText>
      <AppText variant="caption">
        {`◎ ringed: the trial’s limit ${current === null ? '(none)' : formatGaugeValue(current)}${draftLimit !== undefined && draftLimit !== current ? ` · ■ square: the draft’s limit ${formatGaugeValue(draftLimit)}` : ''}. Press a dot to use its limit in the draft.`}
      </AppText>
      <View style={styles.list} accessibilityLabel="Limits and their rates">
        {points.slice(0, 60).map((p) => (
          <Pressable
            key={p.limit}
            accessibilityRole="button"
            accessibilityLabel={`Use limit ${formatGaugeValue(p.limit)}`}
            onPress={() => onPick(p.limit)}
            style={({ pressed }) => [styles.option, pressed && styles.optionPressed, p.limit === draftLimit && styles.optionChosen]}
          >
            <AppText variant="caption">{`${p.limit === draftLimit ? '✓ ' : ''}${formatGaugeValue(p.limit)} → rejects ${pct(p.falseRejectRate)}, escapes ${pct(p.escapeRate)}`}</AppText>
          </Pressable>
        ))}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.sm },
  plotRow: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  yLabel: { width: 70 },
  plot: { width: PLOT, height: PLOT, borderLeftWidth: 2, borderBottomWidth: 2, borderColor: colors.ink, backgroundColor: colors.surface },
  grid: { position: 'absolute', left: 0, right: 0, height: 1, backgroundColor: colors.line },
  xLabel: { marginLeft: 78 },
  dot: { position: 'absolute', width: DOT, height: DOT, borderRadius: DOT / 2, backgroundColor: colors.steelMid },
  current: { borderWidth: 3, borderColor: colors.ink, backgroundColor: colors.surface },
  draft: { borderRadius: 0, backgroundColor: colors.steel },
  list: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  option: { minHeight: 44, justifyContent: 'center', paddingHorizontal: space.sm, borderWidth: 1, borderColor: colors.control, borderRadius: radius.md },
  optionPressed: { backgroundColor: colors.steelTint },
  optionChosen: { backgroundColor: colors.steelTint, borderColor: colors.steel },
});
