import { queryOptions, useQuery } from '@tanstack/react-query';
import type { UserListResponse } from '../../../../shared/schemas/users';
import { apiRequest } from '../../../lib/api-client';

export const usersQueryKey = ['users'] as const;

/** Everyone with an account, invited and deactivated included (lead only). */
export function fetchUsers(signal?: AbortSignal): Promise<UserListResponse> {
  return apiRequest<UserListResponse>('/api/users', { signal });
}

export function usersQueryOptions() {
  return queryOptions({ queryKey: usersQueryKey, queryFn: ({ signal }) => fetchUsers(signal) });
}

export function useUsers() {
  return useQuery(usersQueryOptions());
}
