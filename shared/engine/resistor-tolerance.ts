// How much common-mode rejection a four-resistor difference amplifier keeps
// when its resistors are only known within a tolerance: exact worst case,
// the textbook approximation, a seeded Monte Carlo, and the inverse question.
// All with an ideal op-amp, where only the resistor ratios matter.
import { magnitudeToDb, dbToMagnitude } from './difference-amplifier';
import { EngineInputError } from './errors';
import { createSeededRandom, type SeededRandom } from './seeded-random';

/** How each resistor's relative error is drawn. */
export type ToleranceDistribution = 'uniform' | 'normal';

/** The most trials one Monte Carlo run accepts (80 MB if the exact fallback must store them all). */
export const MAXIMUM_MONTE_CARLO_TRIALS = 10_000_000;

/**
 * A resistor network with a tolerance per resistor, for designs that are not
 * simply "ratio G, every resistor ±ε". Source resistances are exact and add in
 * series with R1 and R3.
 */
export interface ToleranceNetwork {
  r1Ohms: number;
  r2Ohms: number;
  r3Ohms: number;
  r4Ohms: number;
  /** Tolerance of R1…R4 as fractions, each 0 ≤ tol < 0.5 (0 for an exact part). */
  toleranceFractions: readonly [number, number, number, number];
  sourceResistance1Ohms?: number;
  sourceResistance2Ohms?: number;
}

/** Options of {@link monteCarloCmrr}: either `gain` with `toleranceFraction`, or `network`. */
export interface MonteCarloCmrrOptions {
  /** Nominal gain G = R2/R1 = R4/R3 (> 0), every resistor within ±toleranceFraction. */
  gain?: number;
  /** Tolerance of every resistor as a fraction, 0 < tol < 0.5 (0.001 for 0.1 %). */
  toleranceFraction?: number;
  /** Instead of gain and toleranceFraction: nominal resistors with their own tolerances. */
  network?: ToleranceNetwork;
  /** Number of trials, 1 … 10,000,000 (default 1,000,000). */
  trials?: number;
  /** Generator seed, a non-negative integer (default 1). */
  seed?: number;
  /** 'uniform' within ±tol (default) or 'normal' with σ = tol/3. */
  distribution?: ToleranceDistribution;
  /** When given, the yield is the fraction of trials with CMRR ≥ this limit, dB. */
  limitDb?: number;
}

/** Result of {@link monteCarloCmrr}. */
export interface MonteCarloCmrrResult {
  trials: number;
  seed: number;
  distribution: ToleranceDistribution;
  /** 5th, 50th and 95th percentiles of CMRR, dB (numpy's default linear interpolation). */
  p05Db: number;
  p50Db: number;
  p95Db: number;
  /** Fraction of trials with CMRR ≥ limitDb (only when a limit was given). */
  yieldFraction?: number;
  limitDb?: number;
}

/** Result of {@link toleranceForTargetCmrr}. */
export interface ToleranceForTargetResult {
  /** ε from the approximation (1 + G)/(4ε) = target. */
  approximationToleranceFraction: number;
  /** Largest ε whose exact 16-corner worst case still reaches the target (capped just below 0.5). */
  worstCaseToleranceFraction: number;
}

function requireGain(functionName: string, gain: number): void {
  if (!Number.isFinite(gain) || gain <= 0) {
    throw new EngineInputError(`${functionName} requires a finite gain above 0, got ${gain}`, { field: 'gain' });
  }
}

function requireTolerance(functionName: string, toleranceFraction: number): void {
  if (!Number.isFinite(toleranceFraction) || toleranceFraction <= 0 || toleranceFraction >= 0.5) {
    throw new EngineInputError(
      `${functionName} requires a tolerance fraction between 0 and 0.5 exclusive (0.001 for 0.1 %), got ${toleranceFraction}`,
      { field: 'toleranceFraction' },
    );
  }
}

