// Inputs for bench-data tests: a design of our own fictional board and sweep files made from
// the engine's own prediction of it (so the expected CMRR is known exactly).
import { bridgeFrontEndCircuit } from '../../server/demo/fictional-boards';
import { predictDifferenceAmplifier } from '../../shared/engine';
import { simulateAmplifierSweep } from '../../shared/engine/simulated-amplifier';
import type { CreateDesignInput } from '../../shared/schemas/designs';

/** A gain-10 difference amplifier with a 0.1 % network and the fictional lab's op-amp (invented: test data). */
export function testDesignInput(name = 'HRB-204 bridge front-end'): CreateDesignInput {
  return {
    name,
    description: 'Load-cell bridge front-end, gain 10',
    revision: {
      label: 'A',
      circuit: bridgeFrontEndCircuit({ ohms: [1000, 10_000], sourceOhms: [0, 0] }),
      limitMask: { points: [{ frequencyHz: 10, minimumCmrrDb: 70 }, { frequencyHz: 100_000, minimumCmrrDb: 40 }], guardBandDb: 0 },
      changeNote: '',
    },
  };
}

export const logSpacedHz = (count: number, startHz: number, stopHz: number) =>
  Array.from({ length: count }, (_, index) => startHz * (stopHz / startHz) ** (index / (count - 1)));

/**
 * Differential and common-mode sweeps of a difference amplifier whose R4 is off by `mismatch`
 * (fraction), as canonical CSV text with 1 V rms drive: vout = |A|·vin from the engine prediction.
 */
export function predictedSweepCsv(options: { mismatch: number; frequenciesHz: number[]; floorV?: number }) {
  const points = predictDifferenceAmplifier(options.frequenciesHz, { r1Ohms: 1000, r2Ohms: 10_000, r3Ohms: 1000, r4Ohms: 10_000 * (1 + options.mismatch) });
  const floor = options.floorV ?? null;
  const header = floor === null ? 'frequency_hz,vin_v,vout_v' : 'frequency_hz,vin_v,vout_v,floor_v';
  const row = (frequencyHz: number, gainDb: number) => [frequencyHz, 1, 10 ** (gainDb / 20), ...(floor === null ? [] : [floor])].join(',');
  return {
    differential: [header, ...points.map((point) => row(point.frequencyHz, point.adDb))].join('\n') + '\n',
    commonMode: [header, ...points.map((point) => row(point.frequencyHz, point.acmDb))].join('\n') + '\n',
    cmrrDb: points.map((point) => point.cmrrDb),
  };
}

/**
 * Stored-point rows of a long simulated sweep (the simulated instrument's readings of an invented
 * gain-10 amplifier with a 0.05 % mismatch, 10 Hz–100 kHz log-spaced), ready for addCompleteSweeps.
 * Seeded: the same `seed` gives the same readings.
 */
export function simulatedSweepRows(mode: 'differential' | 'common-mode', pointCount: number, seed: number) {
  return simulateAmplifierSweep({
    mode,
    pointCount,
    startFrequencyHz: 10,
    stopFrequencyHz: 100_000,
    gain: 10,
    mismatchFraction: 0.0005,
    opAmp: { openLoopGainDb: 120, gainBandwidthHz: 8e6, cmrrDb: 110, cmrrCornerHz: 2000 },
    noiseVolts: 2e-6,
    driveVolts: mode === 'differential' ? 0.1 : 1,
    seed,
  }).map((reading, index) => ({ sequence: index + 1, frequencyHz: reading.frequencyHz, vinV: reading.vinV, voutV: reading.voutV, phaseDeg: reading.phaseDeg ?? null, floorV: reading.floorV ?? null, sourceLine: null }));
}
