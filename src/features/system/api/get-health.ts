import { queryOptions, useQuery } from '@tanstack/react-query';
import type { HealthResponse } from '../../../../shared/schemas/auth';
import { apiRequest } from '../../../lib/api-client';

export const healthQueryKey = ['health'] as const;

/** Server, database and mail-transport state; decides whether the dev mailbox exists. */
export function fetchHealth(signal?: AbortSignal): Promise<HealthResponse> {
  return apiRequest<HealthResponse>('/api/health', { signal });
}

export function healthQueryOptions() {
  return queryOptions({
    queryKey: healthQueryKey,
    queryFn: ({ signal }) => fetchHealth(signal),
    staleTime: 60_000,
  });
}

export function useHealth() {
  return useQuery(healthQueryOptions());
}
