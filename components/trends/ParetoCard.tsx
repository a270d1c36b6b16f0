import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { usePareto } from '../../hooks/useTrends';
import { colors, space } from '../../lib/theme';
import type { TrendFilters } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { Card } from '../Card';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { formatPercent } from '../../lib/format';
import { LinkRow } from './LinkRow';
import { ParetoPlot } from './ParetoPlot';
import { recordsHref } from './recordsLink';

interface ParetoCardProps {
  filters: TrendFilters;
  phone: boolean;
}

/** Why parts fail: failing gauges and causes ranked by count with their cumulative share, and the stations failing most. */
export function ParetoCard({ filters, phone }: ParetoCardProps) {
  const router = useRouter();
  const pareto = usePareto(filters);
  const openCause = (cause: string) => router.push(recordsHref({ ...filters, cause, verdict: 'FAIL' }));
  const openStation = (stationId: string) => router.push(recordsHref({ ...filters, lineId: undefined, stationId, verdict: 'FAIL' }));

  let body;
  if (pareto.isPending) body = <LoadingState label="Counting the causes…" />;
  else if (pareto.isError) body = <ErrorState error={pareto.error} onRetry={() => pareto.refetch()} />;
  else if (pareto.data.totalFailures === 0)
    body = <EmptyState title="No failures in this range" body="No part failed for these filters. Widen the range or clear a filter to see the causes of earlier failures." />;
  else {
    const { bars, topStations, totalFailures } = pareto.data;
    body = (
      <>
        <View style={styles.status}>
          <AppText tone="muted" style={styles.grow}>{`${totalFailures} failed parts; the line shows the running share of all failures.`}</AppText>
          {pareto.isFetching ? <ActivityIndicator color={colors.steel} accessibilityLabel="Updating the causes" /> : null}
        </View>
        <ParetoPlot pareto={pareto.data} phone={phone} onOpenCause={openCause} />
        <AppText variant="caption" tone="muted">
          {phone ? 'Tap a bar or a cause below to open its failed inspections.' : 'Click a bar or a cause below to open its failed inspections.'}
        </AppText>
        <View role="list" aria-label="Causes of failure, largest first" style={styles.list}>
          {bars.map((bar, i) => (
            <LinkRow
              key={bar.cause}
              title={`${i + 1}. ${bar.cause}`}
              detail={`${bar.count} failed · ${formatPercent(bar.count / totalFailures)} of failures · ${formatPercent(bar.cumulative)} cumulative`}
              share={bar.count / totalFailures}
              accessibilityLabel={`${bar.cause}: ${bar.count} failed parts, ${formatPercent(bar.cumulative)} cumulative. Open these inspections.`}
              onPress={() => openCause(bar.cause)}
            />
          ))}
        </View>
        <AppText variant="heading" headingLevel={3}>
          Stations failing most
        </AppText>
        {topStations.length === 0 ? (
          <AppText tone="muted">No station judged parts in this range.</AppText>
        ) : (
          <View role="list" aria-label="Stations with the highest share failed" style={styles.list}>
            {topStations.map((station) => (
              <LinkRow
                key={station.stationId}
                title={`${station.stationName} · ${station.lineName}`}
                detail={`${formatPercent(station.p)} failed · ${station.defectives} of ${station.n} judged`}
                share={station.p}
                accessibilityLabel={`${station.stationName} on ${station.lineName}: ${formatPercent(station.p)} failed, ${station.defectives} of ${station.n}. Open its failed inspections.`}
                onPress={() => openStation(station.stationId)}
              />
            ))}
          </View>
        )}
      </>
    );
  }

  return (
    <Card style={styles.card}>
      <AppText variant="heading">Causes</AppText>
      {body}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  status: { flexDirection: 'row', alignItems: 'center', gap: space.md },
  grow: { flex: 1 },
  list: { gap: space.xs },
});
