import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InviteRequest, User } from '../../../../shared/schemas/users';
import { apiRequest } from '../../../lib/api-client';
import { usersQueryKey } from './get-users';

/** Create an invited account and e-mail its set-password link; 409 when the address is taken. */
export function inviteUser(request: InviteRequest): Promise<{ user: User }> {
  return apiRequest<{ user: User }>('/api/users/invitations', { method: 'POST', body: request });
}

export function useInviteUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersQueryKey }),
  });
}
