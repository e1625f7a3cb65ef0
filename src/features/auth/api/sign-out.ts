import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest, isApiStatus } from '../../../lib/api-client';
import { replaceSession } from './get-session';

export async function signOut(): Promise<void> {
  try {
    await apiRequest<void>('/api/auth/sign-out', { method: 'POST' });
  } catch (error) {
    // Already signed out on the server (session expired or revoked): the outcome is the same.
    if (!isApiStatus(error, 401)) throw error;
  }
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      replaceSession(queryClient, null);
    },
  });
}
