import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AccessTokenSummary } from '../../../../shared/schemas/tokens';
import { apiRequest } from '../../../lib/api-client';
import { tokensQueryKey } from './get-tokens';

/** Revoke one of your tokens: programs using it are refused from then on. */
export function revokeToken(tokenId: string): Promise<{ token: AccessTokenSummary }> {
  return apiRequest<{ token: AccessTokenSummary }>(`/api/tokens/${encodeURIComponent(tokenId)}`, { method: 'DELETE' });
}

export function useRevokeToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeToken,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: tokensQueryKey }),
  });
}