/**
 * |Acm/Ad| of the difference amplifier with an ideal op-amp, from the textbook
 * relations of DOMAIN.md: `Acm/Ad = 2·(R1·R4 − R2·R3) / (R4·(R1 + R2) + R2·(R3 + R4))`.
 * Unitless; only the ratios R2/R1 and R4/R3 matter. O(1), no validation
 * (positive resistances assumed).
 * @example commonModeToDifferentialRatio(1, 1, 1, 1.01) // → 0.004963
 */
export function commonModeToDifferentialRatio(r1Ohms: number, r2Ohms: number, r3Ohms: number, r4Ohms: number): number {
  return Math.abs((2 * (r1Ohms * r4Ohms - r2Ohms * r3Ohms)) / (r4Ohms * (r1Ohms + r2Ohms) + r2Ohms * (r3Ohms + r4Ohms)));
}

/**
 * Exact worst-case CMRR when every resistor lies within ±ε of a nominal design
 * with matched ratios R2/R1 = R4/R3 = G: the minimum over the 16 corners (each
 * resistor at 1 ± ε). The corners are exact because Acm/Ad is a ratio of
 * functions affine in each resistor, hence monotone in each one. Ideal op-amp.
 * O(16).
 *
 * @param gain G = R2/R1 (> 0)
 * @param toleranceFraction ε, 0 < ε < 0.5
 * @returns worst-case CMRR, dB
 * @throws EngineInputError (field "gain" or "toleranceFraction")
 * @example worstCaseCmrrDb(1, 0.01) // → 33.98
 */
export function worstCaseCmrrDb(gain: number, toleranceFraction: number): number {
  requireGain('worstCaseCmrrDb', gain);
  requireTolerance('worstCaseCmrrDb', toleranceFraction);
  let worstRatio = 0;
  for (let corner = 0; corner < 16; corner++) {
    const deviation = (bit: number): number => ((corner >> bit) & 1 ? 1 + toleranceFraction : 1 - toleranceFraction);
    const ratio = commonModeToDifferentialRatio(deviation(0), gain * deviation(1), deviation(2), gain * deviation(3));
    if (ratio > worstRatio) worstRatio = ratio;
  }
  return -magnitudeToDb(worstRatio);
}

/** Checks a network; returns nominal values, tolerances and source resistances as arrays. */
function networkParts(functionName: string, network: ToleranceNetwork): { nominalOhms: number[]; tolerances: number[]; sourceOhms: [number, number] } {
  const nominalOhms = [network.r1Ohms, network.r2Ohms, network.r3Ohms, network.r4Ohms];
  nominalOhms.forEach((value, index) => {
    if (!Number.isFinite(value) || value <= 0) {
      throw new EngineInputError(`${functionName} requires r${index + 1}Ohms to be a finite resistance above 0 ohms, got ${value}`, {
        field: `r${index + 1}Ohms`,
      });
    }
  });
  const tolerances = [...(network.toleranceFractions ?? [])];
  if (tolerances.length !== 4) {
    throw new EngineInputError(`${functionName} requires four tolerance fractions (R1…R4), got ${tolerances.length}`, {
      field: 'toleranceFractions',
    });
  }
  tolerances.forEach((value, index) => {
    if (!Number.isFinite(value) || value < 0 || value >= 0.5) {
      throw new EngineInputError(`${functionName} requires the tolerance of R${index + 1} to be a fraction from 0 to below 0.5, got ${value}`, {
        field: `toleranceFractions[${index}]`,
      });
    }
  });
  const sourceOhms: [number, number] = [network.sourceResistance1Ohms ?? 0, network.sourceResistance2Ohms ?? 0];
  sourceOhms.forEach((value, index) => {
    if (!Number.isFinite(value) || value < 0) {
      throw new EngineInputError(`${functionName} requires sourceResistance${index + 1}Ohms to be at least 0 ohms, got ${value}`, {
        field: `sourceResistance${index + 1}Ohms`,
      });
    }
  });
  return { nominalOhms, tolerances, sourceOhms };
}

