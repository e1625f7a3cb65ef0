// Messages between the page and the Monte Carlo worker (monte-carlo.worker.ts). Plain data only:
// what structured cloning carries.
import type { Circuit } from '../../shared/schemas/designs';
import type { MonteCarloAtFrequencyResult, MonteCarloBandPoint } from '../../shared/analysis/prediction-band';

/** One explorer run: the full picture at one frequency, then the band over frequency. */
export interface MonteCarloRunRequest {
  type: 'run';
  /** Rising with every request; a run whose id is no longer the newest is abandoned. */
  runId: number;
  circuit: Circuit;
  /** Histogram, percentiles, yield and worst case here, Hz. */
  frequencyHz: number;
  /** Yield against this limit, dB; null outside the mask. */
  limitDb: number | null;
  /** Trials at the chosen frequency (the explorer uses 100,000). */
  trials: number;
  /** Trials of the band over frequency. */
  bandTrials: number;
  seed: number;
  histogramBins: number;
  /** Frequencies of the band and of the worst-case curve, Hz, ascending. */
  bandFrequenciesHz: number[];
}

/** The band over frequency with the worst case over the tolerance corners at each frequency. */
export interface ExplorerBandPoint extends MonteCarloBandPoint {
  worstCaseDb: number;
}

export type MonteCarloResponse =
  | { type: 'at-frequency'; runId: number; result: MonteCarloAtFrequencyResult; computeMs: number }
  | { type: 'band-progress'; runId: number; done: number; total: number }
  | { type: 'band'; runId: number; points: ExplorerBandPoint[]; computeMs: number }
  | { type: 'error'; runId: number; message: string; field: string | null };
