// Predicted gains of the four-resistor difference amplifier, with source
// resistances and a single-pole op-amp of finite, frequency-dependent
// common-mode rejection (the model of DOMAIN.md, "Op-amp model used for
// predictions").
import {
  addComplex,
  complex,
  divideComplex,
  magnitudeComplex,
  scaleComplex,
  subtractComplex,
  type Complex,
} from './complex';
import { EngineInputError } from './errors';

/** The resistor network. `R1` and `R2` set the inverting path, `R3` and `R4` the non-inverting one. */
export interface DifferenceAmplifierResistors {
  /** Input resistor of the inverting path (from `v1`), ohms. */
  r1Ohms: number;
  /** Feedback resistor from the output to the inverting input, ohms. */
  r2Ohms: number;
  /** Input resistor of the non-inverting path (from `v2`), ohms. */
  r3Ohms: number;
  /** Resistor from the non-inverting input to the reference (ground), ohms. */
  r4Ohms: number;
  /** Source resistance of the `v1` source, in series with `R1`, ohms (default 0). */
  sourceResistance1Ohms?: number;
  /** Source resistance of the `v2` source, in series with `R3`, ohms (default 0). */
  sourceResistance2Ohms?: number;
}

/**
 * Single-pole op-amp data: `A(f) = A0 / (1 + j·f·A0/GBW)` and
 * `CMRRoa(f) = CMRRdc / (1 + j·f/fcm)`; the output is
 * `A(f)·(v+ − v− + sign·((v+ + v−)/2)/CMRRoa(f))`.
 */
export interface OpAmpModel {
  /** Open-loop dc gain A0, dB (must be above 0 dB). */
  openLoopGainDb: number;
  /** Gain-bandwidth product GBW, Hz. */
  gainBandwidthHz: number;
  /** Op-amp dc common-mode rejection CMRRdc, dB. */
  cmrrDb: number;
  /** Corner frequency fcm above which the op-amp's rejection falls 20 dB/decade, Hz. */
  cmrrCornerHz: number;
}

/**
 * Sign of the op-amp's own common-mode term: +1 as DOMAIN.md writes it, −1 for
 * the opposite sign (real parts do not say which one they have).
 */
export type OpAmpTermSign = 1 | -1;

/** Complex closed-loop gains at one frequency. */
export interface DifferenceAmplifierGains {
  /** Ad = vout / vd with `v1 = −vd/2`, `v2 = +vd/2`. */
  differentialGain: Complex;
  /** Acm = vout / vcm with `v1 = v2 = vcm`. */
  commonModeGain: Complex;
}

/** One predicted frequency point. */
export interface DifferenceAmplifierPrediction extends DifferenceAmplifierGains {
  frequencyHz: number;
  /** 20·log10|Ad|, dB. */
  adDb: number;
  /** 20·log10|Acm|, dB (−Infinity when Acm is exactly 0). */
  acmDb: number;
  /** 20·log10|Ad/Acm| with the op-amp term as written (sign +1), dB (Infinity when Acm is 0). */
  cmrrDb: number;
  /** CMRR with the op-amp term's sign reversed, dB. */
  cmrrOppositeSignDb: number;
  /** 20·log10|Ad| with the op-amp term's sign reversed, dB. */
  adOppositeSignDb: number;
  /** 20·log10|Acm| with the op-amp term's sign reversed, dB. */
  acmOppositeSignDb: number;
  /** The lower of the two signs' CMRR, dB: the band's pessimistic edge. */
  cmrrBandLowDb: number;
  /** The higher of the two signs' CMRR, dB. */
  cmrrBandHighDb: number;
}

/**
 * The op-amp's response at one frequency in the form the node equations use:
 * `1/A(f) = 1/A0 + j·f/GBW` and `1/CMRRoa(f) = (1 + j·f/fcm)/CMRRdc`; both are
 * zero for an ideal op-amp (no data).
 */
export interface OpAmpResponse {
  inverseOpenLoopGain: Complex;
  inverseRejection: Complex;
}

/** 20·log10(x) for a magnitude, dB. */
export function magnitudeToDb(magnitude: number): number {
  return 20 * Math.log10(magnitude);
}

