// The Monte Carlo band of a design's CMRR over frequency, and the full distribution at one
// frequency for the tolerance explorer: every resistor drawn within its tolerance, the op-amp's
// own term included by the engine's complex node solution (circuit-trials.ts).
import type { Circuit } from '../schemas/designs';
import { EngineInputError, selectInPlace, validateOpAmpModel, type ToleranceDistribution } from '../engine';
import {
  circuitOpAmp,
  circuitTrialsOf,
  drawCircuitTrials,
  fillTrialRatiosSquared,
  nominalResistors,
  resolveTrialOptions,
  type CircuitTrialOptions,
  type CircuitTrials,
  type OpAmpSignChoice,
} from './circuit-trials';
import { float64Of, type TrialScratch } from './trial-scratch';

/** Percentiles of the trials' CMRR at one frequency, dB. */
export interface MonteCarloBandPoint {
  frequencyHz: number;
  p05Db: number;
  p50Db: number;
  p95Db: number;
}

/** Result of {@link monteCarloCmrrBand}. */
export interface MonteCarloBand {
  trials: number;
  seed: number;
  distribution: ToleranceDistribution;
  opAmpTermSign: OpAmpSignChoice;
  /** One entry per requested frequency, in the order given. */
  points: MonteCarloBandPoint[];
}

/** Options of {@link monteCarloCmrrBand}. Defaults: 10,000 trials, seed 1, the design's distribution, random op-amp signs. */
export type MonteCarloBandOptions = Partial<CircuitTrialOptions>;

/** Options of {@link monteCarloAtFrequency}. Defaults: 100,000 trials, seed 1, the design's distribution, random signs, 40 bins. */
export interface MonteCarloAtFrequencyOptions extends Partial<CircuitTrialOptions> {
  /** When given, the yield is the fraction of trials with CMRR ≥ this limit, dB. */
  limitDb?: number;
  /** About how many histogram bins to use (5 … 400; the step is rounded to 1, 2 or 5 × 10ⁿ dB). */
  histogramBins?: number;
  /** Arrays kept between runs (a worker's): the run allocates nothing of size O(trials). */
  scratch?: TrialScratch;
}

/** A histogram of CMRR in dB: `counts[i]` trials in `[edgesDb[i], edgesDb[i + 1])` (the last bin includes its top edge). */
export interface CmrrHistogram {
  edgesDb: number[];
  counts: number[];
  /** Trials below the first edge (the histogram spans the 0.5th … 99.5th percentiles). */
  belowCount: number;
  /** Trials above the last edge (including infinite CMRR, an exactly matched trial). */
  aboveCount: number;
}

/** Result of {@link monteCarloAtFrequency}. */
export interface MonteCarloAtFrequencyResult extends MonteCarloBandPoint {
  trials: number;
  seed: number;
  distribution: ToleranceDistribution;
  opAmpTermSign: OpAmpSignChoice;
  limitDb?: number;
  /** Fraction of trials with CMRR ≥ limitDb (only with a limit). */
  yieldFraction?: number;
  /** Lowest CMRR over the tolerance corners (and both signs of each op-amp term), dB; see {@link worstCaseCmrrAtFrequency}. */
  worstCaseDb: number;
  histogram: CmrrHistogram;
}

function checkFrequency(functionName: string, frequencyHz: number, index?: number): void {
  if (!Number.isFinite(frequencyHz) || frequencyHz < 0) {
    const where = index === undefined ? '' : ` (entry ${index + 1})`;
    throw new EngineInputError(`${functionName} requires frequencies that are finite and not negative${where}, got ${frequencyHz}`, {
      field: 'frequencyHz',
      ...(index === undefined ? {} : { column: index + 1 }),
    });
  }
}

function checkCircuit(functionName: string, circuit: Circuit): void {
  nominalResistors(circuit, functionName);
  const opAmp = circuitOpAmp(circuit);
  if (opAmp) validateOpAmpModel(opAmp, functionName, 'opAmp.');
}

