import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateDesignInput, DesignDetail } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';
import { designsQueryKey } from './get-designs';

/** Create a design with its first revision (designer or lead). */
export function createDesign(input: CreateDesignInput): Promise<{ design: DesignDetail }> {
  return apiRequest<{ design: DesignDetail }>('/api/designs', { method: 'POST', body: input });
}

export function useCreateDesign() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createDesign,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: designsQueryKey }),
  });
}
