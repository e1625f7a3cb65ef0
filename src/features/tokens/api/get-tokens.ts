import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AccessTokenSummary } from '../../../../shared/schemas/tokens';
import { apiRequest } from '../../../lib/api-client';

export const tokensQueryKey = ['tokens'] as const;

/** Your own personal access tokens, newest first, revoked ones included. */
export function fetchTokens(signal?: AbortSignal): Promise<{ tokens: AccessTokenSummary[] }> {
  return apiRequest<{ tokens: AccessTokenSummary[] }>('/api/tokens', { signal });
}

export function tokensQueryOptions() {
  return queryOptions({ queryKey: tokensQueryKey, queryFn: ({ signal }) => fetchTokens(signal) });
}

export function useTokens() {
  return useQuery(tokensQueryOptions());
}
