// Rule versions waiting for review, the version under review with what it replaces, its trial,
// and the supervisor's decisions (release, send back, withdraw), through react-query.
import { useMutation, useQueries, useQuery, useQueryClient } from '@tanstack/react-query';
import { getRule, getRuleVersion, getTrial, listRules, releaseRuleVersion, sendBackRuleVersion, withdrawRuleVersion } from '../lib/api';
import type { RuleVersion } from '../shared/api/rules';

export const reviewKeys = {
  all: ['review'] as const,
  queue: () => [...reviewKeys.all, 'queue'] as const,
  released: () => [...reviewKeys.all, 'released'] as const,
  rule: (ruleId: string) => [...reviewKeys.all, 'rule', ruleId] as const,
  version: (versionId: string) => [...reviewKeys.all, 'version', versionId] as const,
  trial: (trialId: string) => [...reviewKeys.all, 'trial', trialId] as const,
};

/** Rules with a version in review, then each rule's versions, flattened to the versions in review. */
export function useReviewQueue() {
  const rules = useQuery({
    queryKey: reviewKeys.queue(),
    queryFn: ({ signal }) => listRules({ state: 'in-review', limit: 200, offset: 0 }, signal),
  });
  const details = useQueries({
    queries: (rules.data?.items ?? []).map((rule) => ({
      queryKey: reviewKeys.rule(rule.id),
      queryFn: ({ signal }: { signal: AbortSignal }) => getRule(rule.id, signal),
    })),
  });
  const versions: RuleVersion[] = details
    .flatMap((detail) => detail.data?.versions ?? [])
    .filter((version) => version.state === 'in-review')
    .sort((a, b) => (a.submittedAt ?? '').localeCompare(b.submittedAt ?? ''));
  const detailError = details.find((detail) => detail.error)?.error ?? null;
  return {
    versions,
    isPending: rules.isPending || details.some((detail) => detail.isPending),
    error: rules.error ?? detailError,
    refetch: () => {
      void rules.refetch();
      details.forEach((detail) => void detail.refetch());
    },
  };
}

/** Rules with a released version, for a supervisor who must withdraw one. */
export function useReleasedRules() {
  return useQuery({
    queryKey: reviewKeys.released(),
    queryFn: async ({ signal }) => (await listRules({ state: 'released', limit: 200, offset: 0 }, signal)).items,
  });
}

export function useRuleVersion(versionId: string) {
  return useQuery({ queryKey: reviewKeys.version(versionId), queryFn: ({ signal }) => getRuleVersion(versionId, signal) });
}

export function useRuleDetail(ruleId: string | undefined) {
  return useQuery({
    queryKey: reviewKeys.rule(ruleId ?? ''),
    queryFn: ({ signal }) => getRule(ruleId!, signal),
    enabled: Boolean(ruleId),
  });
}

export function useTrial(trialId: string | null | undefined) {
  return useQuery({
    queryKey: reviewKeys.trial(trialId ?? ''),
    queryFn: ({ signal }) => getTrial(trialId!, signal),
    enabled: Boolean(trialId),
  });
}

function useDecision<A>(decide: (args: A) => Promise<RuleVersion>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: decide,
    onSuccess: (version) => {
      queryClient.setQueryData(reviewKeys.version(version.id), version);
      // The engineer's screens list the same rules under their own keys, starting with 'rules'.
      void queryClient.invalidateQueries({ queryKey: ['rules'] });
      return queryClient.invalidateQueries({ queryKey: reviewKeys.all });
    },
  });
}

export type SignatureMeaningChoice = 'review' | 'approval' | 'responsibility';

export function useReleaseVersion() {
  return useDecision(({ id, password, meaning, note }: { id: string; password: string; meaning: SignatureMeaningChoice; note: string }) =>
    releaseRuleVersion(id, { password, meaning, note }),
  );
}

export function useSendBackVersion() {
  return useDecision(({ id, note }: { id: string; note: string }) => sendBackRuleVersion(id, note));
}

export function useWithdrawVersion() {
  return useDecision(({ id, reason }: { id: string; reason: string }) => withdrawRuleVersion(id, reason));
}
