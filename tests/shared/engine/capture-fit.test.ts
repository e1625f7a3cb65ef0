import { describe, expect, it } from 'vitest';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { fitCapture, MIN_CAPTURE_CYCLES, type CaptureRecord } from '../../../shared/engine/capture-fit';
import { EngineInputError, type InputLocation } from '../../../shared/engine/errors';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

// Noise-free synthetic channels are recovered to rounding (see sine-fit.test.ts): 1e-9 relative.
const SYNTHETIC_RELATIVE = 1e-9;
const SYNTHETIC_PHASE_DEG = 1e-6;
// Against numpy on the same records: both solve the same least-squares problems in float64; gain
// and phase differences come from rounding only (~1e-13). 1e-9 relative, 1e-7 degrees.
const NUMPY_RELATIVE = 1e-9;
const NUMPY_PHASE_DEG = 1e-7;
// With the frequency estimated, ours and scipy's least_squares stop within ~1e-12 relative of the
// same optimum; gain and phase then agree to about 1e-8 (phase referred to t = 0 near the record).
const ESTIMATED_RELATIVE = 1e-8;
const ESTIMATED_PHASE_DEG = 1e-5;

interface ChannelSpec {
  amplitude: number;
  phaseDeg: number;
  offset?: number;
  harmonic?: number;
  noise?: number;
}

function channel(count: number, sampleRateHz: number, frequencyHz: number, spec: ChannelSpec, seed: number): Float64Array {
  const rng = xoroshiro128plus(seed);
  const phase = (spec.phaseDeg * Math.PI) / 180;
  return Float64Array.from({ length: count }, (_, n) => {
    const angle = (2 * Math.PI * frequencyHz * n) / sampleRateHz + phase;
    return (
      (spec.offset ?? 0) +
      spec.amplitude * (Math.cos(angle) + (spec.harmonic ?? 0) * Math.cos(2 * angle + 1)) +
      (spec.noise ?? 0) * (uniformFloat64(rng) - 0.5)
    );
  });
}

function record(count: number, sampleRateHz: number, frequencyHz: number, input: ChannelSpec, output: ChannelSpec): CaptureRecord {
  return {
    input: channel(count, sampleRateHz, frequencyHz, input, 1),
    output: channel(count, sampleRateHz, frequencyHz, output, 2),
    sampleRateHz,
    file: 'hrb204-0007.wav',
  };
}

