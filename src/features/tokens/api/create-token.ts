import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatedAccessToken } from '../../../../shared/schemas/tokens';
import { apiRequest } from '../../../lib/api-client';
import { tokensQueryKey } from './get-tokens';

/** Create a token for a bench program; the answer holds the token itself, the only time it is shown. */
export function createToken(input: { name: string }): Promise<{ token: CreatedAccessToken }> {
  return apiRequest<{ token: CreatedAccessToken }>('/api/tokens', { method: 'POST', body: input });
}

export function useCreateToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createToken,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tokensQueryKey }),
  });
}
