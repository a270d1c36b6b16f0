import { StyleSheet, View } from 'react-native';
import { usePartTypeName } from '../../hooks/useReferenceSets';
import { space } from '../../lib/theme';
import type { RunRuleSet, TrendBucket, TrendChoices } from '../../shared/api/trends';
import { ChoiceChips } from '../ChoiceChips';
import { FilterPanel } from '../FilterPanel';
import { TextField } from '../TextField';
import { StationChoice } from './StationChoice';
import { describeTrendFilters, type TrendFilterValues } from './trendFilters';
import { rangeProblem, type RangePreset } from './trendRange';

interface TrendFilterCardProps {
  value: TrendFilterValues;
  onChange: (value: TrendFilterValues) => void;
  choices: TrendChoices;
  /** On a phone the filters fold into one line until asked for. */
  foldable: boolean;
}

/** Range, subgroup, run rules, and which rule, line, station and part type the charts cover. */
export function TrendFilterCard({ value, onChange, choices, foldable }: TrendFilterCardProps) {
  const set = <K extends keyof TrendFilterValues>(key: K, v: TrendFilterValues[K]) => onChange({ ...value, [key]: v });
  const line = choices.lines.find((l) => l.id === value.lineId);
  const problem = rangeProblem(value.range);
  const partTypeName = usePartTypeName();

  return (
    <FilterPanel summary={describeTrendFilters(value, choices, partTypeName)} foldable={foldable}>
      <View style={styles.groups}>
        <View style={styles.group}>
          <ChoiceChips<RangePreset>
            label="Range"
            value={value.range.preset}
            onChange={(preset) => set('range', { ...value.range, preset })}
            choices={[
              { value: '7d', label: '7 days' },
              { value: '30d', label: '30 days' },
              { value: '90d', label: '90 days' },
              { value: 'custom', label: 'Other dates' },
            ]}
          />
        </View>
        <ChoiceChips<TrendBucket> label="One point per" value={value.bucket} onChange={(b) => set('bucket', b)} choices={[{ value: 'day', label: 'Day' }, { value: 'shift', label: 'Shift' }]} />
        <View style={styles.group}>
          <ChoiceChips<RunRuleSet>
            label="Run rules"
            value={value.runRules}
            onChange={(r) => set('runRules', r)}
            choices={[
              { value: 'western-electric', label: 'Western Electric 1–4' },
              { value: 'nelson', label: 'Nelson 1–8' },
            ]}
          />
        </View>
        <View style={styles.group}>
          <ChoiceChips<string | null> label="Rule" value={value.ruleId} onChange={(id) => set('ruleId', id)} choices={[{ value: null, label: 'All rules' }, ...choices.rules.map((r) => ({ value: r.id, label: r.name }))]} />
        </View>
        <View style={styles.group}>
          <ChoiceChips<string | null>
            label="Line"
            value={value.lineId}
            onChange={(id) => onChange({ ...value, lineId: id, stationId: null })}
            choices={[{ value: null, label: 'All lines' }, ...choices.lines.map((l) => ({ value: l.id, label: l.name }))]}
          />
        </View>
        <View style={styles.group}>
          <StationChoice lines={line ? [line] : choices.lines} value={value.stationId} onChange={(id) => set('stationId', id)} anyLabel={line ? 'Every station of the line' : 'All stations'} />
        </View>
        {choices.partTypes.length > 0 ? (
          <View style={styles.group}>
            <ChoiceChips<string | null> label="Part type" value={value.partType} onChange={(t) => set('partType', t)} choices={[{ value: null, label: 'Every part type' }, ...choices.partTypes.map((t) => ({ value: t, label: partTypeName(t) }))]} />
          </View>
        ) : null}
      </View>
      {value.range.preset === 'custom' ? (
        <View style={[styles.dates, foldable && styles.datesStacked]}>
          <TextField label="First day (YYYY-MM-DD, UTC)" value={value.range.customFrom} onChangeText={(t) => set('range', { ...value.range, customFrom: t.trim() })} placeholder="2026-11-01" autoCapitalize="none" />
          <TextField label="Last day (inclusive)" value={value.range.customTo} onChangeText={(t) => set('range', { ...value.range, customTo: t.trim() })} placeholder="2026-11-30" autoCapitalize="none" error={value.range.customFrom && value.range.customTo ? problem ?? undefined : undefined} />
        </View>
      ) : null}
    </FilterPanel>
  );
}

const styles = StyleSheet.create({
  dates: { flexDirection: 'row', gap: space.md },
  datesStacked: { flexDirection: 'column' },
  groups: { flexDirection: 'row', flexWrap: 'wrap', columnGap: space.xl, rowGap: space.md },
  group: { maxWidth: '100%', flexShrink: 1 },
});
