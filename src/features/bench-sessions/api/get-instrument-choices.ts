import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Instrument } from '../../../../shared/schemas/instruments';
import { apiRequest } from '../../../lib/api-client';

// The instruments area's read, under its key (see get-design-choices.ts for why it is repeated).
export function instrumentChoicesQueryOptions() {
  return queryOptions({
    queryKey: ['instruments'] as const,
    queryFn: ({ signal }) => apiRequest<{ instruments: Instrument[] }>('/api/instruments', { signal }),
  });
}

/** The registered instruments, to name the ones used in a session. */
export function useInstrumentChoices() {
  return useQuery(instrumentChoicesQueryOptions());
}
