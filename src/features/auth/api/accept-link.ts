import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SessionResponse, SetPasswordRequest } from '../../../../shared/schemas/auth';
import { apiRequest } from '../../../lib/api-client';
import { replaceSession } from './get-session';

/** Set a password from an invitation or reset link; the server signs the person in. */
export function acceptLink(request: SetPasswordRequest): Promise<SessionResponse> {
  return apiRequest<SessionResponse>('/api/auth/links/accept', { method: 'POST', body: request });
}

export function useAcceptLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptLink,
    onSuccess: ({ user }) => {
      replaceSession(queryClient, user);
    },
  });
}