function expectInputError(action: () => unknown, location: InputLocation, message: RegExp): void {
  let caught: unknown;
  try {
    action();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(EngineInputError);
  expect((caught as EngineInputError).location).toEqual(location);
  expect((caught as EngineInputError).message).toMatch(message);
}

function phaseDifferenceDeg(a: number, b: number): number {
  return Math.abs(((((a - b) % 360) + 540) % 360) - 180);
}

describe('fitCapture', () => {
  it('gives gain and phase of a known output/input pair at a given frequency', () => {
    // Synthetic signal with known parameters: input 1·cos(ωt), output 0.5·cos(ωt − 30°) + 0.1,
    // 1 kHz at 48 kHz for 4,321 samples (90.02 cycles).
    const capture = record(4321, 48_000, 1000, { amplitude: 1, phaseDeg: 0 }, { amplitude: 0.5, phaseDeg: -30, offset: 0.1 });
    const fit = fitCapture(capture, { frequencyHz: 1000 });
    expect(Math.abs(fit.gain - 0.5)).toBeLessThan(SYNTHETIC_RELATIVE);
    // 20·log10(0.5) = −6.0205999… dB (arithmetic).
    expect(Math.abs(fit.gainDb - 20 * Math.log10(0.5))).toBeLessThan(1e-8);
    expect(Math.abs(fit.phaseDeg + 30)).toBeLessThan(SYNTHETIC_PHASE_DEG);
    expect(Math.abs(fit.output.offset - 0.1)).toBeLessThan(SYNTHETIC_RELATIVE);
    expect(fit).toMatchObject({ frequencyHz: 1000, frequencySource: 'given', sampleRateHz: 48_000, samples: 4321 });
    // 1000 Hz · 4321 / 48000 Hz = 90.0208… cycles (arithmetic).
    expect(fit.cycles).toBeCloseTo((1000 * 4321) / 48_000, 12);
  });

  it('estimates the frequency from the input when none is given and fits both channels at it', () => {
    // Synthetic signal with known parameters: 997.3 Hz, gain 12.5, output leading by 95°.
    const capture = record(20_000, 48_000, 997.3, { amplitude: 0.08, phaseDeg: 20 }, { amplitude: 1, phaseDeg: 115, offset: -0.02 });
    const fit = fitCapture(capture);
    expect(fit.frequencySource).toBe('estimated');
    expect(Math.abs(fit.frequencyHz - 997.3)).toBeLessThan(SYNTHETIC_RELATIVE * 997.3);
    expect(Math.abs(fit.gain - 12.5)).toBeLessThan(SYNTHETIC_RELATIVE * 12.5);
    expect(Math.abs(fit.phaseDeg - 95)).toBeLessThan(SYNTHETIC_PHASE_DEG);
  });

  it('wraps the phase difference into (−180, 180]', () => {
    // Synthetic signal with known parameters: input at 170°, output at −170°: −340° wraps to +20°.
    const capture = record(2000, 10_000, 123.4, { amplitude: 1, phaseDeg: 170 }, { amplitude: 2, phaseDeg: -170 });
    const fit = fitCapture(capture, { frequencyHz: 123.4 });
    expect(Math.abs(fit.phaseDeg - 20)).toBeLessThan(SYNTHETIC_PHASE_DEG);
  });

  it('accepts Float32Array channels (WAV data) and reports an exactly zero output as gain 0, −Infinity dB', () => {
    const capture = record(1000, 1000, 51.3, { amplitude: 0.5, phaseDeg: 0 }, { amplitude: 0, phaseDeg: 0 });
    const fit = fitCapture({ ...capture, input: Float32Array.from(capture.input), output: new Float32Array(1000) }, { frequencyHz: 51.3 });
    expect(fit.gain).toBe(0);
    expect(fit.gainDb).toBe(-Infinity);
  });

  // Records with harmonics, offsets, noise and a non-integer number of cycles.
  const dirty = {
    differential: record(
      6000, 50_000, 1003.7,
      { amplitude: 0.1, phaseDeg: 12, offset: 0.002, harmonic: 0.01, noise: 0.001 },
      { amplitude: 1.02, phaseDeg: 11.2, offset: -0.03, harmonic: 0.002, noise: 0.002 },
    ),
    commonMode: record(
      3000, 10_000, 49.87,
      { amplitude: 2, phaseDeg: -40, offset: 0.01, harmonic: 0.001, noise: 0.01 },
      { amplitude: 0.0005, phaseDeg: 51, offset: 0.0015, noise: 0.0001 },
    ),
  };

  // numpy/scipy reference: numpy.linalg.lstsq on [cos, sin, 1] for each channel at the frequency
  // (given, or from scipy.optimize.least_squares on the input channel's four-parameter model);
  // gain = ratio of amplitudes, phase = difference of atan2(−b, a), wrapped.
  const PYTHON_CAPTURE = `
import sys, json
import numpy as np
from scipy.optimize import least_squares
def three(y, t, f):
    X = np.column_stack([np.cos(2 * np.pi * f * t), np.sin(2 * np.pi * f * t), np.ones(t.size)])
    beta, *_ = np.linalg.lstsq(X, y, rcond=None)
    return beta
out = []
for job in json.load(sys.stdin):
    x, y = np.array(job['input']), np.array(job['output'])
    t = np.arange(x.size) / job['sampleRateHz']
    f = job['frequencyHz']
    if job['estimate']:
        tc = t - t.mean()
        b0 = three(x, tc, f)
        res = lambda p: p[0] * np.cos(p[3] * tc) + p[1] * np.sin(p[3] * tc) + p[2] - x
        sol = least_squares(res, [b0[0], b0[1], b0[2], 2 * np.pi * f], method='lm', xtol=1e-15, ftol=1e-15, gtol=1e-15, x_scale='jac')
        f = sol.x[3] / (2 * np.pi)
    bi, bo = three(x, t, f), three(y, t, f)
    phase = np.degrees(np.arctan2(-bo[1], bo[0]) - np.arctan2(-bi[1], bi[0]))
    phase = (phase + 180) % 360 - 180
    out.append({'frequencyHz': f, 'gain': float(np.hypot(bo[0], bo[1]) / np.hypot(bi[0], bi[1])), 'phaseDeg': float(phase)})
print(json.dumps(out))
`;

  it.skipIf(!hasNumpy)('agrees with numpy (given frequency) and scipy + numpy (estimated frequency) on noisy records with harmonics', () => {
    const jobs = Object.entries(dirty).flatMap(([name, capture]) => {
      const nominalHz = name === 'differential' ? 1003.7 : 49.87;
      return [false, true].map((estimate) => ({
        name, estimate, input: Array.from(capture.input), output: Array.from(capture.output),
        sampleRateHz: capture.sampleRateHz,
        // The estimate starts where the spectrum puts it; nominal + 0.05 bin stands in for it.
        frequencyHz: estimate ? nominalHz + (0.05 * capture.sampleRateHz) / capture.input.length : nominalHz,
      }));
    });
    const references = runPython<{ frequencyHz: number; gain: number; phaseDeg: number }[]>(PYTHON_CAPTURE, jobs);
    jobs.forEach((job, index) => {
      const capture = dirty[job.name as keyof typeof dirty];
      const reference = references[index];
      const fit = job.estimate ? fitCapture(capture) : fitCapture(capture, { frequencyHz: job.frequencyHz });
      const [relative, phaseDeg] = job.estimate ? [ESTIMATED_RELATIVE, ESTIMATED_PHASE_DEG] : [NUMPY_RELATIVE, NUMPY_PHASE_DEG];
      expect(Math.abs(fit.frequencyHz - reference.frequencyHz)).toBeLessThanOrEqual(relative * reference.frequencyHz);
      expect(Math.abs(fit.gain - reference.gain)).toBeLessThanOrEqual(relative * reference.gain);
      expect(phaseDifferenceDeg(fit.phaseDeg, reference.phaseDeg)).toBeLessThanOrEqual(phaseDeg);
    });
  });

  it(`refuses a capture with fewer than ${MIN_CAPTURE_CYCLES} cycles, given or estimated`, () => {
    // 2.9 cycles: 29 Hz over 0.1 s.
    const short = record(1000, 10_000, 29, { amplitude: 1, phaseDeg: 0 }, { amplitude: 1, phaseDeg: 0 });
    expectInputError(
      () => fitCapture(short, { frequencyHz: 29 }),
      { file: 'hrb204-0007.wav', field: 'frequencyHz' },
      /only 2\.90 cycles of the given 29\.0000 Hz \(1000 samples at 10000 Hz\); at least 3 cycles are needed/,
    );
    const shorter = record(1000, 10_000, 20, { amplitude: 1, phaseDeg: 0 }, { amplitude: 1, phaseDeg: 0 });
    expectInputError(() => fitCapture(shorter), { file: 'hrb204-0007.wav', field: 'frequencyHz' }, /cycles of the estimated .* at least 3 cycles/);
  });

  it('refuses an input channel without a sine: all zeros, constant, or noise only', () => {
    const file = 'hrb204-0007.wav';
    const base = record(2000, 10_000, 100, { amplitude: 1, phaseDeg: 0 }, { amplitude: 1, phaseDeg: 0 });
    expectInputError(
      () => fitCapture({ ...base, input: new Float64Array(2000) }, { frequencyHz: 100 }),
      { file, field: 'input' },
      /input channel has no sine at 100\.000 Hz above its noise \(amplitude 0\.00/,
    );
    expectInputError(() => fitCapture({ ...base, input: new Float64Array(2000).fill(0.3) }, { frequencyHz: 100 }), { file, field: 'input' }, /no sine/);
    const noise = channel(2000, 10_000, 100, { amplitude: 0, phaseDeg: 0, noise: 1 }, 5);
    expectInputError(() => fitCapture({ ...base, input: noise }, { frequencyHz: 100 }), { file, field: 'input' }, /no sine/);
    expectInputError(() => fitCapture({ ...base, input: new Float64Array(2000) }), { file, field: 'input' }, /input channel: .*no spectral peak/);
  });

  it('refuses channels of different length, a frequency outside (0, fs/2) and a bad sample rate', () => {
    const file = 'hrb204-0007.wav';
    const base = record(2000, 10_000, 100, { amplitude: 1, phaseDeg: 0 }, { amplitude: 1, phaseDeg: 0 });
    expectInputError(() => fitCapture({ ...base, output: base.output.subarray(1) }), { file, field: 'output' }, /equal length, got 2000 and 1999/);
    expectInputError(() => fitCapture(base, { frequencyHz: 5000 }), { file, field: 'frequencyHz' }, /below half the sample rate \(5000 Hz\), got 5000/);
    expectInputError(() => fitCapture(base, { frequencyHz: 0 }), { file, field: 'frequencyHz' }, /above 0/);
    expectInputError(() => fitCapture({ ...base, sampleRateHz: Number.NaN }), { file, field: 'sampleRateHz' }, /sample rate > 0 Hz, got NaN/);
  });

  it('names the channel when its samples hold NaN', () => {
    const base = record(2000, 10_000, 100, { amplitude: 1, phaseDeg: 0 }, { amplitude: 1, phaseDeg: 0 });
    const output = base.output.slice();
    output[7] = Number.NaN;
    expectInputError(() => fitCapture({ ...base, output }, { frequencyHz: 100 }), { file: 'hrb204-0007.wav', field: 'output' }, /^hrb204-0007\.wav, field "output": output channel: fitSineThreeParameter: the samples contain NaN/);
  });
});
