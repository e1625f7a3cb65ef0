import { queryOptions, useQuery } from '@tanstack/react-query';
import type { LinkInfoResponse } from '../../../../shared/schemas/auth';
import { apiRequest } from '../../../lib/api-client';

export const linkQueryKey = (token: string) => ['auth', 'links', token] as const;

/** Whom an e-mailed link is for and what it does; 404 unknown, 410 expired or already used. */
export function fetchLinkInfo(token: string, signal?: AbortSignal): Promise<LinkInfoResponse> {
  return apiRequest<LinkInfoResponse>(`/api/auth/links/${encodeURIComponent(token)}`, { signal });
}

export function linkQueryOptions(token: string) {
  return queryOptions({
    queryKey: linkQueryKey(token),
    queryFn: ({ signal }) => fetchLinkInfo(token, signal),
    retry: false,
    staleTime: Infinity,
  });
}

export function useLinkInfo(token: string) {
  return useQuery(linkQueryOptions(token));
}
