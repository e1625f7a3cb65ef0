import { describe, expect, it } from 'vitest';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { EngineInputError } from '../../../shared/engine/errors';
import {
  fitSineFourParameter,
  fitSineThreeParameter,
  wrapDegrees,
  type SampleArray,
} from '../../../shared/engine/sine-fit';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

// A noise-free synthetic sine is recovered to rounding: the fit is a 3×3 (4×4) solve of sums over
// at most 1e5 samples, each term off by ~1e-16 relative, and the phasor basis is re-anchored every
// 256 steps (≈ 256·1e-16). 1e-9 leaves a wide margin yet catches any modelling slip (a wrong phase
// origin or time step shows up at 1e-3 or more).
const SYNTHETIC_RELATIVE = 1e-9;
// Phase in degrees for the same reason (1e-9 rad ≈ 6e-8 degrees).
const SYNTHETIC_PHASE_DEG = 1e-7;
// Our fit and numpy's lstsq solve the same least-squares problem in float64 by different routes
// (normal equations vs. SVD); their answers differ by rounding amplified by the design matrix's
// condition number (< 10 here), ~1e-13. 1e-9 relative keeps a wide margin.
const NUMPY_RELATIVE = 1e-9;
// Residual RMS against numpy's direct sqrt(mean((y − Xβ)²)): our value comes from the sums, so the
// cancellation between Σy² and the fitted part costs digits; with the refinement pass the result
// keeps about 7 or more. 1e-6 relative.
const RESIDUAL_RELATIVE = 1e-6;
// Four-parameter fit against scipy.optimize.least_squares (MINPACK 'lm', tolerances 1e-15): both
// stop within ~1e-12 relative of the same optimum.
const FREQUENCY_RELATIVE = 1e-10;

/** Seeded Gaussian noise (Box–Muller over pure-rand's xoroshiro128+). */
function gaussianSource(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  return () => Math.sqrt(-2 * Math.log(1 - uniformFloat64(rng))) * Math.cos(2 * Math.PI * uniformFloat64(rng));
}

interface SynthesisedRecord {
  samples: Float64Array;
  sampleRateHz: number;
  frequencyHz: number;
  startTimeS: number;
}

/** offset + amplitude·cos(2πft + phase) + harmonics 2 and 3 + Gaussian noise. */
function synthesise(options: {
  count: number;
  sampleRateHz: number;
  frequencyHz: number;
  amplitude: number;
  phaseDeg: number;
  offset: number;
  harmonics?: [number, number];
  noiseRms?: number;
  startTimeS?: number;
  seed?: number;
}): SynthesisedRecord {
  const { count, sampleRateHz, frequencyHz, amplitude, phaseDeg, offset, harmonics = [0, 0], noiseRms = 0, startTimeS = 0 } = options;
  const gaussian = gaussianSource(options.seed ?? 1);
  const samples = new Float64Array(count);
  const phase = (phaseDeg * Math.PI) / 180;
  for (let n = 0; n < count; n++) {
    const angle = 2 * Math.PI * frequencyHz * (startTimeS + n / sampleRateHz) + phase;
    samples[n] =
      offset +
      amplitude * Math.cos(angle) +
      harmonics[0] * Math.cos(2 * angle + 0.3) +
      harmonics[1] * Math.sin(3 * angle) +
      noiseRms * gaussian();
  }
  return { samples, sampleRateHz, frequencyHz, startTimeS };
}

