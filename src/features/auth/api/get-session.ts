import { queryOptions, useQuery, type QueryClient } from '@tanstack/react-query';
import type { SessionResponse } from '../../../../shared/schemas/auth';
import type { User } from '../../../../shared/schemas/users';
import { apiRequest, isApiStatus } from '../../../lib/api-client';

export const sessionQueryKey = ['auth', 'session'] as const;

/** The signed-in person, or null when signed out (the API answers 401). */
export async function fetchSession(signal?: AbortSignal): Promise<User | null> {
  try {
    const response = await apiRequest<SessionResponse>('/api/auth/me', { signal });
    return response.user;
  } catch (error) {
    if (isApiStatus(error, 401)) return null;
    throw error;
  }
}

export function sessionQueryOptions() {
  return queryOptions({
    queryKey: sessionQueryKey,
    queryFn: ({ signal }) => fetchSession(signal),
    staleTime: 5 * 60_000,
  });
}

export function useSession() {
  return useQuery(sessionQueryOptions());
}

/**
 * Drop everything cached for whoever was signed in before (people lists, mail, …), keeping only
 * this feature's own entries, then record the new session.
 */
export function replaceSession(queryClient: QueryClient, user: User | null): void {
  queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== 'auth' });
  queryClient.setQueryData(sessionQueryKey, user);
}
