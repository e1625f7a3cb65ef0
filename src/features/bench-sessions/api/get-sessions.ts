import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { BenchSessionListQuery, BenchSessionSummary } from '../../../../shared/schemas/bench-sessions';
import type { Page } from '../../../../shared/schemas/common';
import { apiRequest } from '../../../lib/api-client';

export const sessionsQueryKey = ['sessions'] as const;
export const sessionListQueryKey = (query: BenchSessionListQuery) => [...sessionsQueryKey, 'list', query] as const;

/** One page of bench sessions, sorted and filtered on the server. */
export function fetchSessions(query: BenchSessionListQuery, signal?: AbortSignal): Promise<Page<BenchSessionSummary>> {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined && value !== '') params.set(key, String(value));
  }
  return apiRequest<Page<BenchSessionSummary>>(`/api/sessions?${params}`, { signal });
}

export function sessionsQueryOptions(query: BenchSessionListQuery) {
  return queryOptions({
    queryKey: sessionListQueryKey(query),
    queryFn: ({ signal }) => fetchSessions(query, signal),
    // Keep the current page on screen while the next one loads.
    placeholderData: keepPreviousData,
  });
}

export function useSessions(query: BenchSessionListQuery) {
  return useQuery(sessionsQueryOptions(query));
}
