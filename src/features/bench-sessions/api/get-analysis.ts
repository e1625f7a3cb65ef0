import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import { apiRequest } from '../../../lib/api-client';
import { sessionQueryKey } from './get-session';

export const analysisQueryKey = (sessionId: string) => [...sessionQueryKey(sessionId), 'analysis'] as const;

/** The engine's analysis of the session: CMRR points, fit, prediction and limit verdicts. */
export function fetchAnalysis(sessionId: string, signal?: AbortSignal): Promise<{ analysis: SessionAnalysis }> {
  return apiRequest<{ analysis: SessionAnalysis }>(`/api/sessions/${encodeURIComponent(sessionId)}/analysis`, { signal });
}

export function analysisQueryOptions(sessionId: string) {
  return queryOptions({ queryKey: analysisQueryKey(sessionId), queryFn: ({ signal }) => fetchAnalysis(sessionId, signal) });
}

export function useAnalysis(sessionId: string) {
  return useQuery(analysisQueryOptions(sessionId));
}
