// A lot of units measured against one design revision: spread, capability and outliers at the
// mask frequencies, a verdict per unit, and the measured spread set against the predicted band.
import { median } from 'simple-statistics';
import { EngineInputError, checkAgainstLimitMask, evaluateLimitMask, lotStatistics, validateLimitMask, type CmrrPoint, type LimitMaskPoint, type LimitOutcome } from '../engine';
import { interpolateCmrrAtFrequency, interpolateLevelOnLogFrequency } from './log-interpolation';
import { linearPercentiles } from './percentiles';
import type { MonteCarloBand, MonteCarloBandPoint } from './prediction-band';

/** One unit of the lot: its session and measured points. */
export interface LotUnit {
  sessionId: string;
  unitSerial: string;
  points: readonly CmrrPoint[];
}

/** The design revision's limit mask (as stored: corners and a guard band). */
export interface LotMask {
  points: readonly LimitMaskPoint[];
  /** Guard band for pass/fail, dB (ILAC-G8 guarded acceptance; default 0). */
  guardBandDb?: number;
}

/** One unit's reading at a summary frequency. */
export interface LotUnitReading {
  sessionId: string;
  unitSerial: string;
  /** Interpolated on log-f; null when the unit was not measured across this frequency. */
  cmrrDb: number | null;
  lowerBound: boolean;
}

/** A unit flagged by the modified z-score. */
export interface LotOutlier {
  sessionId: string;
  unitSerial: string;
  cmrrDb: number;
  /** 0.6745·(x − median)/MAD. */
  modifiedZ: number;
  direction: 'low' | 'high';
}

/** Measured spread against the predicted Monte Carlo band at one frequency. */
export interface SpreadComparison {
  predictedP05Db: number;
  predictedP50Db: number;
  predictedP95Db: number;
  /** Measured p95 − p05 of the resolved units (numpy linear percentiles), dB; null below 5 resolved units. */
  measuredSpreadDb: number | null;
  predictedSpreadDb: number;
  /** Measured median − predicted median, dB. */
  medianOffsetDb: number;
  /** Resolved units below the predicted 5th percentile. */
  belowBandCount: number;
  /** Units (resolved, or bounds above the band's 5th percentile) that are not below it. */
  consideredCount: number;
  /** P(X ≥ belowBandCount) for X ~ Binomial(consideredCount, 0.05): small means more units sit low than the prediction allows. */
  belowBandTailProbability: number;
  assessment: 'as-predicted' | 'less-matched' | 'better-matched' | 'too-few-units';
  sentence: string;
}

/** Lot statistics at one frequency. */
export interface LotFrequencySummary {
  frequencyHz: number;
  /** Mask limit here, dB; null outside the mask. */
  limitDb: number | null;
  readings: LotUnitReading[];
  resolvedCount: number;
  boundCount: number;
  missingCount: number;
  /** Over resolved readings only (see summariseLot), dB; null without resolved readings. */
  meanDb: number | null;
  /** Sample standard deviation (n − 1), dB; null below 2 resolved readings. */
  standardDeviationDb: number | null;
  minimumDb: number | null;
  p05Db: number | null;
  p95Db: number | null;
  /** (mean − LSL)/(3s), NIST/SEMATECH e-Handbook §6.1.6; null without a limit or below 2 resolved readings or s = 0. */
  cpk: number | null;
  outliers: LotOutlier[];
  spread: SpreadComparison | null;
}

/** One unit's verdict over the whole mask. */
export interface LotUnitVerdict {
  sessionId: string;
  unitSerial: string;
  /** checkAgainstLimitMask over the unit's measured points with the mask's guard band. */
  outcome: LimitOutcome;
  tightestMarginDb: number | null;
  tightestFrequencyHz: number | null;
  /** True when the tightest point is a lower bound (its true margin is at least this). */
  tightestIsLowerBound: boolean;
  /** Summary frequencies where this unit is an outlier. */
  outlierFrequenciesHz: number[];
}

/** Result of {@link summariseLot}. */
export interface LotSummary {
  frequencies: LotFrequencySummary[];
  units: LotUnitVerdict[];
  counts: Record<LimitOutcome, number>;
  /** Counts of unit verdicts in words. */
  verdictSentence: string;
  /** "Are our parts as matched as we think?", when a band was given. */
  spreadSentence: string | null;
}

/** Options of {@link summariseLot}. */
export interface LotSummaryOptions {
  /** Frequencies to summarise besides the mask's corners, Hz. */
  frequenciesHz?: readonly number[];
}

