// Predicted gains of the three-op-amp instrumentation amplifier: two
// non-inverting input op-amps joined by RG (each with its feedback resistor RF),
// followed by the four-resistor difference amplifier. Every op-amp follows the
// single-pole model of DOMAIN.md, with its own data and sign.
import { complex, magnitudeComplex, multiplyComplex, addComplex, solveComplexLinearSystem, type Complex } from './complex';
import {
  differenceAmplifierTransfers,
  magnitudeToDb,
  opAmpInputWeights,
  opAmpResponse,
  validateDifferenceAmplifierResistors,
  validateOpAmpModel,
  dbToMagnitude,
  type DifferenceAmplifierResistors,
  type OpAmpModel,
  type OpAmpTermSign,
} from './difference-amplifier';
import { EngineInputError } from './errors';

/** The resistors. The input-stage op-amp on input 1 drives the difference stage's R1 side. */
export interface InstrumentationAmplifierCircuit {
  /** Feedback resistor of the input op-amp on input 1 (output to its inverting input), ohms. */
  feedbackResistance1Ohms: number;
  /** Feedback resistor of the input op-amp on input 2, ohms. */
  feedbackResistance2Ohms: number;
  /** Gain resistor RG between the two inverting inputs, ohms. */
  gainResistanceOhms: number;
  /** The difference stage (its source resistances, if given, sit after the input op-amps' outputs). */
  differenceStage: DifferenceAmplifierResistors;
}

/** Op-amp data per amplifier; a missing entry is an ideal op-amp. */
export interface InstrumentationAmplifierOpAmps {
  input1?: OpAmpModel;
  input2?: OpAmpModel;
  difference?: OpAmpModel;
}

/** Sign of each op-amp's own common-mode term. */
export interface InstrumentationAmplifierSigns {
  input1: OpAmpTermSign;
  input2: OpAmpTermSign;
  difference: OpAmpTermSign;
}

/** Complex gains at one frequency. */
export interface InstrumentationAmplifierGains {
  /** Ad = vout / vd with `v1 = −vd/2`, `v2 = +vd/2`. */
  differentialGain: Complex;
  /** Acm = vout / vcm with `v1 = v2 = vcm`. */
  commonModeGain: Complex;
  /** (o2 − o1)/vd of the input stage. */
  inputStageDifferentialGain: Complex;
  /** ((o1 + o2)/2)/vcm of the input stage. */
  inputStageCommonModeGain: Complex;
}

/** One predicted point. */
export interface InstrumentationAmplifierPrediction extends InstrumentationAmplifierGains {
  frequencyHz: number;
  adDb: number;
  acmDb: number;
  /** CMRR with every op-amp term as written (all signs +1), dB. */
  cmrrDb: number;
  /** Lowest CMRR over the 8 sign combinations, dB. */
  cmrrBandLowDb: number;
  /** Highest CMRR over the 8 sign combinations, dB. */
  cmrrBandHighDb: number;
}

const ALL_POSITIVE: InstrumentationAmplifierSigns = { input1: 1, input2: 1, difference: 1 };

function validateCircuit(functionName: string, circuit: InstrumentationAmplifierCircuit, opAmps: InstrumentationAmplifierOpAmps): void {
  for (const field of ['feedbackResistance1Ohms', 'feedbackResistance2Ohms', 'gainResistanceOhms'] as const) {
    const value = circuit[field];
    if (!Number.isFinite(value) || value <= 0) {
      throw new EngineInputError(`${functionName} requires ${field} to be a finite number above 0 ohms, got ${value}`, { field });
    }
  }
  validateDifferenceAmplifierResistors(circuit.differenceStage, functionName);
  for (const key of ['input1', 'input2', 'difference'] as const) {
    const opAmp = opAmps[key];
    if (opAmp) validateOpAmpModel(opAmp, functionName, `${key}.`);
  }
}