// The outside references, run in one python3 process for all jobs of this file (each process
// start costs about a second):
// - kind "three": numpy.linalg.lstsq on the design matrix [cos, sin, 1] of IEEE Std 1057's
//   three-parameter model, the residual computed directly from the samples;
// - kind "four": scipy.optimize.least_squares (MINPACK Levenberg–Marquardt, tolerances 1e-15) on
//   a·cos(ωt) + b·sin(ωt) + c with ω free, started from numpy's three-parameter fit at the start
//   frequency; then numpy's three-parameter fit at the frequency scipy found.
const PYTHON_REFERENCES = `
import sys, json
import numpy as np
from scipy.optimize import least_squares

def design(w, t):
    return np.column_stack([np.cos(w * t), np.sin(w * t), np.ones(t.size)])

def three(y, t, f):
    X = design(2 * np.pi * f, t)
    beta, *_ = np.linalg.lstsq(X, y, rcond=None)
    r = y - X @ beta
    return {'frequencyHz': f, 'a': beta[0], 'b': beta[1], 'c': beta[2], 'residualRms': float(np.sqrt(np.mean(r * r)))}

def four(y, t, f0):
    tc = t - t.mean()
    w0 = 2 * np.pi * f0
    b0, *_ = np.linalg.lstsq(design(w0, tc), y, rcond=None)
    def residual(p):
        return p[0] * np.cos(p[3] * tc) + p[1] * np.sin(p[3] * tc) + p[2] - y
    def jacobian(p):
        c, s = np.cos(p[3] * tc), np.sin(p[3] * tc)
        return np.column_stack([c, s, np.ones(tc.size), tc * (p[1] * c - p[0] * s)])
    sol = least_squares(residual, [b0[0], b0[1], b0[2], w0], jac=jacobian, method='lm',
                        xtol=1e-15, ftol=1e-15, gtol=1e-15, x_scale='jac')
    return three(y, t, sol.x[3] / (2 * np.pi))

results = []
for job in json.load(sys.stdin):
    y = np.array(job['samples'], dtype=np.float64)
    t = job['startTimeS'] + np.arange(y.size) / job['sampleRateHz']
    results.append(three(y, t, job['frequencyHz']) if job['kind'] == 'three' else four(y, t, job['frequencyHz']))
print(json.dumps(results))
`;

interface ReferenceFit {
  frequencyHz: number;
  a: number;
  b: number;
  c: number;
  residualRms: number;
}

interface ReferenceJob {
  kind: 'three' | 'four';
  samples: SampleArray;
  sampleRateHz: number;
  /** Known frequency (three) or start frequency (four), Hz. */
  frequencyHz: number;
  startTimeS: number;
}

/** Runs all jobs in one python3 process on first use; later calls read the stored answers. */
function referenceRunner(jobs: Record<string, ReferenceJob>): (name: string) => ReferenceFit {
  let answers: Map<string, ReferenceFit> | null = null;
  return (name) => {
    if (answers === null) {
      const names = Object.keys(jobs);
      const input = names.map((key) => ({ ...jobs[key], samples: Array.from(jobs[key].samples) }));
      const output = runPython<ReferenceFit[]>(PYTHON_REFERENCES, input);
      answers = new Map(names.map((key, index) => [key, output[index]]));
    }
    return answers.get(name)!;
  };
}

function expectRelative(actual: number, expected: number, relative: number, scale = Math.abs(expected)): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(relative * scale);
}

