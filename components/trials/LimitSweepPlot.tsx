// Limit tuning: one gauge's limit swept over the trial's values, each limit a dot at its escape rate
// (across) and false reject rate (up); the current limit is ringed and named. Picking a dot sets the draft's limit.
import { useState } from 'react';
import { StyleSheet, View, Pressable } from 'react-native';
import type { Sweep } from '../../shared/api/trials';
import { colors, radius, space } from '../../lib/theme';
import { formatGaugeValue } from '../../lib/format';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { axisEnd, distinctLabels, dotsOf } from './sweepDots';

interface LimitSweepPlotProps {
  sweep: Sweep;
  onPick: (limit: number) => void;
  /** The limit in the draft now (may differ from the trial's once picked). */
  draftLimit: number | undefined;
}

const PLOT = 240;
const DOT = 14;
/** Width of the false reject rate's tick labels, left of the plot. */
const Y_TICKS = 48;
/** Width of an escape rate's tick label, under the plot. */
const X_TICK = 48;

function pct(v: number | null): string {
  return v === null ? '—' : `${(v * 100).toFixed(1)} %`;
}

const tickText = (v: number) => `${Math.round(v * 1000) / 10} %`;

export function LimitSweepPlot({ sweep, onPick, draftLimit }: LimitSweepPlotProps) {
  const [listOpen, setListOpen] = useState(false);
  const points = sweep.points.filter((p) => p.falseRejectRate !== null && p.escapeRate !== null);
  if (points.length === 0) return <AppText tone="muted">The trial has no labelled good and defective photos with this gauge; the curve needs both.</AppText>;
  const current = sweep.current;
  const xEnd = axisEnd(Math.max(...points.map((p) => p.escapeRate!)));
  const yEnd = axisEnd(Math.max(...points.map((p) => p.falseRejectRate!)));
  const dots = dotsOf(points, (limit) => limit === current || limit === draftLimit);
  const currentDrawn = current !== null && dots.some((d) => d.point.limit === current);
  // The list: one row per dot, in the order of the limits, each limit written so that no two rows read alike.
  const rows = [...dots].sort((a, b) => a.first - b.first);
  const shown = distinctLabels(rows.flatMap((d) => [d.first, d.last]), formatGaugeValue);
  const rowLimits = rows.map((d, i) => (d.limits > 1 ? `${shown[2 * i]} to ${shown[2 * i + 1]} (${d.limits} limits)` : shown[2 * i]));
  const ticks = [0, 0.5, 1];
  return (
    <View style={styles.wrap}>
      <AppText variant="caption" tone="muted">False reject rate ↑</AppText>
      <View style={styles.plotRow}>
        <View style={styles.yTicks} pointerEvents="none">
          {ticks.map((f) => (
            <AppText key={f} variant="caption" tone="muted" style={[styles.yTick, { bottom: f * (PLOT - DOT) }]}>
              {tickText(f * yEnd)}
            </AppText>
          ))}
        </View>
        <View style={styles.plot} accessibilityLabel={`Curve of ${points.length} limits: false reject rate (0 to ${tickText(yEnd)}) against escape rate (0 to ${tickText(xEnd)})`}>
          {[0.25, 0.5, 0.75].map((f) => (
            <View key={f} pointerEvents="none" style={[styles.grid, { bottom: f * PLOT }]} />
          ))}
          {dots.map(({ point: p, first, last, limits }) => {
            const isCurrent = current !== null && p.limit === current;
            const isDraft = draftLimit !== undefined && p.limit === draftLimit;
            const which = limits > 1 ? `Limits ${formatGaugeValue(first)} to ${formatGaugeValue(last)} (${limits}, the same rates), this one ${formatGaugeValue(p.limit)}` : `Limit ${formatGaugeValue(p.limit)}`;
            return (
              <Pressable
                key={p.limit}
                accessibilityRole="button"
                accessibilityLabel={`${which}: false reject rate ${pct(p.falseRejectRate)}, escape rate ${pct(p.escapeRate)}${isCurrent ? ', the trial’s limit' : ''}`}
                onPress={() => onPick(p.limit)}
                hitSlop={8}
                style={[
                  styles.dot,
                  { left: (p.escapeRate! / xEnd) * (PLOT - DOT), bottom: (p.falseRejectRate! / yEnd) * (PLOT - DOT) },
                  isCurrent && styles.current,
                  isDraft && styles.draft,
                ]}
              />
            );
          })}
        </View>
      </View>
      <View style={styles.xTicks} pointerEvents="none">
        {ticks.map((f) => (
          <AppText key={f} variant="caption" tone="muted" numberOfLines={1} style={[styles.xTick, f === 0 ? styles.xTickFirst : f === 1 ? styles.xTickLast : { left: f * (PLOT - DOT) + DOT / 2 - X_TICK / 2 }]}>
            {tickText(f * xEnd)}
          </AppText>
        ))}
      </View>
      <AppText variant="caption" tone="muted" style={styles.xLabel}>{`Escape rate →${xEnd < 1 || yEnd < 1 ? '  (axes zoomed to the rates the trial reached)' : ''}`}</AppText>
      <AppText variant="caption">
        {`${currentDrawn ? '◎ ringed: the trial’s limit ' : 'The trial’s limit '}${current === null ? '(none)' : formatGaugeValue(current)}${currentDrawn || current === null ? '' : ' is not among the dots'}${draftLimit !== undefined && draftLimit !== current ? ` · ■ square: the draft’s limit ${formatGaugeValue(draftLimit)}` : ''}. Press a dot to use its limit in the draft.`}
      </AppText>
      <Button
        label={listOpen ? 'Hide the list of limits' : `List the limits (${rows.length} ${rows.length === 1 ? 'row' : 'rows'})`}
        variant="quiet"
        compact
        expanded={listOpen}
        onPress={() => setListOpen(!listOpen)}
        style={styles.start}
      />
      {listOpen ? (
        <View style={styles.list} accessibilityLabel="Limits and their rates">
          {rows.map(({ point: p }, i) => (
            <Pressable
              key={p.limit}
              accessibilityRole="button"
              accessibilityLabel={`Use limit ${formatGaugeValue(p.limit)}: rejects ${pct(p.falseRejectRate)}, escapes ${pct(p.escapeRate)}`}
              onPress={() => onPick(p.limit)}
              style={({ pressed }) => [styles.option, pressed && styles.optionPressed, p.limit === draftLimit && styles.optionChosen]}
            >
              <AppText variant="caption">{`${p.limit === draftLimit ? '✓ ' : ''}${rowLimits[i]} → rejects ${pct(p.falseRejectRate)}, escapes ${pct(p.escapeRate)}`}</AppText>
            </Pressable>
          ))}
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.sm },
  plotRow: { flexDirection: 'row', alignItems: 'flex-end', gap: space.xs },
  yTicks: { width: Y_TICKS, height: PLOT },
  yTick: { position: 'absolute', right: 0, lineHeight: DOT },
  xTicks: { height: 18, marginLeft: Y_TICKS + space.xs, width: PLOT },
  xTick: { position: 'absolute', top: 0, width: X_TICK, textAlign: 'center' },
  xTickFirst: { left: 0, textAlign: 'left' },
  xTickLast: { right: 0, textAlign: 'right' },
  plot: { width: PLOT, height: PLOT, borderLeftWidth: 2, borderBottomWidth: 2, borderColor: colors.ink, backgroundColor: colors.surface },
  grid: { position: 'absolute', left: 0, right: 0, height: 1, backgroundColor: colors.line },
  xLabel: { marginLeft: Y_TICKS + space.xs },
  dot: { position: 'absolute', width: DOT, height: DOT, borderRadius: DOT / 2, backgroundColor: colors.steelMid },
  current: { borderWidth: 3, borderColor: colors.ink, backgroundColor: colors.surface },
  draft: { borderRadius: 0, backgroundColor: colors.steel },
  list: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  start: { alignSelf: 'flex-start' },
  // A row as wide as its text, never wider than the list: a long range wraps onto a second line.
  option: { minHeight: 44, maxWidth: '100%', justifyContent: 'center', paddingHorizontal: space.sm, borderWidth: 1, borderColor: colors.control, borderRadius: radius.md },
  optionPressed: { backgroundColor: colors.steelTint },
  optionChosen: { backgroundColor: colors.steelTint, borderColor: colors.steel },
});
