import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { usePChart } from '../../hooks/useTrends';
import { colors, space } from '../../lib/theme';
import type { RunRuleSet, TrendBucket, TrendFilters } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { ChartLegend } from './ChartLegend';
import { formatPercent } from '../../lib/format';
import { PChartPlot } from './PChartPlot';
import { PChartTable } from './PChartTable';
import { recordsHref } from './recordsLink';
import { SignalList } from './SignalList';

interface ControlChartCardProps {
  filters: TrendFilters;
  bucket: TrendBucket;
  runRules: RunRuleSet;
  phone: boolean;
}

/** The p-chart of the chosen filters with its signals in words and, on request, its numbers as a table. */
export function ControlChartCard({ filters, bucket, runRules, phone }: ControlChartCardProps) {
  const router = useRouter();
  const chart = usePChart({ ...filters, bucket, runRules });
  const [asTable, setAsTable] = useState(false);
  const data = chart.data;

  const openPoint = (index: number) => {
    const point = data?.points[index];
    if (!point) return;
    router.push(recordsHref({ ...filters, from: point.start, to: point.end, verdict: 'FAIL' }));
  };

  let body;
  if (chart.isPending) body = <LoadingState label="Drawing the control chart…" />;
  else if (chart.isError) body = <ErrorState error={chart.error} onRetry={() => chart.refetch()} />;
  else if (chart.data.points.length === 0)
    body = (
      <EmptyState
        title="No judged parts in this range"
        body="Nothing was judged PASS or FAIL for these filters. Widen the range or clear a filter; RETAKE photos are not parts judged and are left out."
      />
    );
  else
    body = (
      <>
        <AppText tone="muted">
          {`p̄ = ${chart.data.center === null ? '—' : formatPercent(chart.data.center, 2)} over ${chart.data.points.reduce((s, p) => s + p.n, 0)} parts judged in ${chart.data.points.length} ${bucket === 'day' ? 'days' : 'shifts'}. Limits p̄ ± 3·√(p̄(1−p̄)/n) follow each subgroup's size.`}
        </AppText>
        <View style={styles.toggleRow}>
          <Button
            label={asTable ? 'Show as chart' : 'Show as table'}
            variant="secondary"
            compact
            onPress={() => setAsTable(!asTable)}
            accessibilityHint={asTable ? 'Draws the values as a chart' : 'Lists every subgroup with its numbers'}
          />
          {chart.isFetching ? <ActivityIndicator color={colors.steel} accessibilityLabel="Updating the chart" /> : null}
        </View>
        {asTable ? (
          <PChartTable chart={chart.data} onOpenPoint={openPoint} />
        ) : (
          <>
            <PChartPlot chart={chart.data} phone={phone} onOpenPoint={openPoint} />
            <ChartLegend />
            <AppText variant="caption" tone="muted">
              {phone ? 'Swipe the chart sideways for earlier days. Tap a point to open its failed inspections.' : 'Click a point to open its failed inspections.'}
            </AppText>
          </>
        )}
        <SignalList chart={chart.data} onOpenPoint={openPoint} />
      </>
    );

  return (
    <Card style={styles.card}>
      <AppText variant="heading">Control chart</AppText>
      {body}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  toggleRow: { flexDirection: 'row', alignItems: 'center', gap: space.md },
});
