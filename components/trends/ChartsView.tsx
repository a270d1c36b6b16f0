import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import type { TrendChoices } from '../../shared/api/trends';
import { ErrorBanner } from '../ErrorBanner';
import { ControlChartCard } from './ControlChartCard';
import { ParetoCard } from './ParetoCard';
import { TrendFilterCard } from './TrendFilterCard';
import { apiTrendFilters, type TrendFilterValues } from './trendFilters';

export type ChartsShown = 'both' | 'control-chart' | 'causes';

interface ChartsViewProps {
  values: TrendFilterValues;
  onChange: (values: TrendFilterValues) => void;
  choices: TrendChoices;
  phone: boolean;
  shown: ChartsShown;
}

/** The filters and the charts they drive: side by side on a wide screen, one at a time on a phone. */
export function ChartsView({ values, onChange, choices, phone, shown }: ChartsViewProps) {
  const filters = apiTrendFilters(values, Date.now());
  return (
    <View style={styles.view}>
      <TrendFilterCard value={values} onChange={onChange} choices={choices} foldable={phone} />
      {filters === null ? (
        <ErrorBanner error={null} message="The range cannot be charted yet" nextStep="Type the first and last day as YYYY-MM-DD, the last on or after the first." />
      ) : (
        <View style={[styles.charts, shown === 'both' && styles.sideBySide]}>
          {shown !== 'causes' ? (
            <View style={shown === 'both' ? styles.column : undefined}>
              <ControlChartCard filters={filters} bucket={values.bucket} runRules={values.runRules} phone={phone} />
            </View>
          ) : null}
          {shown !== 'control-chart' ? (
            <View style={shown === 'both' ? styles.column : undefined}>
              <ParetoCard filters={filters} phone={phone} />
            </View>
          ) : null}
        </View>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  view: { gap: space.lg },
  charts: { gap: space.lg },
  sideBySide: { flexDirection: 'row', alignItems: 'flex-start' },
  column: { flexGrow: 1, flexShrink: 1, flexBasis: 0, minWidth: 0 },
});
