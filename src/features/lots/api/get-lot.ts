import { queryOptions, useQuery } from '@tanstack/react-query';
import type { LotSummary } from '../../../../shared/analysis/lot-summary';
import type { MonteCarloBandPoint } from '../../../../shared/analysis/prediction-band';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import type { Circuit, LimitMaskData } from '../../../../shared/schemas/designs';
import { apiRequest } from '../../../lib/api-client';

/** One unit of the lot: its latest session against the revision, with the engine's analysis. */
export interface LotUnitData {
  sessionId: string;
  unitSerial: string;
  measuredAt: string;
  status: 'open' | 'archived';
  operator: string;
  analysis: SessionAnalysis;
}

/** What GET /api/designs/:id/revisions/:revisionId/lot returns under `lot`. */
export interface LotData {
  design: { id: string; name: string };
  revision: { id: string; revision: number; label: string; circuit: Circuit; limitMask: LimitMaskData };
  units: LotUnitData[];
  /** Monte Carlo 5/50/95 % of the revision over its tolerances, at the units' frequencies. */
  predictedBand: MonteCarloBandPoint[];
  /** Null while no unit has a complete analysis. */
  summary: LotSummary | null;
}

// Under the designs prefix: saving a revision or a session invalidates it with the rest.
export const lotQueryKey = (designId: string, revisionId: string) => ['designs', designId, 'revisions', revisionId, 'lot'] as const;

export function lotPath(designId: string, revisionId: string): string {
  return `/api/designs/${encodeURIComponent(designId)}/revisions/${encodeURIComponent(revisionId)}/lot`;
}

/** Every unit measured against one revision, with the lot's spread and verdicts. */
export function fetchLot(designId: string, revisionId: string, signal?: AbortSignal): Promise<{ lot: LotData }> {
  return apiRequest<{ lot: LotData }>(lotPath(designId, revisionId), { signal });
}

export function lotQueryOptions(designId: string, revisionId: string) {
  return queryOptions({ queryKey: lotQueryKey(designId, revisionId), queryFn: ({ signal }) => fetchLot(designId, revisionId, signal) });
}

export function useLot(designId: string, revisionId: string) {
  return useQuery(lotQueryOptions(designId, revisionId));
}
