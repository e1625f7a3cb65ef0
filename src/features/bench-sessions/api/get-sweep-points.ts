import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Page } from '../../../../shared/schemas/common';
import type { SweepPoint } from '../../../../shared/schemas/sweeps';
import { apiRequest } from '../../../lib/api-client';
import { sweepsQueryKey } from './get-sweeps';

export type SweepPointsQuery = {
  page: number;
  pageSize: number;
  sort: 'sequence' | 'frequencyHz' | 'vinV' | 'voutV' | 'gain';
  direction: 'asc' | 'desc';
};

export const sweepPointsQueryKey = (sessionId: string, sweepId: string) => [...sweepsQueryKey(sessionId), sweepId, 'points'] as const;

/** One page of a sweep's points, sorted on the server. */
export function fetchSweepPoints(sessionId: string, sweepId: string, query: SweepPointsQuery, signal?: AbortSignal): Promise<Page<SweepPoint>> {
  const params = new URLSearchParams({ page: String(query.page), pageSize: String(query.pageSize), sort: query.sort, direction: query.direction });
  return apiRequest<Page<SweepPoint>>(`/api/sessions/${encodeURIComponent(sessionId)}/sweeps/${encodeURIComponent(sweepId)}/points?${params}`, { signal });
}

export function sweepPointsQueryOptions(sessionId: string, sweepId: string, query: SweepPointsQuery) {
  return queryOptions({
    queryKey: [...sweepPointsQueryKey(sessionId, sweepId), query],
    queryFn: ({ signal }) => fetchSweepPoints(sessionId, sweepId, query, signal),
    placeholderData: keepPreviousData,
  });
}

export function useSweepPoints(sessionId: string, sweepId: string, query: SweepPointsQuery) {
  return useQuery(sweepPointsQueryOptions(sessionId, sweepId, query));
}
