// Alerts raised by run rules and defect-fraction limits, the supervisor's limits and e-mail subscription, through react-query.
import { useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateAlertLimit } from '../shared/api/alerts';
import {
  acknowledgeAlert,
  createAlertLimit,
  deleteAlertLimit,
  fetchAlertSubscription,
  listAlertLimits,
  listAlerts,
  setAlertSubscription,
} from '../lib/api';

export type AlertState = 'open' | 'acknowledged';

export const alertKeys = {
  all: ['alerts'] as const,
  lists: () => [...alertKeys.all, 'list'] as const,
  list: (state: AlertState) => [...alertKeys.lists(), state] as const,
  limits: () => [...alertKeys.all, 'limits'] as const,
  subscription: () => [...alertKeys.all, 'subscription'] as const,
};

const PAGE = 50;
/** Open alerts are checked again every minute: the checking job raises them in the background. */
const OPEN_REFRESH_MS = 60_000;

/** Pages of alerts, newest first, continued with the server's cursor. */
export function useAlertPages(state: AlertState) {
  return useInfiniteQuery({
    queryKey: alertKeys.list(state),
    queryFn: ({ pageParam, signal }) => listAlerts({ state, after: pageParam, limit: PAGE }, signal),
    initialPageParam: undefined as string | undefined,
    getNextPageParam: (last) => last.next ?? undefined,
    refetchInterval: state === 'open' ? OPEN_REFRESH_MS : false,
  });
}

export function useAcknowledgeAlert() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, note }: { id: string; note: string }) => acknowledgeAlert(id, note),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: alertKeys.lists() }),
  });
}

export function useAlertLimits() {
  return useQuery({ queryKey: alertKeys.limits(), queryFn: ({ signal }) => listAlertLimits(signal) });
}

export function useCreateAlertLimit() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateAlertLimit) => createAlertLimit(body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: alertKeys.limits() }),
  });
}

export function useDeleteAlertLimit() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => deleteAlertLimit(id),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: alertKeys.limits() }),
  });
}

export function useAlertSubscription() {
  return useQuery({ queryKey: alertKeys.subscription(), queryFn: ({ signal }) => fetchAlertSubscription(signal) });
}

export function useSetAlertSubscription() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (subscribed: boolean) => setAlertSubscription(subscribed),
    onSuccess: (subscription) => queryClient.setQueryData(alertKeys.subscription(), subscription),
  });
}