/** 10^(dB/20), the magnitude of a level in dB. */
export function dbToMagnitude(levelDb: number): number {
  return 10 ** (levelDb / 20);
}

function requireFinite(functionName: string, field: string, value: number, minimum: number, inclusive: boolean, unit: string): void {
  const ok = Number.isFinite(value) && (inclusive ? value >= minimum : value > minimum);
  if (!ok) {
    const bound = inclusive ? `at least ${minimum}` : `above ${minimum}`;
    throw new EngineInputError(`${functionName} requires ${field} to be a finite number ${bound} ${unit}, got ${value}`, { field });
  }
}

/**
 * Checks a resistor network: R1…R4 positive and finite, source resistances
 * zero or positive and finite.
 * @throws EngineInputError naming the field (e.g. "r3Ohms")
 */
export function validateDifferenceAmplifierResistors(resistors: DifferenceAmplifierResistors, functionName = 'differenceAmplifierGains'): void {
  for (const field of ['r1Ohms', 'r2Ohms', 'r3Ohms', 'r4Ohms'] as const) {
    requireFinite(functionName, field, resistors[field], 0, false, 'ohms');
  }
  for (const field of ['sourceResistance1Ohms', 'sourceResistance2Ohms'] as const) {
    const value = resistors[field];
    if (value !== undefined) requireFinite(functionName, field, value, 0, true, 'ohms');
  }
}

/**
 * Checks op-amp data: open-loop gain above 0 dB, GBW and corner positive, all finite.
 * @throws EngineInputError naming the missing or bad field (e.g. "gainBandwidthHz")
 */
export function validateOpAmpModel(opAmp: OpAmpModel, functionName = 'differenceAmplifierGains', prefix = ''): void {
  for (const field of ['openLoopGainDb', 'gainBandwidthHz', 'cmrrDb', 'cmrrCornerHz'] as const) {
    const value = opAmp[field] as number | undefined;
    if (value === undefined) {
      throw new EngineInputError(`${functionName}: op-amp data is incomplete, ${prefix}${field} is missing (give all four values, or none for an ideal op-amp)`, {
        field: `${prefix}${field}`,
      });
    }
  }
  requireFinite(functionName, `${prefix}openLoopGainDb`, opAmp.openLoopGainDb, 0, false, 'dB');
  requireFinite(functionName, `${prefix}gainBandwidthHz`, opAmp.gainBandwidthHz, 0, false, 'Hz');
  requireFinite(functionName, `${prefix}cmrrDb`, opAmp.cmrrDb, -Infinity, false, 'dB');
  requireFinite(functionName, `${prefix}cmrrCornerHz`, opAmp.cmrrCornerHz, 0, false, 'Hz');
}

/**
 * `1/A(f)` and `1/CMRRoa(f)` of the single-pole model at one frequency, or zeros
 * for an ideal op-amp. Source: DOMAIN.md op-amp model. O(1).
 *
 * @param frequencyHz frequency, Hz (0 for dc)
 * @param opAmp op-amp data, or undefined for an ideal op-amp
 * @example opAmpResponse(1000, { openLoopGainDb: 120, gainBandwidthHz: 1e6, cmrrDb: 100, cmrrCornerHz: 1e3 })
 *   // → { inverseOpenLoopGain: 1e-6 + 1e-3j, inverseRejection: 1e-5 + 1e-5j }
 */
export function opAmpResponse(frequencyHz: number, opAmp?: OpAmpModel): OpAmpResponse {
  if (!opAmp) return { inverseOpenLoopGain: complex(0), inverseRejection: complex(0) };
  const inverseDcGain = 1 / dbToMagnitude(opAmp.openLoopGainDb);
  const inverseDcRejection = 1 / dbToMagnitude(opAmp.cmrrDb);
  return {
    inverseOpenLoopGain: complex(inverseDcGain, frequencyHz / opAmp.gainBandwidthHz),
    inverseRejection: complex(inverseDcRejection, (inverseDcRejection * frequencyHz) / opAmp.cmrrCornerHz),
  };
}

