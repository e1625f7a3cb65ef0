import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ColumnMapping } from '../../../../shared/schemas/sweeps';
import { apiRequest } from '../../../lib/api-client';

export type RememberedMapping = { header: string[]; mapping: ColumnMapping };
export const columnMappingQueryKey = ['preferences', 'column-mapping'] as const;

/** The column mapping this person used last, with the header it was for (null when none yet). */
export function fetchColumnMapping(signal?: AbortSignal): Promise<{ columnMapping: RememberedMapping | null }> {
  return apiRequest<{ columnMapping: RememberedMapping | null }>('/api/preferences/column-mapping', { signal });
}

export function columnMappingQueryOptions() {
  return queryOptions({ queryKey: columnMappingQueryKey, queryFn: ({ signal }) => fetchColumnMapping(signal) });
}

export function useColumnMapping() {
  return useQuery(columnMappingQueryOptions());
}
