// Trend charts for supervisors (p-chart, causes) and the choices their filters offer, through react-query.
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { PChartQuery, TrendFilters } from '../shared/api/trends';
import { fetchPareto, fetchPChart, fetchTrendChoices } from '../lib/api';

export const trendKeys = {
  all: ['trends'] as const,
  choices: () => [...trendKeys.all, 'choices'] as const,
  pChart: (query: PChartQuery) => [...trendKeys.all, 'p-chart', query] as const,
  pareto: (filters: TrendFilters) => [...trendKeys.all, 'pareto', filters] as const,
};

export function useTrendChoices() {
  return useQuery({ queryKey: trendKeys.choices(), queryFn: ({ signal }) => fetchTrendChoices(signal) });
}

/** Keeps the last chart on screen while a changed filter loads, so the page does not jump. */
export function usePChart(query: PChartQuery) {
  return useQuery({ queryKey: trendKeys.pChart(query), queryFn: ({ signal }) => fetchPChart(query, signal), placeholderData: keepPreviousData });
}

export function usePareto(filters: TrendFilters) {
  return useQuery({ queryKey: trendKeys.pareto(filters), queryFn: ({ signal }) => fetchPareto(filters, signal), placeholderData: keepPreviousData });
}
