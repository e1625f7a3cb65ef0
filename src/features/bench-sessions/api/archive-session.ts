import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BenchSessionDetail } from '../../../../shared/schemas/bench-sessions';
import { apiRequest } from '../../../lib/api-client';
import { sessionsQueryKey } from './get-sessions';

/** Close a session for good (lead only): no sweeps can be added afterwards. */
export function archiveSession(sessionId: string): Promise<{ session: BenchSessionDetail }> {
  return apiRequest<{ session: BenchSessionDetail }>(`/api/sessions/${encodeURIComponent(sessionId)}/archive`, { method: 'POST' });
}

export function useArchiveSession() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: archiveSession,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sessionsQueryKey }),
  });
}