/**
 * The same numbers as percentilesInPlace (numpy 'linear'), for several percents of one sample at
 * less cost: the ranks are selected in ascending order, each within what is right of the previous
 * one (quickselect leaves the array partitioned around each), and the upper neighbour of a rank is
 * the minimum only up to the next selected rank. About half the work of selecting every rank in
 * the whole array; the order statistics, hence the results, are identical. O(n) expected.
 */
function ascendingPercentilesInPlace(values: Float64Array, percents: readonly number[]): number[] {
  const count = values.length;
  const positions = percents.map((percent) => (percent / 100) * (count - 1));
  const lowers = positions.map((position) => Math.floor(position));
  const ranks = [...new Set(lowers)].sort((a, b) => a - b);
  let start = 0;
  for (const rank of ranks) {
    selectInPlace(values, rank, start, count);
    start = rank + 1;
  }
  return positions.map((position, index) => {
    const lower = lowers[index];
    const fraction = position - lower;
    const lowerValue = values[lower];
    if (fraction === 0 || lower + 1 >= count) return lowerValue;
    // Right of `lower` up to the next selected rank (inclusive) lie the smallest values above it.
    const end = ranks.find((rank) => rank > lower) ?? count - 1;
    let upperValue = Infinity;
    for (let at = lower + 1; at <= end; at++) if (values[at] < upperValue) upperValue = values[at];
    if (upperValue === lowerValue) return lowerValue;
    return lowerValue + fraction * (upperValue - lowerValue);
  });
}

/** CMRR in dB of every trial, from |Acm/Ad|²: −10·log10(ratio²). */
function trialCmrrDb(trials: CircuitTrials, frequencyHz: number, ratioSquared: Float64Array): void {
  fillTrialRatiosSquared(trials, frequencyHz, ratioSquared);
  for (let index = 0; index < trials.trials; index++) ratioSquared[index] = -10 * Math.log10(ratioSquared[index]);
}

/**
 * Monte Carlo band of a design's CMRR over frequency: the 5th, 50th and 95th percentiles (numpy's
 * default linear interpolation) of the CMRR of `trials` circuits, each resistor drawn
 * independently within its own tolerance (uniform within ±tol, or normal with σ = tol/3;
 * DOMAIN.md) and each op-amp's own common-mode term with a random sign (or a fixed one), solved
 * by the engine's complex node equations at every frequency (see fillTrialRatiosSquared). The same
 * trials serve every frequency. With ideal op-amps at any frequency (or a difference amplifier at
 * dc), the trials and percentiles are those of the engine's monteCarloCmrr for the same network
 * and seed. Source resistances sit in series with R1 and R3 (difference amplifier).
 *
 * Cost: O(trials · frequencies), about 3 ms for 10,000 trials × 25 frequencies in Node on the
 * development machine (bench/analysis.bench.ts); memory 8 bytes × trials × (resistors + 1).
 *
 * @param circuit the stored design (resistors in ohms with tolerance fractions; op-amp data optional)
 * @param frequenciesHz frequencies, Hz (finite, ≥ 0, at least one)
 * @param options trials (default 10,000), seed (default 1), distribution (default the design's), opAmpTermSign (default 'random')
 * @throws EngineInputError naming the field: a resistor or tolerance, op-amp data, a frequency (entry), trials, seed, distribution, opAmpTermSign
 * @example monteCarloCmrrBand(circuit, [100, 1000]).points[0].p05Db // → about 79 dB for G = 10, 0.05 % resistors
 */
export function monteCarloCmrrBand(circuit: Circuit, frequenciesHz: readonly number[], options: MonteCarloBandOptions = {}): MonteCarloBand {
  const functionName = 'monteCarloCmrrBand';
  checkCircuit(functionName, circuit);
  if (frequenciesHz.length === 0) throw new EngineInputError(`${functionName} requires at least one frequency`, { field: 'frequencyHz' });
  frequenciesHz.forEach((frequencyHz, index) => checkFrequency(functionName, frequencyHz, index));
  const settings = resolveTrialOptions(functionName, circuit, options, 10_000);
  const trials = drawCircuitTrials(circuit, settings);
  const scratch = new Float64Array(settings.trials);
  const points = frequenciesHz.map((frequencyHz) => {
    trialCmrrDb(trials, frequencyHz, scratch);
    const [p05Db, p50Db, p95Db] = ascendingPercentilesInPlace(scratch, [5, 50, 95]);
    return { frequencyHz, p05Db, p50Db, p95Db };
  });
  return { trials: settings.trials, seed: settings.seed, distribution: settings.distribution, opAmpTermSign: settings.opAmpTermSign, points };
}

