// A simulated bench instrument: the readings a narrowband analyser would report while sweeping a
// fictional four-resistor difference amplifier, built from the engine's own prediction plus seeded
// noise. It stands in for hardware when the bench client streams without an instrument attached.
import { addComplex, complex, magnitudeComplex, phaseDegComplex, scaleComplex } from './complex';
import { predictDifferenceAmplifier, validateOpAmpModel, type DifferenceAmplifierResistors, type OpAmpModel } from './difference-amplifier';
import { EngineInputError } from './errors';
import { createSeededRandom } from './seeded-random';

/** What the simulated instrument measures and on which fictional amplifier. */
export interface SimulatedAmplifierOptions {
  /** Drive of the sweep: `differential` (v2 − v1 = drive) or `common-mode` (v1 = v2 = drive). */
  mode: 'differential' | 'common-mode';
  /** Number of log-spaced test frequencies, at least 2. */
  pointCount: number;
  /** First test frequency, Hz (above 0). */
  startFrequencyHz: number;
  /** Last test frequency, Hz (above the first). */
  stopFrequencyHz: number;
  /** Nominal differential gain R2/R1 (above 0). */
  gain: number;
  /**
   * Relative error of R4 against its matched value G·R3 (signed, between −1 and 1): with an
   * ideal op-amp the rejection is then about (1 + G)/|mismatch| (DOMAIN.md relations).
   */
  mismatchFraction: number;
  /** Single-pole op-amp data (DOMAIN.md); undefined for an ideal op-amp. */
  opAmp?: OpAmpModel;
  /** RMS of the output noise in the detector's bandwidth, volts (0 for noiseless readings). */
  noiseVolts: number;
  /** Drive amplitude, volts RMS (above 0). */
  driveVolts: number;
  /** Seed of the noise (a non-negative integer): equal seeds give equal readings. */
  seed: number;
  /** R1 = R3, ohms (default 10 kΩ); R2 = R4 nominal = gain·R1. */
  inputResistanceOhms?: number;
}

/** One reading of the simulated instrument, amplitudes in volts RMS. */
export interface SimulatedReading {
  frequencyHz: number;
  /** Drive amplitude, volts. */
  vinV: number;
  /** Output amplitude the detector reports (signal plus noise), volts. */
  voutV: number;
  /** Output phase relative to the drive, degrees (−180 … 180]. */
  phaseDeg: number;
  /** Output noise floor in the same bandwidth, volts; null when the simulation is noiseless. */
  floorV: number | null;
}

function requireNumber(field: keyof SimulatedAmplifierOptions, value: number, ok: boolean, requirement: string): void {
  if (!Number.isFinite(value) || !ok) {
    throw new EngineInputError(`simulateAmplifierSweep requires ${field} to be ${requirement}, got ${value}`, { field });
  }
}

/**
 * `count` frequencies spaced evenly on a logarithmic axis from `startHz` to `stopHz`, both included
 * (the usual layout of a sweep, DOMAIN.md "Measuring it"), rounded to 12 significant digits. O(count).
 *
 * @param startHz first frequency, Hz (above 0)
 * @param stopHz last frequency, Hz (above startHz)
 * @param count number of frequencies, an integer of at least 2
 * @returns the frequencies in hertz, rising
 * @throws EngineInputError (field "startFrequencyHz", "stopFrequencyHz" or "pointCount") for bad input
 * @example logSpacedFrequencies(10, 1000, 3) // → [10, 100, 1000]
 */
export function logSpacedFrequencies(startHz: number, stopHz: number, count: number): number[] {
  const problem = (field: string, message: string) => new EngineInputError(`logSpacedFrequencies requires ${message}`, { field });
  if (!Number.isFinite(startHz) || startHz <= 0) throw problem('startFrequencyHz', `a start frequency above 0 Hz, got ${startHz}`);
  if (!Number.isFinite(stopHz) || stopHz <= startHz) throw problem('stopFrequencyHz', `a stop frequency above the start (${startHz} Hz), got ${stopHz}`);
  if (!Number.isInteger(count) || count < 2) throw problem('pointCount', `an integer count of at least 2, got ${count}`);
  const logStart = Math.log(startHz);
  const logStep = (Math.log(stopHz) - logStart) / (count - 1);
  const frequencies = new Array<number>(count);
  // Rounded to 12 significant digits so decade points read as 100, not 100.00000000000004.
  for (let index = 0; index < count; index++) frequencies[index] = Number(Math.exp(logStart + logStep * index).toPrecision(12));
  frequencies[0] = startHz;
  frequencies[count - 1] = stopHz;
  return frequencies;
}

