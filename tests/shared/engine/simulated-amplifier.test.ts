import { describe, expect, it } from 'vitest';
import { magnitudeComplex, phaseDegComplex } from '../../../shared/engine/complex';
import { predictDifferenceAmplifier, type OpAmpModel } from '../../../shared/engine/difference-amplifier';
import { EngineInputError } from '../../../shared/engine/errors';
import {
  logSpacedFrequencies,
  simulateAmplifierSweep,
  simulatedAmplifierResistors,
  type SimulatedAmplifierOptions,
} from '../../../shared/engine/simulated-amplifier';

/** The simulation and the prediction run the same node equations: only rounding may separate them. */
const SAME_COMPUTATION_RELATIVE = 1e-12;
/** Phases from the same complex value through atan2: a few ulps of 180°. */
const SAME_COMPUTATION_DEGREES = 1e-9;
/** Frequencies are rounded to 12 significant digits. */
const FREQUENCY_ROUNDING_RELATIVE = 1e-11;

// Invented demo amplifier (gain 10, R4 0.1 % high, an op-amp of the fictional lab's kind).
const opAmp: OpAmpModel = { openLoopGainDb: 120, gainBandwidthHz: 8e6, cmrrDb: 110, cmrrCornerHz: 2000 };
const base: SimulatedAmplifierOptions = {
  mode: 'differential',
  pointCount: 31,
  startFrequencyHz: 10,
  stopFrequencyHz: 10e3,
  gain: 10,
  mismatchFraction: 0.001,
  opAmp,
  noiseVolts: 0,
  driveVolts: 1,
  seed: 7,
};

describe('logSpacedFrequencies', () => {
  it('spaces frequencies evenly on a log axis, both ends included', () => {
    // Decades by definition: 10^1, 10^2, 10^3 (no source needed).
    expect(logSpacedFrequencies(10, 1000, 3)).toEqual([10, 100, 1000]);
    const tenPerDecade = logSpacedFrequencies(10, 100, 11);
    // 10^(1 + k/10): k = 5 gives 10^1.5 = 31.6227766017 (Math.pow, common practice).
    expect(tenPerDecade[5]).toBeCloseTo(31.6227766017, 9);
    tenPerDecade.slice(1).forEach((frequency, index) => expect(frequency).toBeGreaterThan(tenPerDecade[index]));
  });

  it('refuses a count below 2 and a range that does not rise, naming the field', () => {
    expect(() => logSpacedFrequencies(10, 1000, 1)).toThrow(/pointCount|count of at least 2/);
    expect(() => logSpacedFrequencies(0, 1000, 5)).toThrow(EngineInputError);
    expect(() => logSpacedFrequencies(1000, 10, 5)).toThrow(/stop frequency above the start/);
    expect(() => logSpacedFrequencies(10, 1000, 2.5)).toThrow(/integer count/);
  });
});

describe('simulatedAmplifierResistors', () => {
  it('builds R1 = R3, R2 = G·R1 and R4 = G·R3·(1 + mismatch)', () => {
    // The definition in the module's doc comment.
    const resistors = simulatedAmplifierResistors(10, 0.001);
    expect(resistors.r1Ohms).toBe(10e3);
    expect(resistors.r2Ohms).toBe(100e3);
    expect(resistors.r3Ohms).toBe(10e3);
    expect(resistors.r4Ohms / 100.1e3).toBeCloseTo(1, 14);
  });
});

