import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BenchSessionDetail, CreateBenchSessionInput } from '../../../../shared/schemas/bench-sessions';
import { apiRequest } from '../../../lib/api-client';
import { sessionsQueryKey } from './get-sessions';

/** Start a bench session (technician, designer or lead); a hazardous drive needs the caution acknowledged. */
export function createSession(input: CreateBenchSessionInput): Promise<{ session: BenchSessionDetail }> {
  return apiRequest<{ session: BenchSessionDetail }>('/api/sessions', { method: 'POST', body: input });
}

export function useCreateSession() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSession,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: sessionsQueryKey });
      // Session counts on the designs change too.
      void queryClient.invalidateQueries({ queryKey: ['designs'] });
    },
  });
}
