// Failures per cause as bars, largest first, with the cumulative share as a line: the left axis counts
// failures up to the total, the right axis reads the same height as 0–100 %, so the line ends at the top.
import { useState } from 'react';
import { StyleSheet, View, type LayoutChangeEvent } from 'react-native';
import { BarChart, type barDataItem, type lineDataItem } from 'react-native-gifted-charts';
import { fitLines } from '../../lib/format';
import { colors, fonts } from '../../lib/theme';
import type { Pareto } from '../../shared/api/trends';
import { CHART_LOOK } from './chartLook';

interface ParetoPlotProps {
  pareto: Pareto;
  phone: boolean;
  onOpenCause: (cause: string) => void;
}

const HEIGHT = 200;
const Y_LABEL_WIDTH = 48;

/** As many sections as divide the total evenly (so the count axis reads whole parts), else four. */
function sectionsFor(total: number): number {
  return [4, 5, 3, 2].find((n) => total % n === 0) ?? 4;
}

/** Lines a bar's cause may take below it; longer names end in "…" (the list below the chart has them whole). */
const LABEL_LINES = 2;
const LABEL_LINE_HEIGHT = 14;

export function ParetoPlot({ pareto, phone, onOpenCause }: ParetoPlotProps) {
  const [width, setWidth] = useState(0);
  const onLayout = (event: LayoutChangeEvent) => setWidth(Math.floor(event.nativeEvent.layout.width));
  const bars = pareto.bars;
  const plotWidth = Math.max(0, width - 2 * Y_LABEL_WIDTH - 8);
  // A bar at least a touch target wide on a phone (the chart scrolls when causes are many).
  const barWidth = phone ? 44 : Math.max(24, Math.min(56, Math.floor((plotWidth / Math.max(bars.length, 1)) * 0.6)));
  const spacing = Math.max(12, Math.round(barWidth * 0.5));
  const total = Math.max(pareto.totalFailures, 1);
  const sections = sectionsFor(total);

  const barData: barDataItem[] = bars.map((bar) => ({
    value: bar.count,
    // About 7 px a character at 11 px.
    label: fitLines(bar.cause, Math.max(4, Math.floor((barWidth + spacing) / 7)), LABEL_LINES),
    frontColor: CHART_LOOK.share.colour,
    onPress: () => onOpenCause(bar.cause),
  }));
  const lineData: lineDataItem[] = bars.map((bar) => ({ value: bar.cumulative * total }));
  const summary = `Causes of failure, largest first: ${bars
    .slice(0, 5)
    .map((b) => `${b.cause} ${b.count}`)
    .join(', ')}${bars.length > 5 ? ', and more' : ''}. The list below has every cause.`;

  return (
    <View onLayout={onLayout} style={styles.frame} role="img" aria-label={summary}>
      {width > 0 ? (
        <BarChart
          data={barData}
          height={HEIGHT}
          width={plotWidth}
          barWidth={barWidth}
          spacing={spacing}
          initialSpacing={spacing}
          endSpacing={spacing}
          maxValue={total}
          noOfSections={sections}
          formatYLabel={(label: string) => String(Math.round(Number(label) * 10) / 10)}
          yAxisLabelWidth={Y_LABEL_WIDTH}
          yAxisTextStyle={styles.axisText}
          xAxisLabelTextStyle={[styles.axisText, { width: barWidth + spacing }]}
          labelWidth={barWidth + spacing}
          xAxisTextNumberOfLines={LABEL_LINES}
          xAxisLabelsHeight={LABEL_LINES * LABEL_LINE_HEIGHT}
          xAxisColor={CHART_LOOK.axis}
          yAxisColor={CHART_LOOK.axis}
          rulesColor={CHART_LOOK.rules}
          rulesType="solid"
          showLine
          lineData={lineData}
          lineConfig={{ color: CHART_LOOK.centre.colour, thickness: 2, dataPointsColor: CHART_LOOK.centre.colour, dataPointsRadius: 4 }}
          secondaryYAxis={{ maxValue: 100, noOfSections: sections, formatYLabel: (label: string) => `${Math.round(Number(label))} %`, yAxisTextStyle: styles.axisText, yAxisColor: CHART_LOOK.axis, yAxisLabelWidth: Y_LABEL_WIDTH }}
          showScrollIndicator={phone}
          nestedScrollEnabled
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  frame: { width: '100%', minHeight: HEIGHT + 34 + LABEL_LINES * LABEL_LINE_HEIGHT, backgroundColor: colors.surface },
  axisText: { fontFamily: fonts.regular, fontSize: 11, lineHeight: LABEL_LINE_HEIGHT, color: colors.inkMuted, textAlign: 'center' },
});