describe('simulateAmplifierSweep without noise', () => {
  it('reads the drive times the predicted differential gain at every frequency', () => {
    const readings = simulateAmplifierSweep(base);
    const prediction = predictDifferenceAmplifier(
      readings.map((reading) => reading.frequencyHz),
      simulatedAmplifierResistors(base.gain, base.mismatchFraction),
      opAmp,
    );
    expect(readings).toHaveLength(31);
    readings.forEach((reading, index) => {
      expect(reading.vinV).toBe(1);
      expect(reading.floorV).toBeNull();
      // Expected: predictDifferenceAmplifier (the engine's node equations, DOMAIN.md op-amp model).
      expect(reading.voutV / magnitudeComplex(prediction[index].differentialGain)).toBeCloseTo(1, -Math.log10(SAME_COMPUTATION_RELATIVE));
      expect(Math.abs(reading.phaseDeg - phaseDegComplex(prediction[index].differentialGain))).toBeLessThan(SAME_COMPUTATION_DEGREES);
    });
  });

  it('reads the drive times the predicted common-mode gain in a common-mode sweep, so vout ratios give the predicted CMRR', () => {
    const differential = simulateAmplifierSweep({ ...base, driveVolts: 0.5 });
    const commonMode = simulateAmplifierSweep({ ...base, mode: 'common-mode', driveVolts: 2 });
    const prediction = predictDifferenceAmplifier(
      commonMode.map((reading) => reading.frequencyHz),
      simulatedAmplifierResistors(base.gain, base.mismatchFraction),
      opAmp,
    );
    commonMode.forEach((reading, index) => {
      expect(reading.vinV).toBe(2);
      expect(reading.voutV / (2 * magnitudeComplex(prediction[index].commonModeGain))).toBeCloseTo(1, -Math.log10(SAME_COMPUTATION_RELATIVE));
      const cmrrDb = 20 * Math.log10(differential[index].voutV / differential[index].vinV / (reading.voutV / reading.vinV));
      // Expected: predictDifferenceAmplifier's cmrrDb (sign as written), the engine's prediction.
      expect(cmrrDb).toBeCloseTo(prediction[index].cmrrDb, 9);
    });
  });

  it('matches the textbook ideal-op-amp gains of DOMAIN.md', () => {
    const options = { ...base, opAmp: undefined, pointCount: 2 };
    const [differential] = simulateAmplifierSweep(options);
    const [commonMode] = simulateAmplifierSweep({ ...options, mode: 'common-mode' });
    // DOMAIN.md, four-resistor difference amplifier: Ad = (R4(R1+R2) + R2(R3+R4)) / (2·R1·(R3+R4)),
    // Acm = (R1·R4 − R2·R3) / (R1·(R3+R4)); with R1 = R3 = 10 kΩ, R2 = 100 kΩ, R4 = 100.1 kΩ:
    // Ad = 2.2021e10 / 2.202e9 = 10.000454132606722…, Acm = 1e6 / 1.101e9 = 9.0826521344e-4 (hand arithmetic).
    expect(differential.voutV).toBeCloseTo(2.2021e10 / 2.202e9, 10);
    expect(commonMode.voutV).toBeCloseTo(1e6 / 1.101e9, 13);
    // DOMAIN.md approximation CMRR ≈ (1 + G)/mismatch = 11 / 0.001 → 80.83 dB; exact 80.84 dB.
    expect(20 * Math.log10(differential.voutV / commonMode.voutV)).toBeCloseTo(80.84, 2);
    // The common-mode output of a resistor-limited amplifier is in phase (R4 high: Acm > 0).
    expect(commonMode.phaseDeg).toBe(0);
  });

  it('keeps the frequencies log-spaced from start to stop', () => {
    const readings = simulateAmplifierSweep(base);
    const expected = logSpacedFrequencies(10, 10e3, 31);
    readings.forEach((reading, index) => expect(Math.abs(reading.frequencyHz / expected[index] - 1)).toBeLessThan(FREQUENCY_ROUNDING_RELATIVE));
    // Ten points a decade over three decades (DOMAIN.md "Measuring it"): 10^(1 + 10/10) = 100 Hz at index 10.
    expect(readings[10].frequencyHz).toBe(100);
  });
});

