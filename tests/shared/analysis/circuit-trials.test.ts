import { describe, expect, it } from 'vitest';
import {
  EngineInputError,
  differenceAmplifierGains,
  instrumentationAmplifierGains,
  magnitudeComplex,
  monteCarloCmrrRatios,
  type OpAmpTermSign,
} from '../../../shared/engine';
import { drawCircuitTrials, fillTrialRatiosSquared, resolveTrialOptions } from '../../../shared/analysis';
import { differenceCircuit, instrumentationCircuit, OP_AMP } from './fixtures';

/** Two algebraically equal forms of the same node solution differ only by rounding (a few ulps of 1e-16, magnified by cancellation in Acm). */
const SAME_SOLUTION_RELATIVE = 1e-7;
/** Same trials, same formula up to operation order: rounding only. */
const SAME_TRIAL_RELATIVE = 1e-9;

describe('fillTrialRatiosSquared', () => {
  it('gives the engine’s |Acm/Ad|² of a difference amplifier for every trial, frequency and op-amp sign', () => {
    const circuit = differenceCircuit(0.01);
    for (const sign of [1, -1] as OpAmpTermSign[]) {
      const trials = drawCircuitTrials(circuit, { trials: 50, seed: 7, distribution: 'uniform', opAmpTermSign: sign });
      for (const frequencyHz of [0, 10, 1e3, 1e5]) {
        const ours = new Float64Array(50);
        fillTrialRatiosSquared(trials, frequencyHz, ours);
        for (let trial = 0; trial < 50; trial++) {
          // Reference: the engine's node solution (shared/engine/difference-amplifier.ts).
          const gains = differenceAmplifierGains(
            { r1Ohms: trials.r1Ohms[trial], r2Ohms: trials.r2Ohms[trial], r3Ohms: trials.r3Ohms[trial], r4Ohms: trials.r4Ohms[trial] },
            frequencyHz,
            OP_AMP,
            sign,
          );
          const expected = (magnitudeComplex(gains.commonModeGain) / magnitudeComplex(gains.differentialGain)) ** 2;
          expect(Math.abs(ours[trial] / expected - 1)).toBeLessThan(SAME_SOLUTION_RELATIVE);
        }
      }
    }
  });

  it('gives the engine’s |Acm/Ad|² of an instrumentation amplifier for every sign combination', () => {
    const circuit = instrumentationCircuit(0.01);
    const trials = drawCircuitTrials(circuit, { trials: 64, seed: 3, distribution: 'normal', opAmpTermSign: 'random' });
    const opAmp = { ...OP_AMP, cmrrCornerHz: 10 };
    for (const frequencyHz of [0, 100, 1e4, 3e5]) {
      const ours = new Float64Array(64);
      fillTrialRatiosSquared(trials, frequencyHz, ours);
      for (let trial = 0; trial < 64; trial++) {
        const bits = trials.signBits![trial];
        const signOf = (bit: number): OpAmpTermSign => (bits & bit ? -1 : 1);
        // Reference: the engine's 4×4 complex node solution (shared/engine/instrumentation-amplifier.ts).
        const gains = instrumentationAmplifierGains(
          {
            feedbackResistance1Ohms: trials.feedback1Ohms![trial],
            feedbackResistance2Ohms: trials.feedback2Ohms![trial],
            gainResistanceOhms: trials.gainResistorOhms![trial],
            differenceStage: { r1Ohms: trials.r1Ohms[trial], r2Ohms: trials.r2Ohms[trial], r3Ohms: trials.r3Ohms[trial], r4Ohms: trials.r4Ohms[trial] },
          },
          frequencyHz,
          { input1: opAmp, input2: opAmp, difference: opAmp },
          { difference: signOf(1), input1: signOf(2), input2: signOf(4) },
        );
        const expected = (magnitudeComplex(gains.commonModeGain) / magnitudeComplex(gains.differentialGain)) ** 2;
        expect(Math.abs(ours[trial] / expected - 1)).toBeLessThan(SAME_SOLUTION_RELATIVE);
      }
    }
  });
});

