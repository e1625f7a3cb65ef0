// What GET /api/sessions/:id/analysis returns (and what live viewers receive as refits).
import { z } from 'zod';
import type { CmrrPoint, FrequencyFit, LimitOutcome, LimitVerdict } from '../engine';
import type { PredictedPoint } from '../design-prediction';

export type { LimitVerdict };

export interface SessionAnalysis {
  sessionId: string;
  /** `complete`: both sweeps present and fitted; `incomplete`: a sweep is missing or too short; `error`: the engine refused the data. */
  status: 'complete' | 'incomplete' | 'error';
  /** Why the status is not `complete`. */
  message: string | null;
  pointCounts: { differential: number; commonMode: number };
  points: CmrrPoint[];
  fit: FrequencyFit | null;
  warnings: string[];
  prediction: PredictedPoint[];
  limits: { guardBandDb: number; overall: LimitOutcome; verdicts: LimitVerdict[] } | null;
  computedAt: string;
  /** Set when the points were thinned for drawing (GET …/analysis?maxPoints=N): how many there were. */
  thinnedFrom?: number;
}

/** GET /api/sessions/:id/analysis/points: the analysed points a page at a time, sorted and filtered on the server. */
export const analysisPointsQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z.enum(['frequencyHz', 'cmrrDb', 'marginDb', 'residualDb']).default('frequencyHz'),
  direction: z.enum(['asc', 'desc']).default('asc'),
  /** Only the points with this verdict against the limit ('all' for every point). */
  outcome: z.enum(['all', 'pass', 'fail', 'indeterminate', 'outside-mask']).default('all'),
});
export type AnalysisPointsQuery = z.infer<typeof analysisPointsQuerySchema>;

/** One analysed point: measured, fitted, predicted, and against the limit. */
export interface AnalysisPointRow {
  /** Position in frequency order among all the session's CMRR points (0-based). */
  index: number;
  frequencyHz: number;
  cmrrDb: number;
  /** The common-mode output was at its noise floor: the CMRR is at least this. */
  lowerBound: boolean;
  fittedCmrrDb: number | null;
  residualDb: number | null;
  predictedCmrrDb: number | null;
  limitDb: number | null;
  marginDb: number | null;
  outcome: LimitOutcome | null;
}

export interface AnalysisPointsPage {
  items: AnalysisPointRow[];
  page: number;
  pageSize: number;
  /** Points matching the filter. */
  total: number;
  /** Every CMRR point of the session. */
  pointCount: number;
  /** The analysis the rows come from (its computedAt), so a page can tell when it is out of date. */
  computedAt: string;
}