/**
 * Exact worst-case CMRR of a given resistor network, each resistor within its
 * own tolerance, source resistances exact (in series with R1 and R3): the
 * minimum over the 16 corners (exact for the reason given at
 * {@link worstCaseCmrrDb}). Ideal op-amp. O(16).
 *
 * @param network nominal R1…R4 (ohms), their tolerances (fractions), source resistances (ohms)
 * @returns worst-case CMRR, dB (Infinity when every corner is perfectly matched, e.g. all tolerances 0 and matched ratios)
 * @throws EngineInputError naming the resistor or tolerance
 * @example worstCaseNetworkCmrrDb({ r1Ohms: 1e3, r2Ohms: 1e3, r3Ohms: 1e3, r4Ohms: 1e3, toleranceFractions: [0.01, 0.01, 0.01, 0.01] }) // → 33.98
 */
export function worstCaseNetworkCmrrDb(network: ToleranceNetwork): number {
  const { nominalOhms, tolerances, sourceOhms } = networkParts('worstCaseNetworkCmrrDb', network);
  let worstRatio = 0;
  for (let corner = 0; corner < 16; corner++) {
    const value = (index: number): number => nominalOhms[index] * ((corner >> index) & 1 ? 1 + tolerances[index] : 1 - tolerances[index]);
    const ratio = commonModeToDifferentialRatio(value(0) + sourceOhms[0], value(1), value(2) + sourceOhms[1], value(3));
    if (ratio > worstRatio) worstRatio = ratio;
  }
  return -magnitudeToDb(worstRatio);
}

/**
 * The textbook approximation of the worst case, `CMRR ≈ (1 + G)/(4ε)` (DOMAIN.md,
 * from memory). O(1).
 *
 * @param gain G = R2/R1 (> 0)
 * @param toleranceFraction ε, 0 < ε < 0.5
 * @returns CMRR, dB
 * @throws EngineInputError (field "gain" or "toleranceFraction")
 * @example approximateWorstCaseCmrrDb(10, 0.001) // → 68.79
 */
export function approximateWorstCaseCmrrDb(gain: number, toleranceFraction: number): number {
  requireGain('approximateWorstCaseCmrrDb', gain);
  requireTolerance('approximateWorstCaseCmrrDb', toleranceFraction);
  return magnitudeToDb((1 + gain) / (4 * toleranceFraction));
}

/**
 * The resistor tolerance needed for a target CMRR at a gain, both from the
 * approximation `ε = (1 + G)/(4·CMRR)` and from the exact 16-corner worst case
 * (bisection to 1e-12 relative; the worst case falls monotonically with ε).
 * O(60 · 16).
 *
 * @param gain G = R2/R1 (> 0)
 * @param targetCmrrDb target CMRR, dB (> 0)
 * @throws EngineInputError (field "gain" or "targetCmrrDb")
 * @example toleranceForTargetCmrr(10, 68.79).approximationToleranceFraction // → 0.001
 */
export function toleranceForTargetCmrr(gain: number, targetCmrrDb: number): ToleranceForTargetResult {
  requireGain('toleranceForTargetCmrr', gain);
  if (!Number.isFinite(targetCmrrDb) || targetCmrrDb <= 0) {
    throw new EngineInputError(`toleranceForTargetCmrr requires a finite target above 0 dB, got ${targetCmrrDb}`, {
      field: 'targetCmrrDb',
    });
  }
  const approximationToleranceFraction = (1 + gain) / (4 * dbToMagnitude(targetCmrrDb));
  let passing = 0;
  let failing = 0.5;
  const largestTolerance = 0.5 * (1 - 1e-12);
  if (worstCaseCmrrDb(gain, largestTolerance) >= targetCmrrDb) {
    return { approximationToleranceFraction, worstCaseToleranceFraction: largestTolerance };
  }
  while (failing - passing > 1e-12 * failing) {
    const middle = (passing + failing) / 2;
    if (middle > 0 && worstCaseCmrrDb(gain, middle) >= targetCmrrDb) passing = middle;
    else failing = middle;
  }
  return { approximationToleranceFraction, worstCaseToleranceFraction: passing };
}

