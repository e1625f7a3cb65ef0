import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Instrument } from '../../../../shared/schemas/instruments';
import { apiRequest } from '../../../lib/api-client';

export const instrumentsQueryKey = ['instruments'] as const;

/** Every registered instrument with its calibration state; retired ones last. */
export function fetchInstruments(signal?: AbortSignal): Promise<{ instruments: Instrument[] }> {
  return apiRequest<{ instruments: Instrument[] }>('/api/instruments', { signal });
}

export function instrumentsQueryOptions() {
  return queryOptions({ queryKey: instrumentsQueryKey, queryFn: ({ signal }) => fetchInstruments(signal) });
}

export function useInstruments() {
  return useQuery(instrumentsQueryOptions());
}
