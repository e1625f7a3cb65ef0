// Designs and simulated measurements shared by the analysis tests (fictional circuits).
import type { Circuit } from '../../../shared/schemas/designs';
import { magnitudeComplex, phaseDegComplex, type CmrrPoint, type Complex } from '../../../shared/engine';

export const OP_AMP = { partNumber: 'HRI-OPA-1', openLoopGainDb: 120, gainBandwidthHz: 1e7, cmrrDb: 120, cmrrCornerHz: 30 };

/** G = 10 difference amplifier, 10 kΩ / 100 kΩ, every resistor ±tol. */
export function differenceCircuit(toleranceFraction = 0.0005, opAmp: typeof OP_AMP | null = OP_AMP): Circuit {
  const part = (ohms: number) => ({ ohms, tolerance: toleranceFraction });
  return {
    topology: 'difference-amplifier',
    r1: part(10e3),
    r2: part(100e3),
    r3: part(10e3),
    r4: part(100e3),
    sourceResistance1Ohms: 0,
    sourceResistance2Ohms: 0,
    toleranceDistribution: 'uniform',
    opAmp,
  };
}

/** Three-op-amp in-amp: input stage gain 1 + 9 kΩ/1 kΩ = 10, unity difference stage. */
export function instrumentationCircuit(toleranceFraction = 0.0005, opAmp: typeof OP_AMP | null = { ...OP_AMP, cmrrCornerHz: 10 }): Circuit {
  const part = (ohms: number) => ({ ohms, tolerance: toleranceFraction });
  return {
    topology: 'instrumentation-amplifier',
    feedback1: { ohms: 4500, tolerance: 0.001 },
    feedback2: { ohms: 4500, tolerance: 0.001 },
    gainResistor: { ohms: 1000, tolerance: 0.001 },
    r1: part(10e3),
    r2: part(10e3),
    r3: part(10e3),
    r4: part(10e3),
    sourceResistance1Ohms: 0,
    sourceResistance2Ohms: 0,
    toleranceDistribution: 'uniform',
    opAmp,
  };
}

/** Noiseless "measured" points from complex predicted gains, phases included. */
export function pointsFromPrediction(prediction: readonly { frequencyHz: number; differentialGain: Complex; commonModeGain: Complex; cmrrDb: number }[]): CmrrPoint[] {
  return prediction.map((point, index) => ({
    frequencyHz: point.frequencyHz,
    ad: magnitudeComplex(point.differentialGain),
    acm: magnitudeComplex(point.commonModeGain),
    cmrrDb: point.cmrrDb,
    lowerBound: false,
    interpolated: false,
    commonModeLine: index + 2,
    adPhaseDeg: phaseDegComplex(point.differentialGain),
    acmPhaseDeg: phaseDegComplex(point.commonModeGain),
  }));
}

/** A simple resolved point for lot and session tests. */
export function point(frequencyHz: number, cmrrDb: number, lowerBound = false): CmrrPoint {
  return { frequencyHz, ad: 10, acm: 10 / 10 ** (cmrrDb / 20), cmrrDb, lowerBound, interpolated: false, commonModeLine: 2 };
}
