import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DesignDetail, DesignRevision } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';

/** Revisions never change once stored, so one read of the design serves the whole visit. */
export const sessionDesignQueryKey = (designId: string) => ['session-analysis', 'design', designId] as const;

export function fetchDesign(designId: string, signal?: AbortSignal): Promise<{ design: DesignDetail }> {
  return apiRequest<{ design: DesignDetail }>(`/api/designs/${encodeURIComponent(designId)}`, { signal });
}

/** The design revision a session was measured against: its circuit and limit mask. */
export function designRevisionQueryOptions(designId: string, revisionId: string) {
  return queryOptions({
    queryKey: sessionDesignQueryKey(designId),
    queryFn: ({ signal }) => fetchDesign(designId, signal),
    staleTime: 5 * 60 * 1000,
    select: (data): { designName: string; revision: DesignRevision | null } => ({
      designName: data.design.name,
      revision: data.design.revisions.find((revision) => revision.id === revisionId) ?? null,
    }),
  });
}

export function useDesignRevision(designId: string, revisionId: string) {
  return useQuery(designRevisionQueryOptions(designId, revisionId));
}