// ---------------------------------------------------------------------------
// Monte Carlo

/** Trials generated per block: 16 K uint32 of scratch stays in the L1/L2 cache. */
const BLOCK_TRIALS = 4096;
/** The first trials, sorted, locate the wanted order statistics for the streaming pass. */
const SAMPLE_TRIALS = 16384;
/** Half-width of the bracket around a sample quantile, in binomial standard deviations (a miss, ≈ 1e-6 per run, only costs the exact fallback). */
const BRACKET_STANDARD_DEVIATIONS = 5;

/**
 * Produces the trials' |Acm/Ad| values in order, block by block, from the
 * generator. Uniform: R = nominal·(1 + ε·(2u − 1)). Normal: R = nominal·(1 + (ε/3)·z)
 * (plus the exact source resistance for R1 and R3)
 * with z from Marsaglia's polar method (Marsaglia and Bray 1964), which needs no
 * trigonometry.
 */
class RatioStream {
  private readonly generator: SeededRandom;
  private readonly scratch = new Uint32Array(4 * BLOCK_TRIALS);
  private scratchCursor = 4 * BLOCK_TRIALS;
  private spareNormal = 0;
  private hasSpareNormal = false;
  /** Per resistor: R = base + scale·x, with x = u32 (uniform) or a standard normal. */
  private readonly base: Float64Array;
  private readonly scale: Float64Array;

  constructor(
    seed: number,
    trialNetwork: TrialNetwork,
    private readonly distribution: ToleranceDistribution,
  ) {
    this.generator = createSeededRandom(seed);
    this.base = new Float64Array(4);
    this.scale = new Float64Array(4);
    for (let index = 0; index < 4; index++) {
      const nominal = trialNetwork.nominalOhms[index];
      const tolerance = trialNetwork.tolerances[index];
      const source = index === 0 ? trialNetwork.sourceOhms[0] : index === 2 ? trialNetwork.sourceOhms[1] : 0;
      if (distribution === 'uniform') {
        // R = n·(1 − ε) + (2·n·ε/2^32)·u32 covers n·[1 − ε, 1 + ε) in steps of 2nε/2^32.
        this.base[index] = nominal * (1 - tolerance) + source;
        this.scale[index] = (2 * nominal * tolerance) / 4294967296;
      } else {
        this.base[index] = nominal + source;
        this.scale[index] = (nominal * tolerance) / 3;
      }
    }
  }

  /** Writes the next `count` (≤ BLOCK_TRIALS) ratios into `target[0 … count)`. */
  next(target: Float64Array, count: number): void {
    if (this.distribution === 'uniform') this.nextUniform(target, count);
    else this.nextNormal(target, count);
  }

  private nextUniform(target: Float64Array, count: number): void {
    const scratch = this.scratch;
    this.generator.fillUint32(scratch);
    const [base1, base2, base3, base4] = this.base;
    const [scale1, scale2, scale3, scale4] = this.scale;
    for (let trial = 0, word = 0; trial < count; trial++, word += 4) {
      const r1 = base1 + scale1 * scratch[word];
      const r2 = base2 + scale2 * scratch[word + 1];
      const r3 = base3 + scale3 * scratch[word + 2];
      const r4 = base4 + scale4 * scratch[word + 3];
      target[trial] = Math.abs((2 * (r1 * r4 - r2 * r3)) / (r4 * (r1 + r2) + r2 * (r3 + r4)));
    }
  }

