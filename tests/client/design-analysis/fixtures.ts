// Circuits and lots shaped like the demo's (invented values, as in server/demo/scenario.ts).
import type { Circuit } from '../../../shared/schemas/designs';

export const demoOpAmp = { partNumber: 'HRX-2210 (fictional)', openLoopGainDb: 120, gainBandwidthHz: 8e6, cmrrDb: 110, cmrrCornerHz: 2000 };
export const bridgeMask = { points: [{ frequencyHz: 10, minimumCmrrDb: 80 }, { frequencyHz: 1000, minimumCmrrDb: 80 }, { frequencyHz: 20_000, minimumCmrrDb: 70 }], guardBandDb: 1 };

export function bridgeCircuit(tolerance = 0.001): Circuit {
  const resistor = (ohms: number) => ({ ohms, tolerance });
  return {
    topology: 'difference-amplifier',
    r1: resistor(4990),
    r2: resistor(49_900),
    r3: resistor(4990),
    r4: resistor(49_900),
    sourceResistance1Ohms: 175,
    sourceResistance2Ohms: 175,
    toleranceDistribution: 'uniform',
    opAmp: demoOpAmp,
  };
}

export function currentSenseCircuit(): Circuit {
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
    opAmp: demoOpAmp,
  };
}
