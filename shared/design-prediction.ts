// What a design revision should do, from its stored circuit: the bridge between the design
// schema (shared/schemas/designs.ts) and the engine's circuit models. Used by the server's
// analysis and by the browser's design view alike.
import type { Circuit } from './schemas/designs';
import {
  commonModeToDifferentialRatio,
  predictDifferenceAmplifier,
  predictInstrumentationAmplifier,
  type DifferenceAmplifierResistors,
  type OpAmpModel,
} from './engine';

/** One predicted frequency; levels in dB, null where the ideal model predicts no common-mode output at all. */
export interface PredictedPoint {
  frequencyHz: number;
  adDb: number;
  acmDb: number | null;
  /** CMRR with the op-amp's own term as DOMAIN.md writes it, dB. */
  cmrrDb: number | null;
  /** The band between the signs of the op-amp's own term(s), dB. */
  cmrrBandLowDb: number | null;
  cmrrBandHighDb: number | null;
}

const finiteOrNull = (value: number) => (Number.isFinite(value) ? value : null);

function opAmpModel(circuit: Circuit): OpAmpModel | undefined {
  if (!circuit.opAmp) return undefined;
  const { openLoopGainDb, gainBandwidthHz, cmrrDb, cmrrCornerHz } = circuit.opAmp;
  return { openLoopGainDb, gainBandwidthHz, cmrrDb, cmrrCornerHz };
}

/** The difference stage's nominal resistors with the source resistances in series with R1 and R3. */
export function differenceStageResistors(circuit: Circuit): DifferenceAmplifierResistors {
  return {
    r1Ohms: circuit.r1.ohms,
    r2Ohms: circuit.r2.ohms,
    r3Ohms: circuit.r3.ohms,
    r4Ohms: circuit.r4.ohms,
    sourceResistance1Ohms: circuit.topology === 'difference-amplifier' ? circuit.sourceResistance1Ohms : 0,
    sourceResistance2Ohms: circuit.topology === 'difference-amplifier' ? circuit.sourceResistance2Ohms : 0,
  };
}

/**
 * Nominal-value prediction of a design at the given frequencies (Hz): differential and
 * common-mode gain and CMRR, with the band between the op-amp-sign cases. An ideal op-amp when the
 * design has no op-amp data. O(number of frequencies).
 *
 * @throws EngineInputError when the circuit or frequencies are unusable.
 * @example predictDesign(circuit, [100, 1000])[0].cmrrDb
 */
export function predictDesign(circuit: Circuit, frequenciesHz: readonly number[]): PredictedPoint[] {
  const opAmp = opAmpModel(circuit);
  if (circuit.topology === 'difference-amplifier') {
    return predictDifferenceAmplifier(frequenciesHz, differenceStageResistors(circuit), opAmp).map((point) => ({
      frequencyHz: point.frequencyHz,
      adDb: point.adDb,
      acmDb: finiteOrNull(point.acmDb),
      cmrrDb: finiteOrNull(point.cmrrDb),
      cmrrBandLowDb: finiteOrNull(point.cmrrBandLowDb),
      cmrrBandHighDb: finiteOrNull(point.cmrrBandHighDb),
    }));
  }
  const predictions = predictInstrumentationAmplifier(
    frequenciesHz,
    {
      feedbackResistance1Ohms: circuit.feedback1.ohms,
      feedbackResistance2Ohms: circuit.feedback2.ohms,
      gainResistanceOhms: circuit.gainResistor.ohms,
      differenceStage: {
        ...differenceStageResistors(circuit),
        // Source resistances of the signal sit before the input op-amps, whose high input
        // impedance makes them harmless at this model's level; they are kept for the record.
        sourceResistance1Ohms: 0,
        sourceResistance2Ohms: 0,
      },
    },
    opAmp ? { input1: opAmp, input2: opAmp, difference: opAmp } : {},
  );
  return predictions.map((point) => ({
    frequencyHz: point.frequencyHz,
    adDb: point.adDb,
    acmDb: finiteOrNull(point.acmDb),
    cmrrDb: finiteOrNull(point.cmrrDb),
    cmrrBandLowDb: finiteOrNull(point.cmrrBandLowDb),
    cmrrBandHighDb: finiteOrNull(point.cmrrBandHighDb),
  }));
}

/** Nominal differential gain of the design (low-frequency, ideal op-amp), dimensionless. */
export function nominalDifferentialGain(circuit: Circuit): number {
  const stageGain = circuit.r2.ohms / circuit.r1.ohms;
  if (circuit.topology === 'difference-amplifier') return stageGain;
  return stageGain * (1 + (circuit.feedback1.ohms + circuit.feedback2.ohms) / circuit.gainResistor.ohms);
}

/** |Acm/Ad| of the nominal difference stage with an ideal op-amp (0 for matched ratios). */
export function nominalCommonModeRatio(circuit: Circuit): number {
  return Math.abs(commonModeToDifferentialRatio(circuit.r1.ohms, circuit.r2.ohms, circuit.r3.ohms, circuit.r4.ohms));
}
