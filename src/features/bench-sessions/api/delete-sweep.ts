import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SweepSummary } from '../../../../shared/schemas/sweeps';
import { apiRequest } from '../../../lib/api-client';
import { sessionQueryKey } from './get-session';
import { sessionsQueryKey } from './get-sessions';

export type DeleteSweepVariables = { sessionId: string; sweepId: string; reason: string };

/** Mark a sweep deleted with a reason (its creator or a lead); it stays on record, struck through. */
export function deleteSweep({ sessionId, sweepId, reason }: DeleteSweepVariables): Promise<{ sweep: SweepSummary }> {
  return apiRequest<{ sweep: SweepSummary }>(`/api/sessions/${encodeURIComponent(sessionId)}/sweeps/${encodeURIComponent(sweepId)}`, {
    method: 'DELETE',
    body: { reason },
  });
}

export function useDeleteSweep() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteSweep,
    onSuccess: (_result, { sessionId }) => {
      void queryClient.invalidateQueries({ queryKey: sessionQueryKey(sessionId) });
      void queryClient.invalidateQueries({ queryKey: [...sessionsQueryKey, 'list'] });
    },
  });
}