function expectInputError(action: () => unknown, field: string, message: RegExp): void {
  let caught: unknown;
  try {
    action();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(EngineInputError);
  expect((caught as EngineInputError).location.field).toBe(field);
  expect((caught as EngineInputError).message).toMatch(message);
}

// Records with a non-integer number of cycles, a dc offset, harmonics and noise.
const records = {
  many: synthesise({
    count: 20_000, sampleRateHz: 10_000, frequencyHz: 123.456, amplitude: 1.5, phaseDeg: 33, offset: 0.3,
    harmonics: [0.01, 0.005], noiseRms: 0.001, seed: 11,
  }),
  few: synthesise({
    count: 500, sampleRateHz: 1000, frequencyHz: 6.8, amplitude: 0.7, phaseDeg: -120, offset: 2,
    harmonics: [0.05, 0.02], noiseRms: 0.01, seed: 12,
  }),
  shiftedOrigin: synthesise({
    count: 3000, sampleRateHz: 48_000, frequencyHz: 1000.5, amplitude: 0.2, phaseDeg: 170, offset: -0.05,
    harmonics: [0.001, 0], noiseRms: 1e-4, startTimeS: 12.3456, seed: 13,
  }),
};
// Offset 100, amplitude 1, noise 1e-7: Σy² is about 1e18 times Σresidual².
const largeOffsetTinyNoise = synthesise({
  count: 100_000, sampleRateHz: 50_000, frequencyHz: 777.7, amplitude: 1, phaseDeg: 10, offset: 100, noiseRms: 1e-7, seed: 21,
});
// Residual 1e-3 of the signal: Σy²/Σresidual² ≈ 1e6, below the refinement threshold.
const moderateNoise = synthesise({
  count: 50_000, sampleRateHz: 50_000, frequencyHz: 1234.5, amplitude: 1, phaseDeg: 0, offset: 0.01, noiseRms: 1e-3, seed: 22,
});
const fewAsFloat32 = Float32Array.from(records.few.samples);

/** Start frequency for the four-parameter comparisons: 0.1 DFT bin above the true one. */
function startFrequency(record: SynthesisedRecord): number {
  return record.frequencyHz + (0.1 * record.sampleRateHz) / record.samples.length;
}

const reference = referenceRunner({
  ...Object.fromEntries(Object.entries(records).map(([name, record]) => [`three:${name}`, { kind: 'three' as const, ...record }])),
  ...Object.fromEntries(
    Object.entries(records).map(([name, record]) => [`four:${name}`, { kind: 'four' as const, ...record, frequencyHz: startFrequency(record) }]),
  ),
  'three:fewAsFloat32': { kind: 'three', ...records.few, samples: fewAsFloat32 },
  'three:largeOffsetTinyNoise': { kind: 'three', ...largeOffsetTinyNoise },
  'three:moderateNoise': { kind: 'three', ...moderateNoise },
});

describe('wrapDegrees', () => {
  it('wraps angles into (−180, 180]', () => {
    // Definition of the interval, no source needed.
    expect(wrapDegrees(270)).toBe(-90);
    expect(wrapDegrees(-180)).toBe(180);
    expect(wrapDegrees(180)).toBe(180);
    expect(wrapDegrees(540)).toBe(180);
    expect(wrapDegrees(-190)).toBe(170);
    expect(wrapDegrees(12.5)).toBe(12.5);
  });
});

describe('fitSineThreeParameter', () => {
  it('recovers amplitude, phase and offset of a noise-free sine with a non-integer number of cycles', () => {
    // Synthetic signal with known parameters: 2.5·cos(2π·50.37·t + 40°) + 0.75, 1000 samples at 1 kHz.
    const record = synthesise({ count: 1000, sampleRateHz: 1000, frequencyHz: 50.37, amplitude: 2.5, phaseDeg: 40, offset: 0.75 });
    const fit = fitSineThreeParameter(record.samples, { sampleRateHz: 1000, frequencyHz: 50.37 });
    expectRelative(fit.amplitude, 2.5, SYNTHETIC_RELATIVE);
    expect(Math.abs(fit.phaseDeg - 40)).toBeLessThan(SYNTHETIC_PHASE_DEG);
    expectRelative(fit.offset, 0.75, SYNTHETIC_RELATIVE);
    expect(fit.residualRms).toBeLessThan(SYNTHETIC_RELATIVE * 2.5);
    expect(fit.sampleCount).toBe(1000);
    expect(fit.frequencyHz).toBe(50.37);
  });

  it('stays exact close to half the sample rate and at only 4 cycles', () => {
    // Synthetic signals with known parameters: 0.9·cos(2πft + 63.025°) + 0.2 at 1 kHz sampling,
    // f = 473.1 and 499.2 Hz (near Nyquist, where the closed-form sums use their reflected form)
    // and 4 Hz over 1000 samples (4 cycles).
    for (const [count, frequencyHz] of [[1001, 473.1], [1000, 499.2], [1000, 4]] as const) {
      const samples = Float64Array.from({ length: count }, (_, n) => 0.9 * Math.cos((2 * Math.PI * frequencyHz * n) / 1000 + 1.1) + 0.2);
      const fit = fitSineThreeParameter(samples, { sampleRateHz: 1000, frequencyHz });
      expectRelative(fit.amplitude, 0.9, SYNTHETIC_RELATIVE);
      expect(Math.abs(fit.phaseDeg - (1.1 * 180) / Math.PI)).toBeLessThan(SYNTHETIC_PHASE_DEG);
      expectRelative(fit.offset, 0.2, SYNTHETIC_RELATIVE, 0.9);
    }
  });

  it('uses the cosine convention A·cos + B·sin with phase = atan2(−B, A)', () => {
    // Synthetic signal with known parameters: sin(ωt) = cos(ωt − 90°), so A = 0, B = 1, phase −90°.
    const samples = Float64Array.from({ length: 400 }, (_, n) => Math.sin((2 * Math.PI * 10.5 * n) / 400));
    const fit = fitSineThreeParameter(samples, { sampleRateHz: 400, frequencyHz: 10.5 });
    expect(Math.abs(fit.cosineCoefficient)).toBeLessThan(SYNTHETIC_RELATIVE);
    expectRelative(fit.sineCoefficient, 1, SYNTHETIC_RELATIVE);
    expect(Math.abs(fit.phaseDeg + 90)).toBeLessThan(SYNTHETIC_PHASE_DEG);
  });

  it('refers the phase to t = 0 of the time axis when the record starts later', () => {
    // Synthetic signal with known parameters: phase 170° at t = 0, record starting at 12.3456 s.
    const { samples, sampleRateHz, frequencyHz, startTimeS } = synthesise({
      count: 3000, sampleRateHz: 48_000, frequencyHz: 1000.5, amplitude: 0.2, phaseDeg: 170, offset: -0.05, startTimeS: 12.3456,
    });
    const fit = fitSineThreeParameter(samples, { sampleRateHz, frequencyHz, startTimeS });
    // 12.3456 s·1000.5 Hz = 12351.77 cycles before the record: rounding in that product (≈ 1e-12
    // cycles) and in the synthesis allow ~1e-6 degrees.
    expect(Math.abs(fit.phaseDeg - 170)).toBeLessThan(1e-6);
    expectRelative(fit.amplitude, 0.2, SYNTHETIC_RELATIVE);
  });

  it('gives the same result for Float32Array and Float64Array holding the same values', () => {
    const as32 = Float32Array.from(records.many.samples);
    const as64 = Float64Array.from(as32);
    const options = { sampleRateHz: records.many.sampleRateHz, frequencyHz: records.many.frequencyHz };
    const fit32 = fitSineThreeParameter(as32, options);
    const fit64 = fitSineThreeParameter(as64, options);
    // Identical inputs, identical arithmetic (common practice, no source): exact equality.
    expect(fit32).toEqual(fit64);
  });

  for (const [name, record] of Object.entries(records)) {
    it.skipIf(!hasNumpy)(`agrees with numpy.linalg.lstsq on [cos, sin, 1] for the "${name}" record (harmonics, offset, noise)`, () => {
      const numpy = reference(`three:${name}`);
      const fit = fitSineThreeParameter(record.samples, {
        sampleRateHz: record.sampleRateHz, frequencyHz: record.frequencyHz, startTimeS: record.startTimeS,
      });
      const amplitude = Math.hypot(numpy.a, numpy.b);
      expectRelative(fit.cosineCoefficient, numpy.a, NUMPY_RELATIVE, amplitude);
      expectRelative(fit.sineCoefficient, numpy.b, NUMPY_RELATIVE, amplitude);
      expectRelative(fit.offset, numpy.c, NUMPY_RELATIVE, amplitude + Math.abs(numpy.c));
      expectRelative(fit.residualRms, numpy.residualRms, RESIDUAL_RELATIVE);
    });
  }

  it.skipIf(!hasNumpy)('agrees with numpy on Float32Array samples', () => {
    const numpy = reference('three:fewAsFloat32');
    const fit = fitSineThreeParameter(fewAsFloat32, { sampleRateHz: records.few.sampleRateHz, frequencyHz: records.few.frequencyHz });
    const amplitude = Math.hypot(numpy.a, numpy.b);
    expectRelative(fit.cosineCoefficient, numpy.a, NUMPY_RELATIVE, amplitude);
    expectRelative(fit.sineCoefficient, numpy.b, NUMPY_RELATIVE, amplitude);
    expectRelative(fit.residualRms, numpy.residualRms, RESIDUAL_RELATIVE);
  });

  it.skipIf(!hasNumpy)('keeps the residual RMS accurate when it is 1e-9 of a large offset (no cancellation loss)', () => {
    const record = largeOffsetTinyNoise;
    const numpy = reference('three:largeOffsetTinyNoise');
    const fit = fitSineThreeParameter(record.samples, { sampleRateHz: record.sampleRateHz, frequencyHz: record.frequencyHz });
    expectRelative(fit.residualRms, numpy.residualRms, RESIDUAL_RELATIVE);

    // The test can fail: the textbook shortcut Σy² − βᵀXᵀy over the same samples, summed in
    // float64, is far off here.
    let sumSquares = 0, projection = 0;
    const omega = (2 * Math.PI * record.frequencyHz) / record.sampleRateHz;
    for (let n = 0; n < record.samples.length; n++) {
      const y = record.samples[n];
      sumSquares += y * y;
      projection += y * (numpy.a * Math.cos(omega * n) + numpy.b * Math.sin(omega * n) + numpy.c);
    }
    const naiveRms = Math.sqrt(Math.max(0, sumSquares - projection) / record.samples.length);
    expect(Math.abs(naiveRms - numpy.residualRms)).toBeGreaterThan(0.01 * numpy.residualRms);
  });

  it.skipIf(!hasNumpy)('keeps the residual RMS accurate on the one-pass path (residual 1e-3 of the signal)', () => {
    const record = moderateNoise;
    const numpy = reference('three:moderateNoise');
    const fit = fitSineThreeParameter(record.samples, { sampleRateHz: record.sampleRateHz, frequencyHz: record.frequencyHz });
    expectRelative(fit.residualRms, numpy.residualRms, RESIDUAL_RELATIVE);
  });

  it('estimates the noise: the residual RMS of a sine in white noise matches the noise RMS', () => {
    // Synthetic signal with known parameters: noise RMS 0.01. The sample RMS of 100,000 Gaussian
    // values scatters by 1/sqrt(2n) ≈ 0.22 % relative; 1 % is over 4 standard deviations.
    const record = synthesise({
      count: 100_000, sampleRateHz: 100_000, frequencyHz: 3001.3, amplitude: 1, phaseDeg: 0, offset: 0, noiseRms: 0.01, seed: 23,
    });
    const fit = fitSineThreeParameter(record.samples, { sampleRateHz: record.sampleRateHz, frequencyHz: record.frequencyHz });
    expectRelative(fit.residualRms, 0.01, 0.01);
  });

  it('refuses fewer than 4 samples, a bad sample rate, a frequency outside (0, fs/2) and NaN samples', () => {
    const samples = Float64Array.from({ length: 100 }, (_, n) => Math.cos(n));
    expectInputError(() => fitSineThreeParameter(new Float64Array(3), { sampleRateHz: 10, frequencyHz: 1 }), 'samples', /at least 4 samples, got 3/);
    expectInputError(() => fitSineThreeParameter(samples, { sampleRateHz: 0, frequencyHz: 1 }), 'sampleRateHz', /sample rate > 0/);
    expectInputError(() => fitSineThreeParameter(samples, { sampleRateHz: 100, frequencyHz: 50 }), 'frequencyHz', /0 < frequencyHz < sampleRateHz\/2 = 50 Hz, got 50/);
    expectInputError(() => fitSineThreeParameter(samples, { sampleRateHz: 100, frequencyHz: -1 }), 'frequencyHz', /got -1/);
    expectInputError(() => fitSineThreeParameter(samples, { sampleRateHz: 100, frequencyHz: Number.NaN }), 'frequencyHz', /got NaN/);
    expectInputError(() => fitSineThreeParameter(samples, { sampleRateHz: 100, frequencyHz: 5, startTimeS: Infinity }), 'startTimeS', /finite startTimeS/);
    const withNaN = samples.slice();
    withNaN[40] = Number.NaN;
    expectInputError(() => fitSineThreeParameter(withNaN, { sampleRateHz: 100, frequencyHz: 5 }), 'samples', /NaN or Infinity/);
    expectInputError(
      () => fitSineThreeParameter([1, 2, 3, 4, 5] as unknown as Float64Array, { sampleRateHz: 100, frequencyHz: 5 }),
      'samples',
      /Float64Array or Float32Array/,
    );
  });
});

describe('fitSineFourParameter', () => {
  it('finds the frequency of a noise-free sine from a start one fifth of a bin away', () => {
    // Synthetic signal with known parameters: 50.3 Hz, 1000 samples at 1 kHz (bin = 1 Hz), start 50.1 Hz.
    const record = synthesise({ count: 1000, sampleRateHz: 1000, frequencyHz: 50.3, amplitude: 1.2, phaseDeg: -75, offset: 0.1 });
    const fit = fitSineFourParameter(record.samples, { sampleRateHz: 1000, initialFrequencyHz: 50.1 });
    expectRelative(fit.frequencyHz, 50.3, SYNTHETIC_RELATIVE);
    expectRelative(fit.amplitude, 1.2, SYNTHETIC_RELATIVE);
    expect(Math.abs(fit.phaseDeg + 75)).toBeLessThan(1e-6);
    expectRelative(fit.offset, 0.1, SYNTHETIC_RELATIVE, 1.2);
    expect(fit.iterations).toBeGreaterThan(1);
  });

  it('converges on a long record from a start good only to a fraction of a bin of its first 65,536 samples', () => {
    // Synthetic signal with known parameters: 400,000 samples, start 0.2 bins (of 65,536) away.
    const record = synthesise({
      count: 400_000, sampleRateHz: 100_000, frequencyHz: 1234.567, amplitude: 1, phaseDeg: 20, offset: 0, noiseRms: 1e-4, seed: 31,
    });
    const fit = fitSineFourParameter(record.samples, { sampleRateHz: 100_000, initialFrequencyHz: 1234.567 + (0.2 * 100_000) / 65_536 });
    // Noise 1e-4 over 400,000 samples: the frequency's standard deviation is about
    // sqrt(12)·σ/(2π·A·T·sqrt(n)) ≈ 2e-8 Hz (Cramér–Rao bound, from memory); allow 1e-6 Hz.
    expect(Math.abs(fit.frequencyHz - 1234.567)).toBeLessThan(1e-6);
  });

  for (const [name, record] of Object.entries(records)) {
    it.skipIf(!hasNumpy)(`agrees with scipy.optimize.least_squares and numpy at scipy's frequency for the "${name}" record`, () => {
      const scipy = reference(`four:${name}`);
      const fit = fitSineFourParameter(record.samples, {
        sampleRateHz: record.sampleRateHz, initialFrequencyHz: startFrequency(record), startTimeS: record.startTimeS,
      });
      expectRelative(fit.frequencyHz, scipy.frequencyHz, FREQUENCY_RELATIVE);
      const amplitude = Math.hypot(scipy.a, scipy.b);
      // At the shared optimum the coefficients agree as closely as the frequencies allow: a
      // frequency difference δf moves the phase at time t by 360°·δf·t, which for the phase at
      // t = 0 of a record starting at startTimeS is extrapolated over the whole span.
      const spanS = record.startTimeS + record.samples.length / record.sampleRateHz;
      const phaseToleranceDeg = 360 * FREQUENCY_RELATIVE * record.frequencyHz * spanS + 1e-6;
      expectRelative(fit.amplitude, amplitude, 1e-7);
      expectRelative(fit.offset, scipy.c, 1e-7, amplitude + Math.abs(scipy.c));
      const scipyPhaseDeg = (Math.atan2(-scipy.b, scipy.a) * 180) / Math.PI;
      expect(Math.abs(wrapDegrees(fit.phaseDeg - scipyPhaseDeg))).toBeLessThan(phaseToleranceDeg);
      expectRelative(fit.residualRms, scipy.residualRms, RESIDUAL_RELATIVE);
    });
  }

  it('never leaves a higher residual than the three-parameter fit at the true frequency', () => {
    // The four-parameter fit minimises over the frequency too (IEEE Std 1057), so its residual is
    // at most that of any fixed frequency, the true one included (definition of the optimum).
    const record = records.few;
    const four = fitSineFourParameter(record.samples, { sampleRateHz: record.sampleRateHz, initialFrequencyHz: 6.7 });
    const three = fitSineThreeParameter(record.samples, { sampleRateHz: record.sampleRateHz, frequencyHz: record.frequencyHz });
    expect(four.residualRms).toBeLessThanOrEqual(three.residualRms * (1 + 1e-12));
  });

  it('refuses too few samples, a start frequency outside (0, fs/2), and a record without a sine', () => {
    expectInputError(() => fitSineFourParameter(new Float64Array(4), { sampleRateHz: 10, initialFrequencyHz: 1 }), 'samples', /at least 5 samples/);
    const samples = Float64Array.from({ length: 100 }, (_, n) => Math.cos(n));
    expectInputError(() => fitSineFourParameter(samples, { sampleRateHz: 100, initialFrequencyHz: 60 }), 'initialFrequencyHz', /got 60/);
    expectInputError(() => fitSineFourParameter(new Float64Array(100), { sampleRateHz: 100, initialFrequencyHz: 10 }), 'samples', /no resolvable sine|left the band|did not converge/);
  });
});