/** Modified z-score threshold of Iglewicz and Hoaglin (1993), as quoted in the NIST/SEMATECH e-Handbook §1.3.5.17. */
export const MODIFIED_Z_OUTLIER_THRESHOLD = 3.5;
/** One-sided significance for "more units below the predicted 5th percentile than chance allows" (common practice, no source). */
const BELOW_BAND_SIGNIFICANCE = 0.05;
/** A measured spread under half the predicted one counts as better matched (common practice, no source). */
const NARROW_SPREAD_RATIO = 0.5;
const MINIMUM_UNITS_FOR_SPREAD = 5;

function formatHz(frequencyHz: number): string {
  if (frequencyHz >= 1e6) return `${Number((frequencyHz / 1e6).toPrecision(3))} MHz`;
  if (frequencyHz >= 1e3) return `${Number((frequencyHz / 1e3).toPrecision(3))} kHz`;
  return `${Number(frequencyHz.toPrecision(3))} Hz`;
}

/** P(X ≥ k) for X ~ Binomial(n, p), summed directly (n is a lot size: small). */
export function binomialUpperTail(k: number, n: number, p: number): number {
  if (k <= 0) return 1;
  if (k > n) return 0;
  let term = (1 - p) ** n; // P(X = 0)
  let below = 0;
  for (let x = 0; x < k; x++) {
    below += term;
    term *= ((n - x) / (x + 1)) * (p / (1 - p));
  }
  return Math.max(0, 1 - below);
}

function modifiedZOutliers(readings: LotUnitReading[]): LotOutlier[] {
  const resolved = readings.filter((reading) => reading.cmrrDb !== null && !reading.lowerBound);
  if (resolved.length < 3) return [];
  const values = resolved.map((reading) => reading.cmrrDb as number);
  const center = median(values);
  const mad = median(values.map((value) => Math.abs(value - center)));
  // With MAD = 0 (half the units identical) the score is undefined: flag nothing rather than everything.
  if (mad === 0) return [];
  return resolved.flatMap((reading) => {
    const modifiedZ = (0.6745 * ((reading.cmrrDb as number) - center)) / mad;
    if (Math.abs(modifiedZ) <= MODIFIED_Z_OUTLIER_THRESHOLD) return [];
    return [{ sessionId: reading.sessionId, unitSerial: reading.unitSerial, cmrrDb: reading.cmrrDb as number, modifiedZ, direction: modifiedZ < 0 ? 'low' : 'high' }];
  });
}

function bandAt(band: readonly MonteCarloBandPoint[], frequencyHz: number): { p05Db: number; p50Db: number; p95Db: number } | null {
  const sorted = [...band].sort((a, b) => a.frequencyHz - b.frequencyHz).filter((point) => point.frequencyHz > 0);
  const frequencies = sorted.map((point) => point.frequencyHz);
  const p05Db = interpolateLevelOnLogFrequency(frequencies, sorted.map((point) => point.p05Db), frequencyHz);
  const p50Db = interpolateLevelOnLogFrequency(frequencies, sorted.map((point) => point.p50Db), frequencyHz);
  const p95Db = interpolateLevelOnLogFrequency(frequencies, sorted.map((point) => point.p95Db), frequencyHz);
  return p05Db === null || p50Db === null || p95Db === null ? null : { p05Db, p50Db, p95Db };
}