/**
 * The resistor network of the fictional amplifier: R1 = R3 = `inputResistanceOhms`,
 * R2 = gain·R1, R4 = gain·R3·(1 + mismatchFraction). O(1).
 *
 * @example simulatedAmplifierResistors(10, 0.001) // → { r1Ohms: 10000, r2Ohms: 100000, r3Ohms: 10000, r4Ohms: 100100 }
 */
export function simulatedAmplifierResistors(gain: number, mismatchFraction: number, inputResistanceOhms = 10e3): DifferenceAmplifierResistors {
  return {
    r1Ohms: inputResistanceOhms,
    r2Ohms: gain * inputResistanceOhms,
    r3Ohms: inputResistanceOhms,
    r4Ohms: gain * inputResistanceOhms * (1 + mismatchFraction),
  };
}

/**
 * Simulates one sweep of a narrowband analyser on a fictional four-resistor difference amplifier.
 * The true output at each frequency is the drive times the engine's complex gain
 * (`predictDifferenceAmplifier`, the node equations with the DOMAIN.md op-amp model, op-amp term
 * sign as written): Ad for a differential sweep, Acm for a common-mode one. The detector adds complex
 * Gaussian noise whose RMS magnitude is `noiseVolts` (each quadrature σ = noiseVolts/√2, drawn with
 * the Box–Muller transform from a xoshiro128** stream seeded by `seed`), so a reading is
 * `|G·drive + n|` with phase `arg(G·drive + n)` and a floor of `noiseVolts`: outputs below twice the
 * floor come out as lower bounds when analysed, as a real floor-limited point would. With
 * `noiseVolts = 0` the readings equal the prediction exactly and the floor is null.
 * Cost O(pointCount).
 *
 * @param options amplifier, sweep and noise settings (units in the field names; volts RMS)
 * @returns one reading per frequency, rising in frequency
 * @throws EngineInputError naming the field for a bad count, frequency range, gain, mismatch,
 *   noise, drive, seed or op-amp data
 * @example simulateAmplifierSweep({ mode: 'differential', pointCount: 2, startFrequencyHz: 10, stopFrequencyHz: 1000,
 *   gain: 10, mismatchFraction: 0.001, noiseVolts: 0, driveVolts: 1, seed: 1 })[0].voutV // → 10.000454… (|Ad|·1 V)
 */
export function simulateAmplifierSweep(options: SimulatedAmplifierOptions): SimulatedReading[] {
  const { mode, gain, mismatchFraction, noiseVolts, driveVolts, opAmp } = options;
  if (mode !== 'differential' && mode !== 'common-mode') {
    throw new EngineInputError(`simulateAmplifierSweep requires mode "differential" or "common-mode", got "${String(mode)}"`, { field: 'mode' });
  }
  requireNumber('gain', gain, gain > 0, 'a gain above 0');
  requireNumber('mismatchFraction', mismatchFraction, Math.abs(mismatchFraction) < 1, 'a fraction between −1 and 1');
  requireNumber('noiseVolts', noiseVolts, noiseVolts >= 0, 'at least 0 V');
  requireNumber('driveVolts', driveVolts, driveVolts > 0, 'above 0 V');
  const inputResistanceOhms = options.inputResistanceOhms ?? 10e3;
  requireNumber('inputResistanceOhms', inputResistanceOhms, inputResistanceOhms > 0, 'above 0 ohms');
  if (opAmp) validateOpAmpModel(opAmp, 'simulateAmplifierSweep');
  const frequencies = logSpacedFrequencies(options.startFrequencyHz, options.stopFrequencyHz, options.pointCount);
  const random = createSeededRandom(options.seed);
  const resistors = simulatedAmplifierResistors(gain, mismatchFraction, inputResistanceOhms);
  const quadratureSigmaVolts = noiseVolts / Math.SQRT2;

  const prediction = predictDifferenceAmplifier(frequencies, resistors, opAmp);

  return prediction.map((gains) => {
    const { frequencyHz } = gains;
    const signal = scaleComplex(mode === 'differential' ? gains.differentialGain : gains.commonModeGain, driveVolts);
    // Box–Muller: two uniforms give two independent standard normals (one per quadrature).
    // Both are drawn even when noiseVolts is 0 so the stream position does not depend on it.
    const radius = Math.sqrt(-2 * Math.log(1 - random.nextFloat64()));
    const angle = 2 * Math.PI * random.nextFloat64();
    const noise = complex(quadratureSigmaVolts * radius * Math.cos(angle), quadratureSigmaVolts * radius * Math.sin(angle));
    const reading = noiseVolts > 0 ? addComplex(signal, noise) : signal;
    return {
      frequencyHz,
      vinV: driveVolts,
      voutV: magnitudeComplex(reading),
      phaseDeg: phaseDegComplex(reading),
      floorV: noiseVolts > 0 ? noiseVolts : null,
    };
  });
}
