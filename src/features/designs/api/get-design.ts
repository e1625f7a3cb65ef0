import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DesignDetail } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';
import { designsQueryKey } from './get-designs';

export const designQueryKey = (designId: string) => [...designsQueryKey, designId] as const;

/** One design with all its revisions, newest first. */
export function fetchDesign(designId: string, signal?: AbortSignal): Promise<{ design: DesignDetail }> {
  return apiRequest<{ design: DesignDetail }>(`/api/designs/${encodeURIComponent(designId)}`, { signal });
}

export function designQueryOptions(designId: string) {
  return queryOptions({ queryKey: designQueryKey(designId), queryFn: ({ signal }) => fetchDesign(designId, signal) });
}

export function useDesign(designId: string) {
  return useQuery(designQueryOptions(designId));
}
