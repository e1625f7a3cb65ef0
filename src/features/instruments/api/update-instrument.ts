import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Instrument, InstrumentInput } from '../../../../shared/schemas/instruments';
import { apiRequest } from '../../../lib/api-client';
import { instrumentsQueryKey } from './get-instruments';

export type UpdateInstrumentVariables = { instrumentId: string; input: InstrumentInput };

/** Replace an instrument's details (lead only), retiring it included. */
export function updateInstrument({ instrumentId, input }: UpdateInstrumentVariables): Promise<{ instrument: Instrument }> {
  return apiRequest<{ instrument: Instrument }>(`/api/instruments/${encodeURIComponent(instrumentId)}`, { method: 'PUT', body: input });
}

export function useUpdateInstrument() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateInstrument,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: instrumentsQueryKey }),
  });
}