function compareSpread(frequencyHz: number, readings: LotUnitReading[], predicted: { p05Db: number; p50Db: number; p95Db: number }): SpreadComparison {
  const resolved = readings.filter((reading) => reading.cmrrDb !== null && !reading.lowerBound).map((reading) => reading.cmrrDb as number);
  // A bound above the band's 5th percentile is certainly not below it; a bound below it says nothing.
  const boundsAbove = readings.filter((reading) => reading.lowerBound && reading.cmrrDb !== null && reading.cmrrDb >= predicted.p05Db).length;
  const belowBandCount = resolved.filter((value) => value < predicted.p05Db).length;
  const consideredCount = resolved.length + boundsAbove;
  const belowBandTailProbability = binomialUpperTail(belowBandCount, consideredCount, 0.05);
  const predictedSpreadDb = predicted.p95Db - predicted.p05Db;
  const where = `At ${formatHz(frequencyHz)}`;
  if (resolved.length < MINIMUM_UNITS_FOR_SPREAD) {
    return {
      predictedP05Db: predicted.p05Db,
      predictedP50Db: predicted.p50Db,
      predictedP95Db: predicted.p95Db,
      measuredSpreadDb: null,
      predictedSpreadDb,
      medianOffsetDb: resolved.length > 0 ? median(resolved) - predicted.p50Db : 0,
      belowBandCount,
      consideredCount,
      belowBandTailProbability,
      assessment: 'too-few-units',
      sentence: `${where} only ${resolved.length} unit(s) have resolved readings: too few to compare the spread with the prediction (at least ${MINIMUM_UNITS_FOR_SPREAD}).`,
    };
  }
  const [p05, p95] = linearPercentiles(resolved, [5, 95]);
  const measuredSpreadDb = p95 - p05;
  const medianOffsetDb = median(resolved) - predicted.p50Db;
  const spreadWords = `the measured 5–95 % spread is ${measuredSpreadDb.toFixed(1)} dB against ${predictedSpreadDb.toFixed(1)} dB predicted, median ${Math.abs(medianOffsetDb).toFixed(1)} dB ${medianOffsetDb >= 0 ? 'above' : 'below'} the prediction`;
  let assessment: SpreadComparison['assessment'];
  let conclusion: string;
  if (belowBandTailProbability < BELOW_BAND_SIGNIFICANCE) {
    assessment = 'less-matched';
    conclusion = `${belowBandCount} of ${consideredCount} units fall below the predicted 5th percentile (about ${(0.05 * consideredCount).toFixed(1)} expected): the parts are less matched than the tolerances say, or the fixture adds imbalance.`;
  } else if (measuredSpreadDb < NARROW_SPREAD_RATIO * predictedSpreadDb && medianOffsetDb >= 0) {
    assessment = 'better-matched';
    conclusion = 'the parts are better matched than their rating (common with resistor networks).';
  } else {
    assessment = 'as-predicted';
    conclusion = 'the parts are as matched as the tolerances suggest.';
  }
  return {
    predictedP05Db: predicted.p05Db,
    predictedP50Db: predicted.p50Db,
    predictedP95Db: predicted.p95Db,
    measuredSpreadDb,
    predictedSpreadDb,
    medianOffsetDb,
    belowBandCount,
    consideredCount,
    belowBandTailProbability,
    assessment,
    sentence: `${where} ${spreadWords}: ${conclusion}`,
  };
}

/**
 * Summarises a lot (issue 5, "Lot view") at the mask's corner frequencies and any extra
 * frequencies:
 *
 * - each unit's CMRR is interpolated linearly in dB against log10(f) between its two neighbouring
 *   points (never extrapolated: a unit not measured across a frequency is counted as missing);
 * - lower bounds (floor-limited points, or interpolations touching one) are counted and judged
 *   but left out of mean, σ, minimum, percentiles, Cpk and the outlier test: they are censored
 *   values, and since a unit reaches its floor only when its rejection is high, leaving them out
 *   makes the statistics pessimistic, never flattering;
 * - mean, sample σ, minimum and Cpk = (mean − LSL)/(3σ) against the mask's limit come from the
 *   engine's lotStatistics (NIST/SEMATECH e-Handbook §6.1.6); 5th/95th percentiles are numpy's
 *   default linear ones;
 * - outliers: modified z-score 0.6745·(x − median)/MAD beyond ±3.5 (Iglewicz and Hoaglin 1993,
 *   NIST/SEMATECH e-Handbook §1.3.5.17), with at least 3 resolved readings; MAD = 0 flags none;
 * - each unit's verdict is checkAgainstLimitMask over its own measured points with the mask's
 *   guard band (ILAC-G8), with its tightest margin;
 * - with a predicted Monte Carlo band (monteCarloCmrrBand, interpolated on log-f): the measured
 *   5–95 % spread against the predicted one, the median offset, and how many units fall below the
 *   predicted 5th percentile against the Binomial(n, 0.05) expectation (one-sided, 5 %).
 *
 * Cost O(units · (points + frequencies)).
 *
 * @param units the lot's units with their paired points
 * @param mask the revision's limit mask (frequencies Hz, minimum CMRR dB, guard band dB)
 * @param band optional predicted band (the result of monteCarloCmrrBand or its points)
 * @param options extra frequencies to summarise, Hz
 * @throws EngineInputError for no units, a bad mask (naming the mask point), a bad guard band or extra frequency
 * @example summariseLot(units, revision.limitMask, band).frequencies[0].cpk // → 1.4
 */
