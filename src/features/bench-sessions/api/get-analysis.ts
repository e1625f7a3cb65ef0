import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import { apiRequest } from '../../../lib/api-client';
import { sessionQueryKey } from './get-session';

export const analysisQueryKey = (sessionId: string) => [...sessionQueryKey(sessionId), 'analysis'] as const;

/** More points than any chart can show; the server thins larger sessions to this (the same as live refits). */
export const analysisMaximumPoints = 4000;

/** The engine's analysis of the session: CMRR points, fit, prediction and limit verdicts, thinned for drawing. */
export function fetchAnalysis(sessionId: string, signal?: AbortSignal): Promise<{ analysis: SessionAnalysis }> {
  return apiRequest<{ analysis: SessionAnalysis }>(`/api/sessions/${encodeURIComponent(sessionId)}/analysis?maxPoints=${analysisMaximumPoints}`, { signal });
}

export function analysisQueryOptions(sessionId: string) {
  return queryOptions({
    queryKey: analysisQueryKey(sessionId),
    queryFn: ({ signal }) => fetchAnalysis(sessionId, signal),
    // Each refit replaces the analysis whole; comparing thousands of points first is wasted work.
    structuralSharing: false,
  });
}

export function useAnalysis(sessionId: string) {
  return useQuery(analysisQueryOptions(sessionId));
}
