import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DesignDetail, DesignSummary } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';

// The same reads the designs area makes, under the same keys (features do not import each other,
// but they may share the cache: the answers are identical).
export const designChoicesQueryKey = ['designs'] as const;

export function designChoicesQueryOptions() {
  return queryOptions({
    queryKey: designChoicesQueryKey,
    queryFn: ({ signal }) => apiRequest<{ designs: DesignSummary[] }>('/api/designs', { signal }),
  });
}

/** The designs to measure against (for the revision picker and the list filter). */
export function useDesignChoices() {
  return useQuery(designChoicesQueryOptions());
}

export function designRevisionsQueryOptions(designId: string) {
  return queryOptions({
    queryKey: [...designChoicesQueryKey, designId],
    queryFn: ({ signal }) => apiRequest<{ design: DesignDetail }>(`/api/designs/${encodeURIComponent(designId)}`, { signal }),
    enabled: designId !== '',
  });
}

/** One design's revisions, newest first. */
export function useDesignRevisions(designId: string) {
  return useQuery(designRevisionsQueryOptions(designId));
}
