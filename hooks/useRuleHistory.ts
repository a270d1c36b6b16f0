// A rule's change history (every version, its state changes, signatures, trials and diffs), through react-query.
import { useQuery } from '@tanstack/react-query';
import { getRuleHistory } from '../lib/api';
import { ruleKeys } from './useRules';

// Under the rules' keys, so that every rule change (which invalidates ruleKeys.all) refreshes the history too.
export const ruleHistoryKeys = {
  detail: (ruleId: string) => [...ruleKeys.all, 'history', ruleId] as const,
};

export function useRuleHistory(ruleId: string) {
  return useQuery({ queryKey: ruleHistoryKeys.detail(ruleId), queryFn: ({ signal }) => getRuleHistory(ruleId, signal) });
}
