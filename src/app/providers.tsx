import { MutationCache, QueryCache, QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { sessionQueryKey } from '../features/auth/api/get-session';
import { isApiStatus } from '../lib/api-client';

/** Failures that asking again will not change (bad request, signed out, not allowed, gone…). */
function isPermanent(error: unknown): boolean {
  return isApiStatus(error, 400, 401, 403, 404, 409, 410, 422, 429);
}

export function createQueryClient(): QueryClient {
  const queryClient: QueryClient = new QueryClient({
    queryCache: new QueryCache({ onError: (error) => endSessionOn401(error) }),
    mutationCache: new MutationCache({ onError: (error) => endSessionOn401(error) }),
    defaultOptions: {
      queries: {
        retry: (failureCount, error) => !isPermanent(error) && failureCount < 2,
        staleTime: 15_000,
      },
      mutations: { retry: false },
    },
  });

  // A 401 anywhere means the session ended (expired, signed out elsewhere, deactivated by a lead):
  // forget it so the app goes back to the sign-in page.
  function endSessionOn401(error: unknown) {
    if (isApiStatus(error, 401) && queryClient.getQueryData(sessionQueryKey)) {
      queryClient.setQueryData(sessionQueryKey, null);
    }
  }
  return queryClient;
}

export function Providers({ children }: { children: ReactNode }) {
  const [queryClient] = useState(createQueryClient);
  return <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
}