/** 1, 2 or 5 × 10ⁿ, the smallest at or above `raw` (> 0). */
function niceStep(raw: number): number {
  const decade = 10 ** Math.floor(Math.log10(raw));
  for (const multiple of [1, 2, 5, 10]) if (multiple * decade >= raw * (1 - 1e-12)) return multiple * decade;
  return 10 * decade;
}

/**
 * A histogram over [p0.5, p99.5] rounded out to whole steps of 1, 2 or 5 × 10ⁿ dB, about
 * `targetBins` bins; trials outside are counted as below/above. O(n).
 */
function histogramOf(valuesDb: Float64Array, lowDb: number, highDb: number, targetBins: number): CmrrHistogram {
  const finiteLow = Number.isFinite(lowDb) ? lowDb : 0;
  const finiteHigh = Number.isFinite(highDb) ? highDb : finiteLow + 1;
  const span = Math.max(finiteHigh - finiteLow, 1e-3);
  const step = niceStep(span / targetBins);
  const start = Math.floor(finiteLow / step) * step;
  let binCount = Math.max(1, Math.ceil((finiteHigh - start) / step - 1e-9));
  if (start + binCount * step < finiteHigh) binCount++;
  const counts = new Array<number>(binCount).fill(0);
  const end = start + binCount * step;
  let belowCount = 0;
  let aboveCount = 0;
  for (let index = 0; index < valuesDb.length; index++) {
    const value = valuesDb[index];
    if (value < start) belowCount++;
    else if (value > end) aboveCount++;
    else counts[Math.min(binCount - 1, Math.floor((value - start) / step))]++;
  }
  // Edges rounded to the step's decimals so they print cleanly (0.1 + 0.2 style noise removed).
  const decimals = Math.max(0, -Math.floor(Math.log10(step)) + 1);
  const edgesDb = Array.from({ length: binCount + 1 }, (_, index) => Number((start + index * step).toFixed(decimals)));
  return { edgesDb, counts, belowCount, aboveCount };
}

/**
 * The lowest CMRR of a design at one frequency over the corners of its tolerances: every
 * resistor at nominal·(1 ± tol) (16 corners for a difference amplifier, 128 for an
 * instrumentation amplifier) and, with op-amp data, both signs of every op-amp's own term. Exact
 * with ideal op-amps (|Acm/Ad| is a ratio of functions affine in each resistor, hence monotone in
 * each; the engine's worstCaseNetworkCmrrDb gives the same number); with op-amp data the corners
 * are the usual worst-case search (common practice, no source: an interior extreme is possible in
 * principle when the op-amp term nearly cancels the resistor term). O(corners · signs).
 *
 * @param circuit the stored design
 * @param frequencyHz frequency, Hz (≥ 0)
 * @returns worst-case CMRR, dB (Infinity when every corner is exactly matched)
 * @throws EngineInputError for a bad resistor, tolerance, op-amp data or frequency
 * @example worstCaseCmrrAtFrequency(circuitG1Tol1Percent, 0) // → 33.98
 */
export function worstCaseCmrrAtFrequency(circuit: Circuit, frequencyHz: number): number {
  const functionName = 'worstCaseCmrrAtFrequency';
  checkCircuit(functionName, circuit);
  checkFrequency(functionName, frequencyHz);
  const resistors = nominalResistors(circuit, functionName);
  const corners = 1 << resistors.length;
  const signCombinations = circuit.opAmp ? (circuit.topology === 'difference-amplifier' ? 2 : 8) : 1;
  const count = corners * signCombinations;
  const columns = resistors.map(() => new Float64Array(count));
  const signBits = new Uint8Array(count);
  for (let corner = 0; corner < corners; corner++) {
    for (let signs = 0; signs < signCombinations; signs++) {
      const trial = corner * signCombinations + signs;
      resistors.forEach((resistor, index) => {
        const deviation = (corner >> index) & 1 ? 1 + resistor.toleranceFraction : 1 - resistor.toleranceFraction;
        columns[index][trial] = resistor.ohms * deviation + resistor.seriesOhms;
      });
      signBits[trial] = signs;
    }
  }
  const trials = circuitTrialsOf(circuit, count, columns, signBits);
  const ratioSquared = new Float64Array(count);
  fillTrialRatiosSquared(trials, frequencyHz, ratioSquared);
  let worst = 0;
  for (let index = 0; index < count; index++) if (ratioSquared[index] > worst) worst = ratioSquared[index];
  return -10 * Math.log10(worst);
}

