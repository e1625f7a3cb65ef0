import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SweepSummary } from '../../../../shared/schemas/sweeps';
import { apiRequest } from '../../../lib/api-client';
import { sessionQueryKey } from './get-session';

export const sweepsQueryKey = (sessionId: string) => [...sessionQueryKey(sessionId), 'sweeps'] as const;

/** A session's sweeps, oldest first, deleted ones included (with who deleted them and why). */
export function fetchSweeps(sessionId: string, signal?: AbortSignal): Promise<{ sweeps: SweepSummary[] }> {
  return apiRequest<{ sweeps: SweepSummary[] }>(`/api/sessions/${encodeURIComponent(sessionId)}/sweeps`, { signal });
}

export function sweepsQueryOptions(sessionId: string) {
  return queryOptions({ queryKey: sweepsQueryKey(sessionId), queryFn: ({ signal }) => fetchSweeps(sessionId, signal) });
}

export function useSweeps(sessionId: string) {
  return useQuery(sweepsQueryOptions(sessionId));
}
