// Disputed verdicts waiting for a qualified person, and their resolution, through react-query.
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { listDisputes, resolveDispute } from '../lib/api';

export type DisputeState = 'open' | 'resolved';

export const disputeKeys = {
  all: ['disputes'] as const,
  list: (state: DisputeState, offset: number) => [...disputeKeys.all, state, offset] as const,
};

export const DISPUTES_PER_PAGE = 20;

export function useDisputes(state: DisputeState, offset: number) {
  return useQuery({
    queryKey: disputeKeys.list(state, offset),
    queryFn: ({ signal }) => listDisputes({ state, limit: DISPUTES_PER_PAGE, offset }, signal),
    placeholderData: keepPreviousData,
  });
}

export function useResolveDispute() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, judgement, note }: { id: string; judgement: 'good' | 'defective'; note: string }) => resolveDispute(id, { judgement, note }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: disputeKeys.all }),
  });
}
