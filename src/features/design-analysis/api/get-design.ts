import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DesignDetail } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';

// The same key as the designs feature's own read of a design, so both share one cached copy and
// saving a revision (which invalidates `designs`) refreshes this view too.
export const designAnalysisQueryKey = (designId: string) => ['designs', designId] as const;

/** One design with all its revisions (circuits and limit masks), newest first. */
export function fetchDesignForAnalysis(designId: string, signal?: AbortSignal): Promise<{ design: DesignDetail }> {
  return apiRequest<{ design: DesignDetail }>(`/api/designs/${encodeURIComponent(designId)}`, { signal });
}

export function designForAnalysisQueryOptions(designId: string) {
  return queryOptions({ queryKey: designAnalysisQueryKey(designId), queryFn: ({ signal }) => fetchDesignForAnalysis(designId, signal) });
}

export function useDesignForAnalysis(designId: string) {
  return useQuery(designForAnalysisQueryOptions(designId));
}
