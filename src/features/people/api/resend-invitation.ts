import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';
import { usersQueryKey } from './get-users';

/** Send an invited person a fresh link (the old one stops working); 409 when not invited. */
export function resendInvitation(userId: string): Promise<{ message: string }> {
  return apiRequest<{ message: string }>(`/api/users/${encodeURIComponent(userId)}/invitations/resend`, {
    method: 'POST',
  });
}

export function useResendInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resendInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersQueryKey }),
  });
}