describe('simulateAmplifierSweep with noise', () => {
  it('gives the same readings for the same seed and different ones for another seed', () => {
    const noisy = { ...base, mode: 'common-mode' as const, noiseVolts: 1e-6 };
    expect(simulateAmplifierSweep(noisy)).toEqual(simulateAmplifierSweep(noisy));
    const other = simulateAmplifierSweep({ ...noisy, seed: 8 });
    expect(other.map((reading) => reading.voutV)).not.toEqual(simulateAmplifierSweep(noisy).map((reading) => reading.voutV));
  });

  it('adds noise whose RMS magnitude is noiseVolts and reports it as the floor', () => {
    // A perfectly matched network with an ideal op-amp has Acm = 0 exactly (DOMAIN.md), so the
    // common-mode readings are the noise alone.
    const count = 20_000;
    const readings = simulateAmplifierSweep({ ...base, mode: 'common-mode', mismatchFraction: 0, opAmp: undefined, noiseVolts: 2e-6, pointCount: count, stopFrequencyHz: 1e6 });
    const meanSquare = readings.reduce((sum, reading) => sum + reading.voutV ** 2, 0) / count;
    // |n|² of complex Gaussian noise is exponentially distributed with mean noise² (from memory):
    // its sample mean has a relative standard deviation of 1/√count = 0.71 %; allow 5 of those.
    const FIVE_STANDARD_ERRORS = 5 / Math.sqrt(count);
    expect(Math.abs(meanSquare / 4e-12 - 1)).toBeLessThan(FIVE_STANDARD_ERRORS);
    expect(readings.every((reading) => reading.floorV === 2e-6)).toBe(true);
    // P(|n| < 2·floor) = 1 − exp(−4) = 0.9817 (exponential distribution, from memory): almost every
    // such point is floor-limited and must be analysed as a lower bound (DOMAIN.md).
    const belowTwiceFloor = readings.filter((reading) => reading.voutV < 2 * reading.floorV!).length / count;
    // Binomial standard error sqrt(p(1−p)/n) = 0.00095; allow 5 of those.
    expect(Math.abs(belowTwiceFloor - (1 - Math.exp(-4)))).toBeLessThan(5 * Math.sqrt((0.0183 * 0.9817) / count));
  });

  it('leaves large readings within a few noise RMS of the prediction', () => {
    const noiseVolts = 1e-4;
    const readings = simulateAmplifierSweep({ ...base, noiseVolts });
    const clean = simulateAmplifierSweep(base);
    // |reading − clean| ≤ |n|, and |n| > 5·noise has probability exp(−25) (exponential |n|², from memory).
    readings.forEach((reading, index) => expect(Math.abs(reading.voutV - clean[index].voutV)).toBeLessThan(5 * noiseVolts));
  });
});

describe('simulateAmplifierSweep input errors', () => {
  it.each([
    ['gain', { gain: 0 }, /gain to be a gain above 0/],
    ['mismatchFraction', { mismatchFraction: 1 }, /mismatchFraction to be a fraction between −1 and 1/],
    ['noiseVolts', { noiseVolts: -1e-6 }, /noiseVolts to be at least 0 V/],
    ['driveVolts', { driveVolts: Number.NaN }, /driveVolts to be above 0 V/],
    ['pointCount', { pointCount: 1 }, /count of at least 2/],
    ['stopFrequencyHz', { stopFrequencyHz: 5 }, /stop frequency above the start/],
    ['seed', { seed: -1 }, /non-negative integer seed/],
    ['gainBandwidthHz', { opAmp: { ...opAmp, gainBandwidthHz: 0 } }, /gainBandwidthHz/],
  ] as const)('refuses a bad %s with an EngineInputError naming it', (field, change, message) => {
    let caught: unknown;
    try {
      simulateAmplifierSweep({ ...base, ...change } as SimulatedAmplifierOptions);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(EngineInputError);
    expect((caught as EngineInputError).message).toMatch(message);
    expect((caught as EngineInputError).location.field).toBe(field);
  });

  it('refuses an unknown mode', () => {
    expect(() => simulateAmplifierSweep({ ...base, mode: 'sideways' as 'differential' })).toThrow(/mode "differential" or "common-mode"/);
  });
});
