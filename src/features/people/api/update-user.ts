import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateUserRequest, User } from '../../../../shared/schemas/users';
import { apiRequest } from '../../../lib/api-client';
import { usersQueryKey } from './get-users';

export type UpdateUserVariables = { userId: string; changes: UpdateUserRequest };

/** Change a person's role or (de)activate them; 409 for the last lead or yourself. */
export function updateUser({ userId, changes }: UpdateUserVariables): Promise<{ user: User }> {
  return apiRequest<{ user: User }>(`/api/users/${encodeURIComponent(userId)}`, { method: 'PATCH', body: changes });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    onSettled: () => queryClient.invalidateQueries({ queryKey: usersQueryKey }),
  });
}
