import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AnalysisPointsPage, AnalysisPointsQuery } from '../../../../shared/schemas/analysis';
import { apiRequest } from '../../../lib/api-client';

/** One page of a session's analysed points, sorted and filtered on the server. */
export function fetchAnalysisPoints(sessionId: string, query: AnalysisPointsQuery, signal?: AbortSignal): Promise<AnalysisPointsPage> {
  const params = new URLSearchParams({ page: String(query.page), pageSize: String(query.pageSize), sort: query.sort, direction: query.direction, outcome: query.outcome });
  return apiRequest<AnalysisPointsPage>(`/api/sessions/${encodeURIComponent(sessionId)}/analysis/points?${params}`, { signal });
}

/**
 * Keyed by the analysis the page shows (its computedAt): a live refit brings a new analysis and
 * with it a fresh page of rows; older analyses' pages are never mixed in.
 */
export function analysisPointsQueryOptions(sessionId: string, computedAt: string, query: AnalysisPointsQuery, enabled: boolean) {
  return queryOptions({
    queryKey: ['session-analysis', sessionId, 'points', computedAt, query] as const,
    queryFn: ({ signal }) => fetchAnalysisPoints(sessionId, query, signal),
    placeholderData: keepPreviousData,
    enabled,
  });
}

export function useAnalysisPoints(sessionId: string, computedAt: string, query: AnalysisPointsQuery, enabled: boolean) {
  return useQuery(analysisPointsQueryOptions(sessionId, computedAt, query, enabled));
}
