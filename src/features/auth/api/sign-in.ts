import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SessionResponse, SignInRequest } from '../../../../shared/schemas/auth';
import { apiRequest } from '../../../lib/api-client';
import { replaceSession } from './get-session';

export function signIn(request: SignInRequest): Promise<SessionResponse> {
  return apiRequest<SessionResponse>('/api/auth/sign-in', { method: 'POST', body: request });
}

/** Sign in; on success everything cached for a previous person is dropped. */
export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: ({ user }) => {
      replaceSession(queryClient, user);
    },
  });
}