  private standardNormal(): number {
    if (this.hasSpareNormal) {
      this.hasSpareNormal = false;
      return this.spareNormal;
    }
    const scratch = this.scratch;
    for (;;) {
      if (this.scratchCursor + 2 > scratch.length) {
        this.generator.fillUint32(scratch);
        this.scratchCursor = 0;
      }
      // (u32 + 0.5)/2^31 − 1 lies strictly inside (−1, 1).
      const first = (scratch[this.scratchCursor] + 0.5) / 2147483648 - 1;
      const second = (scratch[this.scratchCursor + 1] + 0.5) / 2147483648 - 1;
      this.scratchCursor += 2;
      const radiusSquared = first * first + second * second;
      if (radiusSquared >= 1 || radiusSquared === 0) continue;
      const factor = Math.sqrt((-2 * Math.log(radiusSquared)) / radiusSquared);
      this.spareNormal = second * factor;
      this.hasSpareNormal = true;
      return first * factor;
    }
  }

  private nextNormal(target: Float64Array, count: number): void {
    const [base1, base2, base3, base4] = this.base;
    const [scale1, scale2, scale3, scale4] = this.scale;
    for (let trial = 0; trial < count; trial++) {
      const r1 = base1 + scale1 * this.standardNormal();
      const r2 = base2 + scale2 * this.standardNormal();
      const r3 = base3 + scale3 * this.standardNormal();
      const r4 = base4 + scale4 * this.standardNormal();
      target[trial] = Math.abs((2 * (r1 * r4 - r2 * r3)) / (r4 * (r1 + r2) + r2 * (r3 + r4)));
    }
  }
}

/**
 * Rearranges `values[start … end)` so that `values[rank]` holds the value of
 * that rank in ascending order, smaller ones before it and larger ones after
 * (Hoare's FIND / quickselect with median-of-three pivots). Expected O(n).
 * NaN must not occur.
 * @example selectInPlace(Float64Array.of(3, 1, 2), 1) // → 2
 */
export function selectInPlace(values: Float64Array, rank: number, start = 0, end = values.length): number {
  if (!Number.isInteger(rank) || rank < start || rank >= end) {
    throw new Error(`selectInPlace: rank ${rank} lies outside [${start}, ${end})`);
  }
  let low = start;
  let high = end - 1;
  while (high > low) {
    const middle = (low + high) >>> 1;
    const a = values[low];
    const b = values[middle];
    const c = values[high];
    const pivot = a < b ? (b < c ? b : a < c ? c : a) : a < c ? a : b < c ? c : b;
    let left = low;
    let right = high;
    while (left <= right) {
      while (values[left] < pivot) left++;
      while (values[right] > pivot) right--;
      if (left <= right) {
        const swap = values[left];
        values[left] = values[right];
        values[right] = swap;
        left++;
        right--;
      }
    }
    if (rank <= right) high = right;
    else if (rank >= left) low = left;
    else return values[rank];
  }
  return values[rank];
}

/** For one percentile: the two ascending ranks of |Acm/Ad| it needs and the interpolation weight. */
interface PercentilePlan {
  /** Rank (ascending |Acm/Ad|) of CMRR's lower interpolation neighbour. */
  lowerCmrrRank: number;
  /** Rank of CMRR's upper neighbour (one rank lower in |Acm/Ad|). */
  upperCmrrRank: number;
  fraction: number;
}

/** numpy's default ('linear') percentile of CMRR, planned on |Acm/Ad| (CMRR falls as the ratio rises). */
function planPercentile(trials: number, percent: number): PercentilePlan {
  const position = (percent / 100) * (trials - 1);
  const lower = Math.floor(position);
  const upper = Math.min(lower + 1, trials - 1);
  return { lowerCmrrRank: trials - 1 - lower, upperCmrrRank: trials - 1 - upper, fraction: position - lower };
}

function interpolateDb(lowerRatio: number, upperRatio: number, fraction: number): number {
  const lowerDb = -magnitudeToDb(lowerRatio);
  if (fraction === 0) return lowerDb;
  return lowerDb + fraction * (-magnitudeToDb(upperRatio) - lowerDb);
}

const PERCENTS = [5, 50, 95] as const;