export function summariseLot(
  units: readonly LotUnit[],
  mask: LotMask,
  band?: MonteCarloBand | readonly MonteCarloBandPoint[],
  options: LotSummaryOptions = {},
): LotSummary {
  if (units.length === 0) throw new EngineInputError('summariseLot requires at least one unit', { field: 'units' });
  validateLimitMask(mask, 'summariseLot');
  const guardBandDb = mask.guardBandDb ?? 0;
  if (!Number.isFinite(guardBandDb) || guardBandDb < 0) {
    throw new EngineInputError(`summariseLot requires a finite guard band of at least 0 dB, got ${guardBandDb}`, { field: 'guardBandDb' });
  }
  (options.frequenciesHz ?? []).forEach((frequencyHz, index) => {
    if (!Number.isFinite(frequencyHz) || frequencyHz <= 0) {
      throw new EngineInputError(`summariseLot requires extra frequencies above 0 Hz (entry ${index + 1}), got ${frequencyHz}`, {
        field: 'frequenciesHz',
        column: index + 1,
      });
    }
  });
  const bandPoints = band === undefined ? null : Array.isArray(band) ? (band as readonly MonteCarloBandPoint[]) : (band as MonteCarloBand).points;
  const frequencies = [...new Set([...mask.points.map((point) => point.frequencyHz), ...(options.frequenciesHz ?? [])])].sort((a, b) => a - b);

  const summaries = frequencies.map((frequencyHz): LotFrequencySummary => {
    const limitDb = evaluateLimitMask(mask, frequencyHz);
    const readings = units.map((unit): LotUnitReading => {
      const value = interpolateCmrrAtFrequency(unit.points, frequencyHz);
      return { sessionId: unit.sessionId, unitSerial: unit.unitSerial, cmrrDb: value?.cmrrDb ?? null, lowerBound: value?.lowerBound ?? false };
    });
    const resolved = readings.filter((reading) => reading.cmrrDb !== null && !reading.lowerBound).map((reading) => reading.cmrrDb as number);
    const boundCount = readings.filter((reading) => reading.cmrrDb !== null && reading.lowerBound).length;
    const statistics = resolved.length > 0 ? lotStatistics(resolved, limitDb ?? undefined) : null;
    const [p05Db, p95Db] = resolved.length > 0 ? linearPercentiles(resolved, [5, 95]) : [null, null];
    const predicted = bandPoints ? bandAt(bandPoints, frequencyHz) : null;
    return {
      frequencyHz,
      limitDb,
      readings,
      resolvedCount: resolved.length,
      boundCount,
      missingCount: readings.length - resolved.length - boundCount,
      meanDb: statistics?.meanDb ?? null,
      standardDeviationDb: statistics?.standardDeviationDb ?? null,
      minimumDb: statistics?.minimumDb ?? null,
      p05Db,
      p95Db,
      cpk: statistics?.cpk ?? null,
      outliers: modifiedZOutliers(readings),
      spread: predicted ? compareSpread(frequencyHz, readings, predicted) : null,
    };
  });

  const counts: Record<LimitOutcome, number> = { pass: 0, fail: 0, indeterminate: 0, 'outside-mask': 0 };
  const verdicts = units.map((unit): LotUnitVerdict => {
    const check = unit.points.length > 0 ? checkAgainstLimitMask(unit.points, mask, guardBandDb) : null;
    const outcome: LimitOutcome = check?.overall ?? 'outside-mask';
    counts[outcome]++;
    let tightest: { marginDb: number; frequencyHz: number; lowerBound: boolean } | null = null;
    for (const decision of check?.decisions ?? []) {
      if (decision.marginDb === null) continue;
      if (tightest === null || decision.marginDb < tightest.marginDb) {
        tightest = { marginDb: decision.marginDb, frequencyHz: decision.frequencyHz, lowerBound: decision.lowerBound ?? false };
      }
    }
    return {
      sessionId: unit.sessionId,
      unitSerial: unit.unitSerial,
      outcome,
      tightestMarginDb: tightest?.marginDb ?? null,
      tightestFrequencyHz: tightest?.frequencyHz ?? null,
      tightestIsLowerBound: tightest?.lowerBound ?? false,
      outlierFrequenciesHz: summaries
        .filter((summary) => summary.outliers.some((outlier) => outlier.sessionId === unit.sessionId))
        .map((summary) => summary.frequencyHz),
    };
  });

  const parts = [`${counts.pass} pass`, `${counts.fail} fail`];
  if (counts.indeterminate > 0) parts.push(`${counts.indeterminate} indeterminate`);
  if (counts['outside-mask'] > 0) parts.push(`${counts['outside-mask']} outside the mask`);
  const verdictSentence = `${units.length} unit${units.length === 1 ? '' : 's'}: ${parts.join(', ')}.`;

  let spreadSentence: string | null = null;
  const comparisons = summaries.map((summary) => summary.spread).filter((spread): spread is SpreadComparison => spread !== null);
  if (comparisons.length > 0) {
    const lessMatched = comparisons.find((spread) => spread.assessment === 'less-matched');
    const judged = comparisons.filter((spread) => spread.assessment !== 'too-few-units');
    if (lessMatched) spreadSentence = `Not as matched as we think. ${lessMatched.sentence}`;
    else if (judged.length === 0) spreadSentence = comparisons[0].sentence;
    else if (judged.every((spread) => spread.assessment === 'better-matched')) spreadSentence = `Better matched than we think. ${judged[0].sentence}`;
    else spreadSentence = `As matched as we think. ${judged[0].sentence}`;
  }
  return { frequencies: summaries, units: verdicts, counts, verdictSentence, spreadSentence };
}
