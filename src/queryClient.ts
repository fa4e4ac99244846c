import { QueryClient } from '@tanstack/vue-query';
import { ApiError } from './api/http';

/**
 * The cache for server data. Client errors (4xx) are answers, not hiccups, so they are
 * not retried; a lost connection or a 5xx is retried twice.
 */
export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 15_000,
        refetchOnWindowFocus: false,
        retry: (failureCount, error) => {
          if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
          return failureCount < 2;
        },
      },
      mutations: { retry: false },
    },
  });
}