function solveGains(
  circuit: InstrumentationAmplifierCircuit,
  frequencyHz: number,
  opAmps: InstrumentationAmplifierOpAmps,
  signs: InstrumentationAmplifierSigns,
): InstrumentationAmplifierGains {
  const response1 = opAmpResponse(frequencyHz, opAmps.input1);
  const response2 = opAmpResponse(frequencyHz, opAmps.input2);
  const weights1 = opAmpInputWeights(response1, signs.input1);
  const weights2 = opAmpInputWeights(response2, signs.input2);
  const feedback1Siemens = 1 / circuit.feedbackResistance1Ohms;
  const feedback2Siemens = 1 / circuit.feedbackResistance2Ohms;
  const gainSiemens = 1 / circuit.gainResistanceOhms;
  const zero = complex(0);
  // Unknowns [o1, o2, a1, a2]: op-amp outputs and their inverting inputs.
  // Rows: op-amp laws o·(1/A) + kMinus·a = kPlus·vin, then KCL at a1 and a2.
  const matrix: Complex[][] = [
    [response1.inverseOpenLoopGain, zero, weights1.minusWeight, zero],
    [zero, response2.inverseOpenLoopGain, zero, weights2.minusWeight],
    [complex(feedback1Siemens), zero, complex(-(feedback1Siemens + gainSiemens)), complex(gainSiemens)],
    [zero, complex(feedback2Siemens), complex(gainSiemens), complex(-(feedback2Siemens + gainSiemens))],
  ];
  const stageOutputs = (input1: number, input2: number): [Complex, Complex] => {
    const [output1, output2] = solveComplexLinearSystem(matrix, [
      multiplyComplex(weights1.plusWeight, complex(input1)),
      multiplyComplex(weights2.plusWeight, complex(input2)),
      zero,
      zero,
    ]);
    return [output1, output2];
  };
  const differenceResponse = opAmpResponse(frequencyHz, opAmps.difference);
  const transfers = differenceAmplifierTransfers(circuit.differenceStage, differenceResponse, signs.difference);
  const outputFor = ([output1, output2]: [Complex, Complex]): Complex =>
    addComplex(multiplyComplex(transfers.fromInput1, output1), multiplyComplex(transfers.fromInput2, output2));
  const differentialOutputs = stageOutputs(-0.5, 0.5);
  const commonModeOutputs = stageOutputs(1, 1);
  return {
    differentialGain: outputFor(differentialOutputs),
    commonModeGain: outputFor(commonModeOutputs),
    inputStageDifferentialGain: addComplex(differentialOutputs[1], complex(-differentialOutputs[0].re, -differentialOutputs[0].im)),
    inputStageCommonModeGain: complex(
      (commonModeOutputs[0].re + commonModeOutputs[1].re) / 2,
      (commonModeOutputs[0].im + commonModeOutputs[1].im) / 2,
    ),
  };
}

/**
 * Complex differential and common-mode gains of the three-op-amp
 * instrumentation amplifier at one frequency, from the node equations of all
 * three op-amps (DOMAIN.md op-amp model, each with its own data and sign).
 * With ideal op-amps the input stage has differential gain `1 + (RF1 + RF2)/RG`
 * and common-mode gain 1 (textbook, from memory). O(1) (a 4×4 complex solve).
 *
 * @param circuit RF1, RF2, RG and the difference-stage resistors, ohms
 * @param frequencyHz frequency, Hz (0 for dc; default 0)
 * @param opAmps op-amp data per amplifier; missing means ideal
 * @param signs sign of each op-amp's common-mode term (default all +1)
 * @throws EngineInputError for non-positive resistances, bad op-amp data or a negative frequency
 * @example instrumentationAmplifierGains({ feedbackResistance1Ohms: 4950, feedbackResistance2Ohms: 4950,
 *   gainResistanceOhms: 100, differenceStage: { r1Ohms: 10e3, r2Ohms: 10e3, r3Ohms: 10e3, r4Ohms: 10e3 } })
 *   .differentialGain // → 100 + 0j
 */
export function instrumentationAmplifierGains(
  circuit: InstrumentationAmplifierCircuit,
  frequencyHz = 0,
  opAmps: InstrumentationAmplifierOpAmps = {},
  signs: InstrumentationAmplifierSigns = ALL_POSITIVE,
): InstrumentationAmplifierGains {
  validateCircuit('instrumentationAmplifierGains', circuit, opAmps);
  if (!Number.isFinite(frequencyHz) || frequencyHz < 0) {
    throw new EngineInputError(`instrumentationAmplifierGains requires a finite frequency that is not negative, got ${frequencyHz}`, {
      field: 'frequencyHz',
    });
  }
  return solveGains(circuit, frequencyHz, opAmps, signs);
}

function cmrrOf(gains: InstrumentationAmplifierGains): number {
  return magnitudeToDb(magnitudeComplex(gains.differentialGain) / magnitudeComplex(gains.commonModeGain));
}