/** What the trials draw from: nominal R1…R4, their tolerances, and the source resistances. */
interface TrialNetwork {
  nominalOhms: number[];
  tolerances: number[];
  sourceOhms: [number, number];
}

interface MonteCarloSettings {
  trialNetwork: TrialNetwork;
  trials: number;
  seed: number;
  distribution: ToleranceDistribution;
  limitDb?: number;
}

function validateMonteCarlo(functionName: string, options: MonteCarloCmrrOptions): MonteCarloSettings {
  let trialNetwork: TrialNetwork;
  if (options.network !== undefined) {
    if (options.gain !== undefined || options.toleranceFraction !== undefined) {
      throw new EngineInputError(`${functionName} takes either network or gain with toleranceFraction, not both`, { field: 'network' });
    }
    trialNetwork = networkParts(functionName, options.network);
  } else {
    requireGain(functionName, options.gain as number);
    requireTolerance(functionName, options.toleranceFraction as number);
    const gain = options.gain as number;
    const tolerance = options.toleranceFraction as number;
    trialNetwork = { nominalOhms: [1, gain, 1, gain], tolerances: [tolerance, tolerance, tolerance, tolerance], sourceOhms: [0, 0] };
  }
  const trials = options.trials ?? 1_000_000;
  if (!Number.isInteger(trials) || trials < 1 || trials > MAXIMUM_MONTE_CARLO_TRIALS) {
    throw new EngineInputError(`${functionName} requires a whole number of trials from 1 to ${MAXIMUM_MONTE_CARLO_TRIALS}, got ${trials}`, {
      field: 'trials',
    });
  }
  const seed = options.seed ?? 1;
  if (!Number.isSafeInteger(seed) || seed < 0) {
    throw new EngineInputError(`${functionName} requires a non-negative integer seed, got ${seed}`, { field: 'seed' });
  }
  const distribution = options.distribution ?? 'uniform';
  if (distribution !== 'uniform' && distribution !== 'normal') {
    throw new EngineInputError(`${functionName} requires distribution "uniform" or "normal", got "${String(distribution)}"`, {
      field: 'distribution',
    });
  }
  if (options.limitDb !== undefined && !Number.isFinite(options.limitDb)) {
    throw new EngineInputError(`${functionName} requires a finite limit in dB, got ${options.limitDb}`, { field: 'limitDb' });
  }
  return { trialNetwork, trials, seed, distribution, limitDb: options.limitDb };
}

/**
 * Every trial's |Acm/Ad| (unitless), in trial order, for the same options as
 * {@link monteCarloCmrr} (which gives the same trials for the same seed): for
 * histograms, or for statistics beyond the three percentiles. O(trials) time
 * and 8 bytes per trial.
 *
 * @throws EngineInputError as monteCarloCmrr does
 * @example monteCarloCmrrRatios({ gain: 1, toleranceFraction: 0.01, trials: 3 }).length // → 3
 */
export function monteCarloCmrrRatios(options: MonteCarloCmrrOptions): Float64Array {
  return allRatios(validateMonteCarlo('monteCarloCmrrRatios', options));
}

/** Every trial's ratio in one array (small runs, and the fallback of the streaming pass). */
function allRatios(settings: MonteCarloSettings): Float64Array {
  const stream = new RatioStream(settings.seed, settings.trialNetwork, settings.distribution);
  const ratios = new Float64Array(settings.trials);
  const block = new Float64Array(BLOCK_TRIALS);
  for (let start = 0; start < settings.trials; start += BLOCK_TRIALS) {
    const count = Math.min(BLOCK_TRIALS, settings.trials - start);
    stream.next(block, count);
    ratios.set(count === BLOCK_TRIALS ? block : block.subarray(0, count), start);
  }
  return ratios;
}

