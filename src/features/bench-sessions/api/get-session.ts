import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BenchSessionDetail } from '../../../../shared/schemas/bench-sessions';
import { apiRequest } from '../../../lib/api-client';
import { sessionsQueryKey } from './get-sessions';

/** Everything about one session lives under this key: its sweeps, points and analysis too. */
export const sessionQueryKey = (sessionId: string) => [...sessionsQueryKey, sessionId] as const;

export function fetchSession(sessionId: string, signal?: AbortSignal): Promise<{ session: BenchSessionDetail }> {
  return apiRequest<{ session: BenchSessionDetail }>(`/api/sessions/${encodeURIComponent(sessionId)}`, { signal });
}

export function sessionQueryOptions(sessionId: string) {
  return queryOptions({ queryKey: [...sessionQueryKey(sessionId), 'detail'], queryFn: ({ signal }) => fetchSession(sessionId, signal) });
}

export function useSession(sessionId: string) {
  return useQuery(sessionQueryOptions(sessionId));
}
