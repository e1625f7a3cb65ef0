import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Instrument, InstrumentInput } from '../../../../shared/schemas/instruments';
import { apiRequest } from '../../../lib/api-client';
import { instrumentsQueryKey } from './get-instruments';

/** Register an instrument (lead only); 409 when its serial number is already listed. */
export function createInstrument(input: InstrumentInput): Promise<{ instrument: Instrument }> {
  return apiRequest<{ instrument: Instrument }>('/api/instruments', { method: 'POST', body: input });
}

export function useCreateInstrument() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInstrument,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: instrumentsQueryKey }),
  });
}
