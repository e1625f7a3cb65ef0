import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DesignDetail, DesignRevision, DesignRevisionInput } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';
import { designsQueryKey } from './get-designs';

export type AddDesignRevisionVariables = { designId: string; input: DesignRevisionInput };

/** Save an edit as a new, immutable revision (designer or lead); earlier sessions keep theirs. */
export function addDesignRevision({ designId, input }: AddDesignRevisionVariables): Promise<{ revision: DesignRevision; design: DesignDetail }> {
  return apiRequest<{ revision: DesignRevision; design: DesignDetail }>(`/api/designs/${encodeURIComponent(designId)}/revisions`, {
    method: 'POST',
    body: input,
  });
}

export function useAddDesignRevision() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: addDesignRevision,
    // The list and every design detail share the `designs` prefix.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: designsQueryKey }),
  });
}
