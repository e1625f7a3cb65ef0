import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DesignSummary } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';

export const designsQueryKey = ['designs'] as const;

/** Every design with its latest revision and counts, by name. */
export function fetchDesigns(signal?: AbortSignal): Promise<{ designs: DesignSummary[] }> {
  return apiRequest<{ designs: DesignSummary[] }>('/api/designs', { signal });
}

export function designsQueryOptions() {
  return queryOptions({ queryKey: designsQueryKey, queryFn: ({ signal }) => fetchDesigns(signal) });
}

export function useDesigns() {
  return useQuery(designsQueryOptions());
}