/** A window [lowRatio, highRatio] expected to hold some wanted ranks, and what the pass found in it. */
interface Bracket {
  lowRatio: number;
  highRatio: number;
  lowestRank: number;
  highestRank: number;
  below: number;
  collected: Float64Array;
  collectedCount: number;
  overflowed: boolean;
}

function makeBracket(sortedSample: Float64Array, trials: number, lowestRank: number, highestRank: number): Bracket {
  const sampleSize = sortedSample.length;
  const quantile = (lowestRank + highestRank) / 2 / (trials - 1);
  const center = quantile * (sampleSize - 1);
  const spread = BRACKET_STANDARD_DEVIATIONS * Math.sqrt(sampleSize * quantile * (1 - quantile)) + 8;
  const lowIndex = Math.floor(center - spread);
  const highIndex = Math.ceil(center + spread);
  const expectedFraction = (Math.min(highIndex, sampleSize) - Math.max(lowIndex, 0) + 1) / sampleSize;
  return {
    lowRatio: lowIndex < 0 ? -Infinity : sortedSample[lowIndex],
    highRatio: highIndex >= sampleSize ? Infinity : sortedSample[highIndex],
    lowestRank,
    highestRank,
    below: 0,
    collected: new Float64Array(Math.ceil(trials * expectedFraction * 1.5) + 1024),
    collectedCount: 0,
    overflowed: false,
  };
}

/**
 * One pass over a block for all three brackets and the yield count: the
 * brackets' bounds live in locals so the loop stays in registers.
 */
function classifyBlock(brackets: readonly [Bracket, Bracket, Bracket], values: Float64Array, count: number, limitRatio: number): number {
  const [first, second, third] = brackets;
  const low1 = first.lowRatio, high1 = first.highRatio, store1 = first.collected, capacity1 = store1.length;
  const low2 = second.lowRatio, high2 = second.highRatio, store2 = second.collected, capacity2 = store2.length;
  const low3 = third.lowRatio, high3 = third.highRatio, store3 = third.collected, capacity3 = store3.length;
  let below1 = first.below, count1 = first.collectedCount;
  let below2 = second.below, count2 = second.collectedCount;
  let below3 = third.below, count3 = third.collectedCount;
  let passing = 0;
  for (let index = 0; index < count; index++) {
    const value = values[index];
    if (value <= limitRatio) passing++;
    if (value < low1) below1++;
    else if (value <= high1) {
      if (count1 < capacity1) store1[count1] = value;
      count1++;
    }
    if (value < low2) below2++;
    else if (value <= high2) {
      if (count2 < capacity2) store2[count2] = value;
      count2++;
    }
    if (value < low3) below3++;
    else if (value <= high3) {
      if (count3 < capacity3) store3[count3] = value;
      count3++;
    }
  }
  first.below = below1;
  first.collectedCount = count1;
  first.overflowed ||= count1 > capacity1;
  second.below = below2;
  second.collectedCount = count2;
  second.overflowed ||= count2 > capacity2;
  third.below = below3;
  third.collectedCount = count3;
  third.overflowed ||= count3 > capacity3;
  return passing;
}

function countAtMost(values: Float64Array, count: number, limitRatio: number): number {
  let passing = 0;
  for (let index = 0; index < count; index++) if (values[index] <= limitRatio) passing++;
  return passing;
}

/**
 * Seeded Monte Carlo of the difference amplifier's CMRR over resistor
 * tolerances (ideal op-amp; nominal R2/R1 = R4/R3 = G with every resistor
 * within ±ε, or a given network with a tolerance per resistor and exact source
 * resistances; each resistor drawn independently: uniform within ±ε by default,
 * normal with σ = ε/3 as an option, DOMAIN.md). Each trial's |Acm/Ad| comes from the exact textbook relation;
 * percentiles use numpy's default linear interpolation on CMRR in dB.
 *
 * Cost: O(trials) time. Runs above 4·16,384 trials keep only a sorted sample
 * of the first 16,384 trials plus the trials near the three wanted order
 * statistics (a few per cent), found in one streaming pass (the
 * Floyd–Rivest sampling idea); if a bracket misses (probability about 1e-6) the run
 * is regenerated from the same seed into one array and selected exactly. The
 * result is identical either way and depends only on the options.
 *
 * @throws EngineInputError naming the field: gain, toleranceFraction (or the network's
 *   resistor/tolerance), trials (whole number 1 … 10,000,000), seed, distribution, limitDb
 * @example monteCarloCmrr({ gain: 10, toleranceFraction: 0.001, seed: 1 }).p05Db // → about 74 dB
 */
