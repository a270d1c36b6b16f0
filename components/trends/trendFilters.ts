// What the supervisor chose in the trend filters, and the API's filters it stands for.
import type { RunRuleSet, TrendBucket, TrendChoices, TrendFilters } from '../../shared/api/trends';
import { PRESET_DAYS, rangeFor, type RangeChoice } from './trendRange';

export interface TrendFilterValues {
  range: RangeChoice;
  bucket: TrendBucket;
  runRules: RunRuleSet;
  ruleId: string | null;
  lineId: string | null;
  stationId: string | null;
  partType: string | null;
}

export const DEFAULT_TREND_FILTERS: TrendFilterValues = {
  range: { preset: '30d', customFrom: '', customTo: '' },
  bucket: 'day',
  runRules: 'western-electric',
  ruleId: null,
  lineId: null,
  stationId: null,
  partType: null,
};

/** The API's filters, or null while a typed range is unusable. */
export function apiTrendFilters(values: TrendFilterValues, nowMs: number): TrendFilters | null {
  const range = rangeFor(values.range, nowMs);
  if (!range) return null;
  return {
    ...range,
    ruleId: values.ruleId ?? undefined,
    lineId: values.lineId ?? undefined,
    stationId: values.stationId ?? undefined,
    partType: values.partType ?? undefined,
  };
}

/** "Last 30 days · per day · Western Electric · all rules, all stations" for the folded filter bar. */
export function describeTrendFilters(values: TrendFilterValues, choices: TrendChoices | undefined, partTypeName: (code: string) => string): string {
  const range = values.range.preset === 'custom' ? `${values.range.customFrom || '…'} to ${values.range.customTo || '…'}` : `Last ${PRESET_DAYS[values.range.preset]} days`;
  const rule = choices?.rules.find((r) => r.id === values.ruleId)?.name ?? 'all rules';
  const line = choices?.lines.find((l) => l.id === values.lineId);
  const station = choices?.lines.flatMap((l) => l.stations).find((s) => s.id === values.stationId)?.name;
  const where = station ?? line?.name ?? 'all stations';
  return [range, values.bucket === 'day' ? 'per day' : 'per shift', values.runRules === 'nelson' ? 'Nelson rules' : 'Western Electric rules', rule, where, values.partType ? partTypeName(values.partType) : 'every part type'].join(' · ');
}
