import { useMutation } from '@tanstack/react-query';
import type { ForgotPasswordRequest } from '../../../../shared/schemas/auth';
import { apiRequest } from '../../../lib/api-client';

export type ForgotPasswordResponse = { message: string };

export function requestPasswordReset(request: ForgotPasswordRequest): Promise<ForgotPasswordResponse> {
  return apiRequest<ForgotPasswordResponse>('/api/auth/forgot-password', { method: 'POST', body: request });
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