export function monteCarloCmrr(options: MonteCarloCmrrOptions): MonteCarloCmrrResult {
  const settings = validateMonteCarlo('monteCarloCmrr', options);
  const { trials } = settings;
  const plans = PERCENTS.map((percent) => planPercentile(trials, percent));
  const limitRatio = settings.limitDb === undefined ? undefined : 1 / dbToMagnitude(settings.limitDb);
  const finish = (orderStatistic: (rank: number) => number, passing: number): MonteCarloCmrrResult => {
    const [p05Db, p50Db, p95Db] = plans.map((plan) =>
      interpolateDb(orderStatistic(plan.lowerCmrrRank), orderStatistic(plan.upperCmrrRank), plan.fraction),
    );
    const result: MonteCarloCmrrResult = { trials, seed: settings.seed, distribution: settings.distribution, p05Db, p50Db, p95Db };
    if (limitRatio !== undefined) {
      result.limitDb = settings.limitDb;
      result.yieldFraction = passing / trials;
    }
    return result;
  };
  const exactly = (): MonteCarloCmrrResult => {
    const ratios = allRatios(settings);
    const passing = limitRatio === undefined ? 0 : countAtMost(ratios, trials, limitRatio);
    return finish((rank) => selectInPlace(ratios, rank), passing);
  };
  if (trials <= 4 * SAMPLE_TRIALS) return exactly();

  const stream = new RatioStream(settings.seed, settings.trialNetwork, settings.distribution);
  const sample = new Float64Array(SAMPLE_TRIALS);
  for (let start = 0; start < SAMPLE_TRIALS; start += BLOCK_TRIALS) {
    stream.next(sample.subarray(start, start + BLOCK_TRIALS), BLOCK_TRIALS);
  }
  const sortedSample = sample.slice().sort();
  const [plan05, plan50, plan95] = plans;
  const brackets: [Bracket, Bracket, Bracket] = [
    makeBracket(sortedSample, trials, plan05.upperCmrrRank, plan05.lowerCmrrRank),
    makeBracket(sortedSample, trials, plan50.upperCmrrRank, plan50.lowerCmrrRank),
    makeBracket(sortedSample, trials, plan95.upperCmrrRank, plan95.lowerCmrrRank),
  ];
  // Without a limit, -1 counts nothing (every ratio is ≥ 0).
  const countingLimit = limitRatio ?? -1;
  let passing = classifyBlock(brackets, sample, SAMPLE_TRIALS, countingLimit);
  const block = new Float64Array(BLOCK_TRIALS);
  for (let start = SAMPLE_TRIALS; start < trials; start += BLOCK_TRIALS) {
    const count = Math.min(BLOCK_TRIALS, trials - start);
    stream.next(block, count);
    passing += classifyBlock(brackets, block, count, countingLimit);
  }
  const hit = brackets.every(
    (bracket) =>
      !bracket.overflowed && bracket.below <= bracket.lowestRank && bracket.highestRank < bracket.below + bracket.collectedCount,
  );
  if (!hit) return exactly();
  return finish((rank) => {
    const bracket = brackets.find((candidate) => candidate.lowestRank <= rank && rank <= candidate.highestRank);
    if (!bracket) throw new Error(`monteCarloCmrr: no bracket holds rank ${rank}`);
    return selectInPlace(bracket.collected, rank - bracket.below, 0, bracket.collectedCount);
  }, passing);
}
