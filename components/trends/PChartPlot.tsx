// The p-chart drawn by the chart package: the share failed per subgroup, the centre line p̄, and the
// upper and lower control limits as steps that follow each subgroup's size.
import { useState } from 'react';
import { StyleSheet, Text, View, type LayoutChangeEvent } from 'react-native';
import { LineChart, EdgePosition, type DataSet, type lineDataItem } from 'react-native-gifted-charts';
import { colors, fonts, minTouchTarget } from '../../lib/theme';
import type { PChart } from '../../shared/api/trends';
import { CHART_LOOK, niceAxis } from './chartLook';

interface PChartPlotProps {
  chart: PChart;
  phone: boolean;
  onOpenPoint: (index: number) => void;
}

const HEIGHT = 220;
const Y_LABEL_WIDTH = 44;
/** Room for one x-axis label ("28 Nov"); labels in between are left out when points sit closer. */
const LABEL_ROOM = 52;

/** The subgroup's start, short: the day, and under it the hour for a shift (UTC, as the subgroups are cut). */
function axisText(start: string, bucket: PChart['bucket']): string {
  const day = new Date(start).toLocaleDateString(undefined, { day: 'numeric', month: 'short', timeZone: 'UTC' });
  return bucket === 'shift' ? `${day}\n${start.slice(11, 16)}` : day;
}

/** Points sit a touch target apart on a phone (the chart scrolls sideways); on a wide screen they share the width. */
function pointSpacing(phone: boolean, plotWidth: number, count: number): number {
  if (phone) return minTouchTarget;
  return Math.max(16, Math.min(64, Math.floor(plotWidth / Math.max(count, 1))));
}

export function PChartPlot({ chart, phone, onOpenPoint }: PChartPlotProps) {
  const [width, setWidth] = useState(0);
  const onLayout = (event: LayoutChangeEvent) => setWidth(Math.floor(event.nativeEvent.layout.width));
  const points = chart.points;
  const plotWidth = Math.max(0, width - Y_LABEL_WIDTH - 24);
  const spacing = pointSpacing(phone, plotWidth, points.length);
  const labelLines = chart.bucket === 'shift' ? 2 : 1;
  const labelEvery = Math.max(1, Math.ceil(LABEL_ROOM / spacing));
  const { max, sections } = niceAxis(Math.max(...points.map((p) => Math.max(p.p, p.ucl)), chart.center ?? 0) * 100 * 1.05);
  const hitSize = Math.max(spacing - 2, 12);
  const signalled = points.filter((p) => p.signal).length;
  const summary = `p-chart of ${points.length} subgroups, ${signalled} marked by a run rule. Show as table lists every value.`;

  // The chart package reads the x-axis labels from its first data set; counted back from the latest subgroup, which shows first.
  const labelOf = (i: number) => ((points.length - 1 - i) % labelEvery === 0 ? axisText(points[i].start, chart.bucket) : '');
  // Wider than the gap between two points, centred under its point, so a date is not cut short
  // (maxWidth too: a one-line text on the web is otherwise kept within its parent, the gap's width).
  const axisLabel = (text: string) => () => (
    <Text numberOfLines={labelLines} style={[styles.axisText, { width: LABEL_ROOM, maxWidth: LABEL_ROOM, marginLeft: -(LABEL_ROOM - spacing) / 2 }]}>
      {text}
    </Text>
  );
  const shares: lineDataItem[] = points.map((point, i) => ({
    value: point.p * 100,
    ...(point.signal
      ? { dataPointShape: 'rectangular', dataPointWidth: CHART_LOOK.signal.size, dataPointHeight: CHART_LOOK.signal.size, dataPointColor: CHART_LOOK.signal.colour }
      : { dataPointShape: 'circular', dataPointRadius: CHART_LOOK.share.radius, dataPointColor: CHART_LOOK.share.colour }),
  }));
  const flat = (value: number): lineDataItem[] => points.map(() => ({ value, hideDataPoint: true }));
  // Transparent squares a touch target wide over every point, on top of the drawn series: they take the taps.
  const hitTargets: lineDataItem[] = points.map((point, i) => ({
    value: point.p * 100,
    dataPointShape: 'rectangular',
    dataPointWidth: hitSize,
    dataPointHeight: Math.max(hitSize, minTouchTarget),
    dataPointColor: 'transparent',
    onPress: () => onOpenPoint(i),
  }));

  const dataSet: DataSet[] = [
    { data: points.map((p, i) => ({ value: p.ucl * 100, labelComponent: axisLabel(labelOf(i)), hideDataPoint: true })), color: CHART_LOOK.limits.colour, thickness: 2, strokeDashArray: CHART_LOOK.limits.dash, stepChart: true, hideDataPoints: true },
    { data: points.map((p) => ({ value: p.lcl * 100, hideDataPoint: true })), color: CHART_LOOK.limits.colour, thickness: 2, strokeDashArray: CHART_LOOK.limits.dash, stepChart: true, hideDataPoints: true },
    { data: flat((chart.center ?? 0) * 100), color: CHART_LOOK.centre.colour, thickness: 2, hideDataPoints: true },
    { data: shares, color: CHART_LOOK.share.colour, thickness: 2 },
    { data: hitTargets, color: 'transparent', thickness: 0 },
  ];

  return (
    <View onLayout={onLayout} style={styles.frame} role="img" aria-label={summary}>
      {width > 0 ? (
        <LineChart
          dataSet={dataSet}
          height={HEIGHT}
          width={plotWidth}
          spacing={spacing}
          initialSpacing={spacing / 2 + 4}
          endSpacing={spacing / 2 + 4}
          edgePosition={EdgePosition.AROUND_DATA_POINT}
          maxValue={max}
          noOfSections={sections}
          formatYLabel={(label: string) => `${Number(label).toFixed(max < 5 ? 1 : 0)} %`}
          yAxisLabelWidth={Y_LABEL_WIDTH}
          xAxisTextNumberOfLines={labelLines}
          yAxisTextStyle={styles.axisText}
          xAxisColor={CHART_LOOK.axis}
          yAxisColor={CHART_LOOK.axis}
          rulesColor={CHART_LOOK.rules}
          rulesType="solid"
          scrollToEnd
          showScrollIndicator={phone}
          nestedScrollEnabled
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  frame: { width: '100%', minHeight: HEIGHT + 48, backgroundColor: colors.surface, overflow: 'hidden' },
  axisText: { fontFamily: fonts.regular, fontSize: 11, color: colors.inkMuted, textAlign: 'center' },
});