/**
 * Predicted Ad, Acm and CMRR of the instrumentation amplifier over frequency,
 * with the band of CMRR over the 8 sign combinations of the three op-amps'
 * own common-mode terms. O(8 · number of frequencies).
 *
 * @param frequenciesHz frequencies, Hz (finite, ≥ 0)
 * @param circuit resistors, ohms
 * @param opAmps op-amp data per amplifier; missing means ideal
 * @throws EngineInputError for bad resistances, op-amp data or frequencies (naming the entry)
 * @example predictInstrumentationAmplifier([100], { feedbackResistance1Ohms: 4950, feedbackResistance2Ohms: 4950, gainResistanceOhms: 100,
 *   differenceStage: { r1Ohms: 1e3, r2Ohms: 1e3, r3Ohms: 1e3, r4Ohms: 1.01e3 } })[0].cmrrDb // → 86.09
 */
export function predictInstrumentationAmplifier(
  frequenciesHz: readonly number[],
  circuit: InstrumentationAmplifierCircuit,
  opAmps: InstrumentationAmplifierOpAmps = {},
): InstrumentationAmplifierPrediction[] {
  validateCircuit('predictInstrumentationAmplifier', circuit, opAmps);
  if (frequenciesHz.length === 0) {
    throw new EngineInputError('predictInstrumentationAmplifier requires at least one frequency', { field: 'frequencyHz' });
  }
  frequenciesHz.forEach((frequencyHz, index) => {
    if (!Number.isFinite(frequencyHz) || frequencyHz < 0) {
      throw new EngineInputError(
        `predictInstrumentationAmplifier requires frequencies that are finite and not negative (entry ${index + 1}), got ${frequencyHz}`,
        { field: 'frequencyHz', column: index + 1 },
      );
    }
  });
  const signChoices: OpAmpTermSign[] = [1, -1];
  return frequenciesHz.map((frequencyHz) => {
    const asWritten = solveGains(circuit, frequencyHz, opAmps, ALL_POSITIVE);
    let lowDb = Infinity;
    let highDb = -Infinity;
    for (const input1 of signChoices) {
      for (const input2 of signChoices) {
        for (const difference of signChoices) {
          const cmrrDb = cmrrOf(solveGains(circuit, frequencyHz, opAmps, { input1, input2, difference }));
          lowDb = Math.min(lowDb, cmrrDb);
          highDb = Math.max(highDb, cmrrDb);
        }
      }
    }
    return {
      frequencyHz,
      ...asWritten,
      adDb: magnitudeToDb(magnitudeComplex(asWritten.differentialGain)),
      acmDb: magnitudeToDb(magnitudeComplex(asWritten.commonModeGain)),
      cmrrDb: cmrrOf(asWritten),
      cmrrBandLowDb: lowDb,
      cmrrBandHighDb: highDb,
    };
  });
}

/**
 * Textbook estimate of an instrumentation amplifier's CMRR (from memory,
 * textbook): the difference stage's rejection is multiplied by the input-stage
 * gain, while the mismatch between the two input op-amps' own rejection adds
 * directly: `1/CMRR ≈ 1/(G1·CMRRds) + |1/CMRR1 − 1/CMRR2|` (magnitudes added,
 * the pessimistic phase; op-amp terms of the same sign). O(1).
 *
 * @param inputStageGain G1 = 1 + 2·RF/RG (≥ 1)
 * @param differenceStageCmrrDb CMRR of the difference stage alone, dB
 * @param inputOpAmp1CmrrDb, inputOpAmp2CmrrDb the input op-amps' own CMRR, dB (Infinity for ideal)
 * @returns estimated CMRR, dB
 * @throws EngineInputError for a gain below 1 or a NaN level
 * @example instrumentationAmplifierCmrrEstimateDb(100, 46.09, Infinity, Infinity) // → 86.09
 */
export function instrumentationAmplifierCmrrEstimateDb(
  inputStageGain: number,
  differenceStageCmrrDb: number,
  inputOpAmp1CmrrDb = Infinity,
  inputOpAmp2CmrrDb = Infinity,
): number {
  if (!Number.isFinite(inputStageGain) || inputStageGain < 1) {
    throw new EngineInputError(`instrumentationAmplifierCmrrEstimateDb requires an input-stage gain of at least 1, got ${inputStageGain}`, {
      field: 'inputStageGain',
    });
  }
  const levels = { differenceStageCmrrDb, inputOpAmp1CmrrDb, inputOpAmp2CmrrDb };
  for (const [field, value] of Object.entries(levels)) {
    if (Number.isNaN(value)) throw new EngineInputError(`instrumentationAmplifierCmrrEstimateDb: ${field} is NaN`, { field });
  }
  const mismatch = Math.abs(1 / dbToMagnitude(inputOpAmp1CmrrDb) - 1 / dbToMagnitude(inputOpAmp2CmrrDb));
  return -magnitudeToDb(1 / (inputStageGain * dbToMagnitude(differenceStageCmrrDb)) + mismatch);
}
