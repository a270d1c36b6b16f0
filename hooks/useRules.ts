// Rules, their versions and drafts, through react-query.
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { RuleVersionState } from '../shared/api/rules';
import { createRule, getRule, getRuleVersion, listRules, saveDraftDocument, startNewDraft, submitForReview } from '../lib/api';

export interface RuleFilters {
  search: string;
  state: RuleVersionState | null;
  partType: string | null;
  /** Only rules the signed-in person created or authored a version of. */
  mine: boolean;
  limit: number;
  offset: number;
}

export const ruleKeys = {
  all: ['rules'] as const,
  lists: () => [...ruleKeys.all, 'list'] as const,
  list: (filters: RuleFilters) => [...ruleKeys.lists(), filters] as const,
  detail: (id: string) => [...ruleKeys.all, 'detail', id] as const,
  version: (id: string) => [...ruleKeys.all, 'version', id] as const,
};

export function useRuleList(filters: RuleFilters) {
  return useQuery({
    queryKey: ruleKeys.list(filters),
    queryFn: ({ signal }) =>
      listRules(
        {
          q: filters.search.trim() || undefined,
          state: filters.state ?? undefined,
          partType: filters.partType ?? undefined,
          owner: filters.mine ? 'me' : undefined,
          limit: filters.limit,
          offset: filters.offset,
        },
        signal,
      ),
    placeholderData: keepPreviousData,
  });
}

export function useRule(id: string) {
  return useQuery({ queryKey: ruleKeys.detail(id), queryFn: ({ signal }) => getRule(id, signal) });
}

export function useRuleVersion(id: string | null) {
  return useQuery({ queryKey: ruleKeys.version(id ?? ''), queryFn: ({ signal }) => getRuleVersion(id!, signal), enabled: id !== null });
}

function useRuleMutation<A, R>(mutationFn: (args: A) => Promise<R>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn, onSuccess: () => queryClient.invalidateQueries({ queryKey: ruleKeys.all }) });
}

export function useCreateRule() {
  return useRuleMutation((body: { name: string; partType: string; smallestDefectMm: number | null; document: unknown }) => createRule(body));
}

export function useStartNewDraft() {
  return useRuleMutation(({ ruleId, fromVersionId }: { ruleId: string; fromVersionId?: string }) => startNewDraft(ruleId, fromVersionId));
}

export function useSaveDraft() {
  return useRuleMutation(({ versionId, document }: { versionId: string; document: unknown }) => saveDraftDocument(versionId, document));
}

export function useSubmitForReview() {
  return useRuleMutation(({ versionId, note }: { versionId: string; note: string }) => submitForReview(versionId, note));
}