/**
 * The full Monte Carlo picture at one frequency, for the tolerance explorer: 5th/50th/95th
 * percentiles of CMRR (numpy linear), the yield against a limit, the corner worst case and a
 * histogram. Same trials and model as {@link monteCarloCmrrBand} (so the same seed gives the same
 * numbers as the band at that frequency). With ideal op-amps the percentiles and yield equal the
 * engine's monteCarloCmrr for the same network and seed (one code path here, because the
 * histogram needs every trial; the equality is tested).
 *
 * Cost O(trials): about 5 ms for 100,000 trials in Node on the development machine
 * (bench/analysis.bench.ts), 8 bytes × trials × (resistors + 1) of memory.
 *
 * @param circuit the stored design
 * @param frequencyHz frequency, Hz (≥ 0)
 * @param options trials (default 100,000), seed, distribution, opAmpTermSign, limitDb (dB), histogramBins (default 40)
 * @throws EngineInputError naming the field (as monteCarloCmrrBand, plus limitDb and histogramBins)
 * @example monteCarloAtFrequency(circuit, 1000, { limitDb: 80 }).yieldFraction // → fraction of trials ≥ 80 dB
 */
export function monteCarloAtFrequency(circuit: Circuit, frequencyHz: number, options: MonteCarloAtFrequencyOptions = {}): MonteCarloAtFrequencyResult {
  const functionName = 'monteCarloAtFrequency';
  checkCircuit(functionName, circuit);
  checkFrequency(functionName, frequencyHz);
  const settings = resolveTrialOptions(functionName, circuit, options, 100_000);
  if (options.limitDb !== undefined && !Number.isFinite(options.limitDb)) {
    throw new EngineInputError(`${functionName} requires a finite limit in dB, got ${options.limitDb}`, { field: 'limitDb' });
  }
  const targetBins = options.histogramBins ?? 40;
  if (!Number.isInteger(targetBins) || targetBins < 5 || targetBins > 400) {
    throw new EngineInputError(`${functionName} requires histogramBins to be a whole number from 5 to 400, got ${targetBins}`, {
      field: 'histogramBins',
    });
  }
  const trials = drawCircuitTrials(circuit, settings, options.scratch);
  const valuesDb = float64Of(options.scratch, 'valuesDb', settings.trials);
  trialCmrrDb(trials, frequencyHz, valuesDb);
  let passing = 0;
  if (options.limitDb !== undefined) for (let index = 0; index < valuesDb.length; index++) if (valuesDb[index] >= options.limitDb) passing++;
  // Selection reorders the values, which the histogram's counts do not mind.
  const [lowDb, p05Db, p50Db, p95Db, highDb] = ascendingPercentilesInPlace(valuesDb, [0.5, 5, 50, 95, 99.5]);
  const histogram = histogramOf(valuesDb, lowDb, highDb, targetBins);
  const result: MonteCarloAtFrequencyResult = {
    frequencyHz,
    trials: settings.trials,
    seed: settings.seed,
    distribution: settings.distribution,
    opAmpTermSign: settings.opAmpTermSign,
    p05Db,
    p50Db,
    p95Db,
    worstCaseDb: worstCaseCmrrAtFrequency(circuit, frequencyHz),
    histogram,
  };
  if (options.limitDb !== undefined) {
    result.limitDb = options.limitDb;
    result.yieldFraction = passing / settings.trials;
  }
  return result;
}
