// Circuits of the fictional Halden Ridge Instruments lab's boards (the HRB-204 bridge front-end,
// the HRB-311 current-sense stage, the HRX-2210 op-amp) and their limit masks: invented demo data,
// used by the demo scenario, the sample-data generator, tests and benches. The key order of each
// object is that of the JSON files in sample-data/designs/, which are generated from these.
import type { DifferenceAmplifierCircuit, InstrumentationAmplifierCircuitData, LimitMaskData, OpAmpData } from '../../shared/schemas/designs';

/** The lab's op-amp (part number and data invented): single-pole data as the design API takes it. */
export const fictionalOpAmp: OpAmpData = { partNumber: 'HRX-2210 (fictional)', openLoopGainDb: 120, gainBandwidthHz: 8e6, cmrrDb: 110, cmrrCornerHz: 2000 };

export interface BridgeFrontEndOptions {
  /** Tolerance of all four resistors as a fraction (0.001 = 0.1 %); default 0.001. */
  tolerance?: number;
  /** [R1 = R3, R2 = R4] in ohms; default [4990, 49 900] (gain 10). */
  ohms?: [number, number];
  /** [Rs1, Rs2], the source resistances in ohms; default [175, 175] (the 350 Ω bridge's arms). */
  sourceOhms?: [number, number];
  /** The op-amp; default {@link fictionalOpAmp}, null for an ideal one. */
  opAmp?: OpAmpData | null;
}

/**
 * A difference amplifier like the load-cell bridge front-end board HRB-204: R1 = R3 and R2 = R4,
 * one tolerance for all four, uniform tolerance distribution.
 *
 * @example
 * bridgeFrontEndCircuit({ tolerance: 0.0001 }); // HRB-204 rev D: 4990 Ω / 49.9 kΩ, 0.01 %
 * bridgeFrontEndCircuit({ ohms: [10_000, 100_000], sourceOhms: [0, 0], opAmp: null }); // ideal op-amp, no source
 */
export function bridgeFrontEndCircuit(options: BridgeFrontEndOptions = {}): DifferenceAmplifierCircuit {
  const { tolerance = 0.001, ohms: [inputOhms, feedbackOhms] = [4990, 49_900], sourceOhms = [175, 175], opAmp = fictionalOpAmp } = options;
  const resistor = (ohms: number) => ({ ohms, tolerance });
  return {
    topology: 'difference-amplifier',
    r1: resistor(inputOhms),
    r2: resistor(feedbackOhms),
    r3: resistor(inputOhms),
    r4: resistor(feedbackOhms),
    sourceResistance1Ohms: sourceOhms[0],
    sourceResistance2Ohms: sourceOhms[1],
    toleranceDistribution: 'uniform',
    opAmp,
  };
}

/** The limit mask of the bridge front-end HRB-204: 80 dB to 1 kHz, 70 dB at 20 kHz, 1 dB guard band. */
export const bridgeFrontEndMask: LimitMaskData = {
  points: [
    { frequencyHz: 10, minimumCmrrDb: 80 },
    { frequencyHz: 1000, minimumCmrrDb: 80 },
    { frequencyHz: 20_000, minimumCmrrDb: 70 },
  ],
  guardBandDb: 1,
};

/**
 * The three-op-amp instrumentation amplifier of the current-sense stage HRB-311: 24.9 kΩ feedback
 * and a 1 kΩ gain resistor at 0.1 % (input-stage gain 50.8), a 10 kΩ 0.05 % difference stage,
 * no source resistance, the {@link fictionalOpAmp} throughout.
 */
export function currentSenseCircuit(): InstrumentationAmplifierCircuitData {
  return {
    topology: 'instrumentation-amplifier',
    feedback1: { ohms: 24_900, tolerance: 0.001 },
    feedback2: { ohms: 24_900, tolerance: 0.001 },
    gainResistor: { ohms: 1000, tolerance: 0.001 },
    r1: { ohms: 10_000, tolerance: 0.0005 },
    r2: { ohms: 10_000, tolerance: 0.0005 },
    r3: { ohms: 10_000, tolerance: 0.0005 },
    r4: { ohms: 10_000, tolerance: 0.0005 },
    sourceResistance1Ohms: 0,
    sourceResistance2Ohms: 0,
    toleranceDistribution: 'uniform',
    opAmp: fictionalOpAmp,
  };
}

/** The limit mask of the current-sense stage HRB-311: 90 dB to 1 kHz, 75 dB at 10 kHz, 1.5 dB guard band. */
export const currentSenseMask: LimitMaskData = {
  points: [
    { frequencyHz: 10, minimumCmrrDb: 90 },
    { frequencyHz: 1000, minimumCmrrDb: 90 },
    { frequencyHz: 10_000, minimumCmrrDb: 75 },
  ],
  guardBandDb: 1.5,
};
