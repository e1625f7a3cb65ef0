// The work of one explorer run, in steps the worker can interleave with incoming messages (so a
// newer request can abandon a stale band half-way). Pure: no worker globals, testable in Node.
import { drawCircuitTrials, fillTrialRatiosSquared, resolveTrialOptions, type CircuitTrials } from '../../shared/analysis/circuit-trials';
import { percentilesInPlace } from '../../shared/analysis/percentiles';
import { monteCarloAtFrequency, worstCaseCmrrAtFrequency, type MonteCarloAtFrequencyResult } from '../../shared/analysis/prediction-band';
import { float64Of, type TrialScratch } from '../../shared/analysis/trial-scratch';
import { EngineInputError } from '../../shared/engine/errors';
import type { ExplorerBandPoint, MonteCarloResponse, MonteCarloRunRequest } from './monte-carlo-protocol';

/** The first step: everything at the chosen frequency (monteCarloAtFrequency of the shared analysis). */
export function runAtFrequency(request: MonteCarloRunRequest, scratch?: TrialScratch): MonteCarloAtFrequencyResult {
  return monteCarloAtFrequency(request.circuit, request.frequencyHz, {
    scratch,
    trials: request.trials,
    seed: request.seed,
    histogramBins: request.histogramBins,
    ...(request.limitDb === null ? {} : { limitDb: request.limitDb }),
  });
}

/**
 * The band over frequency, one frequency per `step()`: the same trials (drawn once, seeded) at
 * every frequency, 5/50/95th percentiles (numpy linear) and the corner worst case; identical to
 * monteCarloCmrrBand with the same trials and seed.
 */
export class BandRun {
  private readonly trials: CircuitTrials;
  private readonly scratch: Float64Array;
  private readonly frequencies: readonly number[];
  readonly points: ExplorerBandPoint[] = [];

  /** `scratch`: arrays kept between bands; a band abandoned for a newer one must not step again. */
  constructor(
    private readonly request: MonteCarloRunRequest,
    scratch?: TrialScratch,
  ) {
    const settings = resolveTrialOptions('BandRun', request.circuit, { trials: request.bandTrials, seed: request.seed }, request.bandTrials);
    this.trials = drawCircuitTrials(request.circuit, settings, scratch);
    this.scratch = float64Of(scratch, 'bandValues', settings.trials);
    this.frequencies = request.bandFrequenciesHz;
  }

  get done(): boolean {
    return this.points.length >= this.frequencies.length;
  }

  get total(): number {
    return this.frequencies.length;
  }

  /** Computes the next frequency; O(trials). */
  step(): void {
    const frequencyHz = this.frequencies[this.points.length];
    fillTrialRatiosSquared(this.trials, frequencyHz, this.scratch);
    const values = this.scratch;
    for (let index = 0; index < values.length; index++) values[index] = -10 * Math.log10(values[index]);
    const [p05Db, p50Db, p95Db] = percentilesInPlace(values, [5, 50, 95]);
    this.points.push({ frequencyHz, p05Db, p50Db, p95Db, worstCaseDb: worstCaseCmrrAtFrequency(this.request.circuit, frequencyHz) });
  }
}

/** An engine refusal as a message (with the field it names); anything else is a bug, reported as such. */
export function errorResponse(runId: number, error: unknown): MonteCarloResponse {
  if (error instanceof EngineInputError) return { type: 'error', runId, message: error.message, field: error.location?.field ?? null };
  return { type: 'error', runId, message: `The Monte Carlo worker failed: ${error instanceof Error ? error.message : String(error)}`, field: null };
}
