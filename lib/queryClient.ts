import { QueryClient } from '@tanstack/react-query';
import { isWorthRetrying } from './errorMessages';

export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        // A refused request (400, 403, 404...) will be refused again: only network and server trouble is retried.
        retry: (failureCount, error) => failureCount < 2 && isWorthRetrying(error),
        staleTime: 30_000,
        refetchOnWindowFocus: false,
      },
      mutations: { retry: false },
    },
  });
}
