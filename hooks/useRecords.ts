// Inspection records and the audit trail (auditors, supervisors), through react-query.
import { useInfiniteQuery, useQuery } from '@tanstack/react-query';
import { fetchInspection, listRecords, verifyAuditTrail, type RecordQuery } from '../lib/api';

export type RecordFilterValues = Omit<RecordQuery, 'after' | 'limit'>;

export const recordKeys = {
  all: ['records'] as const,
  list: (filters: RecordFilterValues) => [...recordKeys.all, 'list', filters] as const,
  detail: (id: string) => [...recordKeys.all, 'detail', id] as const,
  chain: () => ['audit', 'chain'] as const,
};

const PAGE = 50;

/** Pages of inspections, continued with the server's keyset cursor. */
export function useRecordPages(filters: RecordFilterValues) {
  return useInfiniteQuery({
    queryKey: recordKeys.list(filters),
    queryFn: ({ pageParam, signal }) => listRecords({ ...filters, after: pageParam, limit: PAGE }, signal),
    initialPageParam: undefined as string | undefined,
    getNextPageParam: (last) => last.next ?? undefined,
  });
}

export function useInspectionRecord(id: string) {
  return useQuery({ queryKey: recordKeys.detail(id), queryFn: ({ signal }) => fetchInspection(id, signal) });
}

/** Recomputed on request only: it reads the whole trail. */
export function useChainVerification() {
  return useQuery({ queryKey: recordKeys.chain(), queryFn: ({ signal }) => verifyAuditTrail(signal), enabled: false });
}
