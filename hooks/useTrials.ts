// Trials of a rule version on a reference set: start, follow while they run, results and limit sweeps.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Trial } from '../shared/api/trials';
import { getLimitSweep, getTrial, listTrialResults, listTrialsOfVersion, startTrial, type TrialResultQuery } from '../lib/api';

export const trialKeys = {
  all: ['trials'] as const,
  ofVersion: (versionId: string) => [...trialKeys.all, 'of-version', versionId] as const,
  detail: (id: string) => [...trialKeys.all, 'detail', id] as const,
  results: (id: string, query: TrialResultQuery) => [...trialKeys.detail(id), 'results', query] as const,
  sweep: (id: string, gauge: string, bound: 'min' | 'max') => [...trialKeys.detail(id), 'sweep', gauge, bound] as const,
};

const POLL_MS = 1000;

export function isTrialRunning(trial: Trial | undefined): boolean {
  return trial?.state === 'queued' || trial?.state === 'running';
}

export function useTrialsOfVersion(versionId: string | null) {
  return useQuery({ queryKey: trialKeys.ofVersion(versionId ?? ''), queryFn: ({ signal }) => listTrialsOfVersion(versionId!, signal), enabled: versionId !== null });
}

/** Asks again every second while the trial is queued or running. */
export function useTrial(id: string | null) {
  return useQuery({
    queryKey: trialKeys.detail(id ?? ''),
    queryFn: ({ signal }) => getTrial(id!, signal),
    enabled: id !== null,
    refetchInterval: (query) => (isTrialRunning(query.state.data) ? POLL_MS : false),
  });
}

export function useTrialResults(id: string | null, query: TrialResultQuery, enabled = true) {
  return useQuery({ queryKey: trialKeys.results(id ?? '', query), queryFn: ({ signal }) => listTrialResults(id!, query, signal), enabled: id !== null && enabled });
}

export function useLimitSweep(id: string | null, gauge: string | null, bound: 'min' | 'max') {
  return useQuery({
    queryKey: trialKeys.sweep(id ?? '', gauge ?? '', bound),
    queryFn: ({ signal }) => getLimitSweep(id!, gauge!, bound, signal),
    enabled: id !== null && gauge !== null,
  });
}

export function useStartTrial() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { ruleVersionId: string; referenceSetId: string; stationId?: string }) => startTrial(body),
    onSuccess: (trial) => {
      queryClient.setQueryData(trialKeys.detail(trial.id), trial);
      return queryClient.invalidateQueries({ queryKey: trialKeys.ofVersion(trial.ruleVersionId) });
    },
  });
}
