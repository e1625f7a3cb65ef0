// What GET /api/sessions/:id/analysis returns (and what live viewers receive as refits).
import type { CmrrPoint, FrequencyFit, LimitOutcome } from '../engine';
import type { PredictedPoint } from '../design-prediction';

export interface LimitVerdict {
  frequencyHz: number;
  cmrrDb: number;
  lowerBound: boolean;
  limitDb: number | null;
  marginDb: number | null;
  outcome: LimitOutcome;
}

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
