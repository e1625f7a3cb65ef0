// "What tolerance do I need for X dB?" and "which preferred values give this gain?" for a design,
// from the engine's closed forms (ideal op-amps), with the in-amp's front gain taken into account.
import type { Circuit } from '../../../../shared/schemas/designs';
import { nearestResistorPairs, type ESeriesName, type ResistorPair } from '../../../../shared/engine/e-series';
import { EngineInputError } from '../../../../shared/engine/errors';
import { toleranceForTargetCmrr } from '../../../../shared/engine/resistor-tolerance';
import { designGains } from './explorer-state';

export interface ToleranceAnswer {
  stageGain: number;
  /** What the in-amp's input stage adds, dB (0 for a difference amplifier). */
  frontGainDb: number;
  /** What the difference stage's resistors must reach: target − frontGainDb, dB. */
  stageTargetDb: number;
  /** ε = (1 + G)/(4·CMRR), as a fraction: the usual first-order estimate. */
  approximationToleranceFraction: number;
  /** Largest ε whose exact 16-corner worst case still reaches the stage target. */
  worstCaseToleranceFraction: number;
  /** The op-amp's own dc CMRR when it is at or below the target: no resistor tolerance gets past it. */
  opAmpLimitDb: number | null;
}

/**
 * The resistor tolerance a design needs for a target CMRR, by the engine's toleranceForTargetCmrr
 * at the difference stage's gain R2/R1. For an instrumentation amplifier the input stage
 * multiplies the rejection by its gain 1 + (RF1 + RF2)/RG (ideal op-amps), so the stage needs
 * target − 20·log10(that gain); when that is 0 dB or less any tolerance below 50 % will do.
 *
 * @throws EngineInputError for a target that is not a finite number
 */
export function toleranceAnswer(circuit: Circuit, targetCmrrDb: number): ToleranceAnswer {
  if (!Number.isFinite(targetCmrrDb)) throw new EngineInputError(`toleranceAnswer requires a finite target in dB, got ${targetCmrrDb}`, { field: 'targetCmrrDb' });
  const { stageGain, frontGainDb } = designGains(circuit);
  const stageTargetDb = targetCmrrDb - frontGainDb;
  const opAmpLimitDb = circuit.opAmp && circuit.opAmp.cmrrDb <= targetCmrrDb ? circuit.opAmp.cmrrDb : null;
  if (stageTargetDb <= 0) {
    return { stageGain, frontGainDb, stageTargetDb, approximationToleranceFraction: 0.5, worstCaseToleranceFraction: 0.5, opAmpLimitDb };
  }
  const answer = toleranceForTargetCmrr(stageGain, stageTargetDb);
  return { stageGain, frontGainDb, stageTargetDb, ...answer, opAmpLimitDb };
}

/** The tolerance the pairs are judged at: the largest of the difference stage's R1…R4. */
export function stageToleranceFraction(circuit: Circuit): number {
  return Math.max(circuit.r1.tolerance, circuit.r2.tolerance, circuit.r3.tolerance, circuit.r4.tolerance);
}

export interface PairAnswer extends ResistorPair {
  /** The pair's exact worst case plus the in-amp's front gain, dB. */
  designWorstCaseDb: number;
  designApproximationDb: number;
}

/**
 * The nearest preferred-value pairs (IEC 60063) for a gain, R1 over one decade from 1 kΩ, each
 * with the CMRR it would give at the tolerance (worst case and approximation, plus the front gain
 * of an in-amp). O(series² · decades).
 * @throws EngineInputError for a bad gain, series or tolerance
 */
export function pairAnswers(circuit: Circuit, targetGain: number, series: ESeriesName, toleranceFraction: number, count = 6): PairAnswer[] {
  const { frontGainDb } = designGains(circuit);
  return nearestResistorPairs(targetGain, series, { count, toleranceFraction }).map((pair) => ({
    ...pair,
    designWorstCaseDb: (pair.worstCaseCmrrDb ?? Number.NaN) + frontGainDb,
    designApproximationDb: (pair.approximationCmrrDb ?? Number.NaN) + frontGainDb,
  }));
}

/** A tolerance fraction rounded down to two significant figures, in percent, for trying it in the explorer (rounding down keeps the target met). */
export function toleranceToTry(fraction: number): string {
  const percent = fraction * 100;
  const exponent = Math.floor(Math.log10(percent)) - 1;
  const rounded = Math.floor(percent / 10 ** exponent) * 10 ** exponent;
  return String(Number(rounded.toPrecision(2)));
}