/**
 * The weights of the op-amp law `vout·(1/A) = kPlus·v+ − kMinus·v−`, where
 * `kPlus = 1 + sign/(2·CMRRoa)` and `kMinus = 1 − sign/(2·CMRRoa)` (the model's
 * `v+ − v− + sign·((v+ + v−)/2)/CMRRoa` regrouped per input).
 */
export function opAmpInputWeights(response: OpAmpResponse, sign: OpAmpTermSign): { plusWeight: Complex; minusWeight: Complex } {
  const half = scaleComplex(response.inverseRejection, sign / 2);
  return { plusWeight: addComplex(complex(1), half), minusWeight: subtractComplex(complex(1), half) };
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

/**
 * The output of the difference amplifier for inputs `v1` (through Rs1 + R1 to
 * the inverting input) and `v2` (through Rs2 + R3, with R4 to ground, to the
 * non-inverting input). Node equations: `v+ = v2·R4/(Rs2 + R3 + R4)`,
 * `v− = α·v1 + β·vout` with `α = R2/(R1' + R2)`, `β = R1'/(R1' + R2)`,
 * `R1' = Rs1 + R1`; with the op-amp law this gives
 * `vout = (kPlus·v+ − kMinus·α·v1) / (1/A + kMinus·β)`.
 */
function differenceAmplifierOutput(
  resistors: DifferenceAmplifierResistors,
  response: OpAmpResponse,
  sign: OpAmpTermSign,
  input1: number,
  input2: number,
): Complex {
  const invertingInputOhms = resistors.r1Ohms + (resistors.sourceResistance1Ohms ?? 0);
  const nonInvertingInputOhms = resistors.r3Ohms + (resistors.sourceResistance2Ohms ?? 0);
  const plusVoltage = (input2 * resistors.r4Ohms) / (nonInvertingInputOhms + resistors.r4Ohms);
  const alpha = resistors.r2Ohms / (invertingInputOhms + resistors.r2Ohms);
  const beta = invertingInputOhms / (invertingInputOhms + resistors.r2Ohms);
  const { plusWeight, minusWeight } = opAmpInputWeights(response, sign);
  const numerator = subtractComplex(scaleComplex(plusWeight, plusVoltage), scaleComplex(minusWeight, alpha * input1));
  const denominator = addComplex(response.inverseOpenLoopGain, scaleComplex(minusWeight, beta));
  return divideComplex(numerator, denominator);
}

/**
 * Complex differential and common-mode gains of the four-resistor difference
 * amplifier at one frequency, from the node equations with the single-pole
 * op-amp model (DOMAIN.md). With an ideal op-amp this is the textbook
 * `vout = (1 + R2/R1)·R4/(R3 + R4)·v2 − (R2/R1)·v1` (source resistances added to
 * R1 and R3). O(1).
 *
 * @param resistors R1…R4 and the source resistances, ohms
 * @param frequencyHz frequency, Hz (0 for dc; default 0)
 * @param opAmp op-amp data; undefined means an ideal op-amp
 * @param sign sign of the op-amp's own common-mode term (+1 as written, default)
 * @throws EngineInputError for a non-positive resistance, a negative frequency or bad op-amp data
 * @example differenceAmplifierGains({ r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100e3 })
 *   // → { differentialGain: 10 + 0j, commonModeGain: 0 + 0j }
 */
export function differenceAmplifierGains(
  resistors: DifferenceAmplifierResistors,
  frequencyHz = 0,
  opAmp?: OpAmpModel,
  sign: OpAmpTermSign = 1,
): DifferenceAmplifierGains {
  validateDifferenceAmplifierResistors(resistors);
  if (opAmp) validateOpAmpModel(opAmp);
  checkFrequency('differenceAmplifierGains', frequencyHz);
  const response = opAmpResponse(frequencyHz, opAmp);
  return {
    differentialGain: differenceAmplifierOutput(resistors, response, sign, -0.5, 0.5),
    commonModeGain: differenceAmplifierOutput(resistors, response, sign, 1, 1),
  };
}

/**
 * Transfer from each input to the output, `vout = h1·v1 + h2·v2`, at one
 * frequency (used by the instrumentation amplifier's second stage). O(1).
 * Inputs are assumed valid (see differenceAmplifierGains).
 */
export function differenceAmplifierTransfers(
  resistors: DifferenceAmplifierResistors,
  response: OpAmpResponse,
  sign: OpAmpTermSign,
): { fromInput1: Complex; fromInput2: Complex } {
  return {
    fromInput1: differenceAmplifierOutput(resistors, response, sign, 1, 0),
    fromInput2: differenceAmplifierOutput(resistors, response, sign, 0, 1),
  };
}

/** Packs complex gains of both signs into a prediction point. */
export function toPrediction(
  frequencyHz: number,
  asWritten: DifferenceAmplifierGains,
  oppositeSign: DifferenceAmplifierGains,
): DifferenceAmplifierPrediction {
  const differentialMagnitude = magnitudeComplex(asWritten.differentialGain);
  const commonModeMagnitude = magnitudeComplex(asWritten.commonModeGain);
  const cmrrDb = magnitudeToDb(differentialMagnitude / commonModeMagnitude);
  const oppositeDifferentialMagnitude = magnitudeComplex(oppositeSign.differentialGain);
  const oppositeCommonModeMagnitude = magnitudeComplex(oppositeSign.commonModeGain);
  const cmrrOppositeSignDb = magnitudeToDb(oppositeDifferentialMagnitude / oppositeCommonModeMagnitude);
  return {
    frequencyHz,
    differentialGain: asWritten.differentialGain,
    commonModeGain: asWritten.commonModeGain,
    adDb: magnitudeToDb(differentialMagnitude),
    acmDb: magnitudeToDb(commonModeMagnitude),
    cmrrDb,
    cmrrOppositeSignDb,
    adOppositeSignDb: magnitudeToDb(oppositeDifferentialMagnitude),
    acmOppositeSignDb: magnitudeToDb(oppositeCommonModeMagnitude),
    cmrrBandLowDb: Math.min(cmrrDb, cmrrOppositeSignDb),
    cmrrBandHighDb: Math.max(cmrrDb, cmrrOppositeSignDb),
  };
}

/**
 * Predicted Ad, Acm and CMRR of the difference amplifier over frequency, for
 * both signs of the op-amp's own common-mode term (the band between them is
 * what the op-amp data can promise). Source: node equations with the DOMAIN.md
 * op-amp model. O(number of frequencies).
 *
 * @param frequenciesHz frequencies, Hz (finite, ≥ 0; any order, kept as given)
 * @param resistors R1…R4 and source resistances, ohms
 * @param opAmp op-amp data; undefined means an ideal op-amp (both signs then agree)
 * @returns one point per frequency: complex gains, adDb, acmDb, cmrrDb, cmrrOppositeSignDb and the band
 * @throws EngineInputError for bad resistances, op-amp data or frequencies (naming the entry)
 * @example predictDifferenceAmplifier([1000], { r1Ohms: 1e3, r2Ohms: 1e3, r3Ohms: 1e3, r4Ohms: 1.01e3 })[0].cmrrDb // → 46.09
 */
export function predictDifferenceAmplifier(
  frequenciesHz: readonly number[],
  resistors: DifferenceAmplifierResistors,
  opAmp?: OpAmpModel,
): DifferenceAmplifierPrediction[] {
  validateDifferenceAmplifierResistors(resistors, 'predictDifferenceAmplifier');
  if (opAmp) validateOpAmpModel(opAmp, 'predictDifferenceAmplifier');
  if (frequenciesHz.length === 0) {
    throw new EngineInputError('predictDifferenceAmplifier requires at least one frequency', { field: 'frequencyHz' });
  }
  frequenciesHz.forEach((frequencyHz, index) => checkFrequency('predictDifferenceAmplifier', frequencyHz, index));
  return frequenciesHz.map((frequencyHz) => {
    const response = opAmpResponse(frequencyHz, opAmp);
    const gainsFor = (sign: OpAmpTermSign): DifferenceAmplifierGains => ({
      differentialGain: differenceAmplifierOutput(resistors, response, sign, -0.5, 0.5),
      commonModeGain: differenceAmplifierOutput(resistors, response, sign, 1, 1),
    });
    return toPrediction(frequencyHz, gainsFor(1), gainsFor(-1));
  });
}
