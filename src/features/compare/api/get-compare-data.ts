import { keepPreviousData, queryOptions, useQueries, useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import type { BenchSessionDetail, BenchSessionSummary } from '../../../../shared/schemas/bench-sessions';
import type { Page } from '../../../../shared/schemas/common';
import { apiRequest } from '../../../lib/api-client';

const compareKey = ['compare'] as const;

/** Sessions matching a search (unit, design, operator), newest first: the picker's list. */
export function sessionSearchQueryOptions(search: string) {
  return queryOptions({
    queryKey: [...compareKey, 'search', search],
    queryFn: ({ signal }) => {
      const params = new URLSearchParams({ pageSize: '12', sort: 'measuredAt', direction: 'desc' });
      if (search.trim()) params.set('search', search.trim());
      return apiRequest<Page<BenchSessionSummary>>(`/api/sessions?${params}`, { signal });
    },
    placeholderData: keepPreviousData,
  });
}

export function useSessionSearch(search: string) {
  return useQuery(sessionSearchQueryOptions(search));
}

export interface ComparedSessionData {
  sessionId: string;
  detail: BenchSessionDetail | undefined;
  analysis: SessionAnalysis | undefined;
  error: unknown;
  pending: boolean;
}

type Settled<T> = { data: T | undefined; error: unknown; isPending: boolean };
// Module-level, so TanStack Query keeps the combined array stable while no query changes.
const combineSettled = <T,>(results: Settled<T>[]) => results.map((result) => ({ data: result.data, error: result.error, pending: result.isPending }));

/** Each chosen session's detail (for its legend) and analysis (for its curve); the same array until one of them changes. */
export function useComparedSessions(sessionIds: readonly string[]): ComparedSessionData[] {
  const details = useQueries({
    queries: sessionIds.map((sessionId) => ({
      queryKey: [...compareKey, 'session', sessionId],
      queryFn: ({ signal }: { signal: AbortSignal }) => apiRequest<{ session: BenchSessionDetail }>(`/api/sessions/${encodeURIComponent(sessionId)}`, { signal }),
      staleTime: 60_000,
    })),
    combine: combineSettled<{ session: BenchSessionDetail }>,
  });
  const analyses = useQueries({
    queries: sessionIds.map((sessionId) => ({
      queryKey: [...compareKey, 'analysis', sessionId],
      queryFn: ({ signal }: { signal: AbortSignal }) => apiRequest<{ analysis: SessionAnalysis }>(`/api/sessions/${encodeURIComponent(sessionId)}/analysis?maxPoints=4000`, { signal }),
      staleTime: 60_000,
    })),
    combine: combineSettled<{ analysis: SessionAnalysis }>,
  });
  return useMemo(
    () =>
      sessionIds.map((sessionId, index) => ({
        sessionId,
        detail: details[index]?.data?.session,
        analysis: analyses[index]?.data?.analysis,
        error: details[index]?.error ?? analyses[index]?.error ?? null,
        pending: Boolean(details[index]?.pending || analyses[index]?.pending),
      })),
    [sessionIds, details, analyses],
  );
}