describe('drawCircuitTrials', () => {
  it.each(['uniform', 'normal'] as const)('draws the very trials of the engine’s monteCarloCmrr for the same network and seed (%s)', (distribution) => {
    const circuit = { ...differenceCircuit(0.001, null), sourceResistance1Ohms: 50, sourceResistance2Ohms: 20 };
    const trials = drawCircuitTrials(circuit, { trials: 40_000, seed: 11, distribution, opAmpTermSign: 1 });
    const ours = new Float64Array(40_000);
    fillTrialRatiosSquared(trials, 0, ours);
    // Reference: the engine's per-trial |Acm/Ad| (shared/engine/resistor-tolerance.ts) for the same seed.
    const engine = monteCarloCmrrRatios({
      network: { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100e3, toleranceFractions: [0.001, 0.001, 0.001, 0.001], sourceResistance1Ohms: 50, sourceResistance2Ohms: 20 },
      trials: 40_000,
      seed: 11,
      distribution,
    });
    let worst = 0;
    for (let trial = 0; trial < 40_000; trial++) worst = Math.max(worst, Math.abs(Math.sqrt(ours[trial]) / engine[trial] - 1));
    expect(worst).toBeLessThan(SAME_TRIAL_RELATIVE);
  });

  it('keeps every uniform draw within nominal ± tolerance', () => {
    const trials = drawCircuitTrials(differenceCircuit(0.01), { trials: 10_000, seed: 2, distribution: 'uniform', opAmpTermSign: 1 });
    expect(Math.min(...trials.r2Ohms)).toBeGreaterThanOrEqual(99e3);
    expect(Math.max(...trials.r2Ohms)).toBeLessThan(101e3);
  });

  it('draws both op-amp signs about equally often when they are random', () => {
    const trials = drawCircuitTrials(differenceCircuit(), { trials: 10_000, seed: 5, distribution: 'uniform', opAmpTermSign: 'random' });
    const negative = trials.signBits!.reduce((count, bits) => count + (bits & 1), 0);
    // Binomial(10,000, 0.5): σ = 50, so ±300 is 6σ (common practice, no source).
    expect(Math.abs(negative - 5000)).toBeLessThan(300);
  });

  it('refuses a tolerance of 0.5 or more, naming the resistor', () => {
    const circuit = differenceCircuit();
    circuit.r3 = { ohms: 10e3, tolerance: 0.5 };
    expect(() => drawCircuitTrials(circuit, { trials: 1, seed: 1, distribution: 'uniform', opAmpTermSign: 1 })).toThrow(/tolerance of R3/);
  });

  it('refuses a non-positive resistance, naming it', () => {
    const circuit = differenceCircuit();
    circuit.r1 = { ohms: 0, tolerance: 0.001 };
    expect(() => drawCircuitTrials(circuit, { trials: 1, seed: 1, distribution: 'uniform', opAmpTermSign: 1 })).toThrow(EngineInputError);
  });
});

describe('resolveTrialOptions', () => {
  it('fills in the defaults: seed 1, the design’s distribution, random signs', () => {
    const circuit = { ...differenceCircuit(), toleranceDistribution: 'normal' as const };
    expect(resolveTrialOptions('f', circuit, {}, 10)).toEqual({ trials: 10, seed: 1, distribution: 'normal', opAmpTermSign: 'random' });
  });

  it.each([
    [{ trials: 0 }, 'trials'],
    [{ trials: 2.5 }, 'trials'],
    [{ trials: 10_000_001 }, 'trials'],
    [{ seed: -1 }, 'seed'],
    [{ distribution: 'triangular' as never }, 'distribution'],
    [{ opAmpTermSign: 2 as never }, 'opAmpTermSign'],
  ])('refuses %o with an EngineInputError naming the field', (options, field) => {
    try {
      resolveTrialOptions('monteCarloCmrrBand', differenceCircuit(), options, 10);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(EngineInputError);
      expect((error as EngineInputError).location.field).toBe(field);
      expect((error as Error).message).toMatch(/monteCarloCmrrBand requires/);
    }
  });
});
