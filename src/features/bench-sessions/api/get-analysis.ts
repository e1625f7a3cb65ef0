import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import { apiRequest } from '../../../lib/api-client';
import { sessionChartPointBudget, sessionChartWidthPx } from '../../../lib/charts/session-chart-width';
import { sessionQueryKey } from './get-session';

export const analysisQueryKey = (sessionId: string) => [...sessionQueryKey(sessionId), 'analysis'] as const;

/**
 * The engine's analysis of the session: CMRR points, fit, prediction and limit verdicts, thinned
 * on the server to `maxPoints` (per log-frequency column: first, last, lowest, highest and every failure).
 */
export function fetchAnalysis(sessionId: string, maxPoints: number, signal?: AbortSignal): Promise<{ analysis: SessionAnalysis }> {
  return apiRequest<{ analysis: SessionAnalysis }>(`/api/sessions/${encodeURIComponent(sessionId)}/analysis?maxPoints=${maxPoints}`, { signal });
}

export function analysisQueryOptions(sessionId: string, maxPoints: number) {
  return queryOptions({
    // One entry per session whatever the budget: live refits replace it in place.
    queryKey: analysisQueryKey(sessionId),
    queryFn: ({ signal }) => fetchAnalysis(sessionId, maxPoints, signal),
    // Each refit replaces the analysis whole; comparing thousands of points first is wasted work.
    structuralSharing: false,
  });
}

/** The analysis thinned to what this screen's charts can show (the server allows 100 points at least). */
export function useAnalysis(sessionId: string) {
  const maxPoints = Math.max(100, sessionChartPointBudget(sessionChartWidthPx(window.innerWidth)));
  return useQuery(analysisQueryOptions(sessionId, maxPoints));
}
