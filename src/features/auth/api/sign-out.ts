import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest, isApiStatus } from '../../../lib/api-client';

export async function signOut(): Promise<void> {
  try {
    await apiRequest<void>('/api/auth/sign-out', { method: 'POST' });
  } catch (error) {
    // Already signed out on the server (session expired or revoked): the outcome is the same.
    if (!isApiStatus(error, 401)) throw error;
  }
}

/**
 * After signing out the page is loaded afresh at /sign-in: nothing the previous person could see
 * stays in memory, and the sign-in guard never sees the session vanish under the current page (it
 * would remember that page as the place to return to after the next sign-in).
 */
export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      queryClient.cancelQueries();
      window.location.replace('/sign-in');
    },
  });
}
