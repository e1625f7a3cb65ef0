import { describe, expect, it } from 'vitest';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { EngineInputError } from '../../../shared/engine/errors';
import { estimateFrequencyFromSpectrum, realPowerSpectrum } from '../../../shared/engine/spectrum-peak';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

// Our radix-2 FFT against numpy.fft.rfft: both in float64 with O(log N) rounding growth; 1e-10 of
// the largest power bin is far above that (~1e-14) and far below any indexing or twiddle slip.
const FFT_RELATIVE = 1e-10;
// The same peak-picking recipe in numpy and here differs only by FFT rounding: 1e-9 relative.
const RECIPE_RELATIVE = 1e-9;
// A clean tone, Hann window, ≥ 2× zero padding and three-point log-parabola interpolation land
// within a few thousandths of a bin (measured here: ≤ 0.003 bin); 0.01 bin still starts the
// four-parameter fit with a wide margin (common practice, no source).
const CLEAN_TONE_BINS = 0.01;
// With harmonics, noise and an offset: 0.05 bin (common practice, no source).
const DIRTY_TONE_BINS = 0.05;

function uniformSource(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  return () => uniformFloat64(rng) - 0.5;
}

function tone(count: number, sampleRateHz: number, frequencyHz: number, extras: { offset?: number; harmonics?: number; noise?: number; seed?: number } = {}): Float64Array {
  const uniform = uniformSource(extras.seed ?? 3);
  return Float64Array.from({ length: count }, (_, n) => {
    const angle = (2 * Math.PI * frequencyHz * n) / sampleRateHz + 0.7;
    return (
      (extras.offset ?? 0) +
      Math.cos(angle) +
      (extras.harmonics ?? 0) * (Math.cos(2 * angle) + Math.cos(3 * angle + 1)) +
      (extras.noise ?? 0) * uniform()
    );
  });
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

describe('realPowerSpectrum', () => {
  it.skipIf(!hasNumpy)('equals |numpy.fft.rfft(x)|² for random real sequences of length 4, 64 and 4096', () => {
    const vectors = [4, 64, 4096].map((length) => {
      const uniform = uniformSource(length);
      return Float64Array.from({ length }, () => uniform());
    });
    // numpy reference: the power of the real-input FFT.
    const references = runPython<number[][]>(
      `
import sys, json
import numpy as np
print(json.dumps([(np.abs(np.fft.rfft(np.array(v))) ** 2).tolist() for v in json.load(sys.stdin)]))
`,
      vectors.map((vector) => Array.from(vector)),
    );
    vectors.forEach((vector, index) => {
      const power = realPowerSpectrum(vector);
      const reference = references[index];
      expect(power.length).toBe(reference.length);
      const largest = Math.max(...reference);
      reference.forEach((value, bin) => expect(Math.abs(power[bin] - value)).toBeLessThanOrEqual(FFT_RELATIVE * largest));
    });
  });

  it('refuses lengths that are not a power of two', () => {
    expect(() => realPowerSpectrum(new Float64Array(12))).toThrow(/power-of-two length ≥ 4, got 12/);
  });
});

describe('estimateFrequencyFromSpectrum', () => {
  it('finds clean tones between bins to within 0.01 bin', () => {
    // Synthetic signals with known parameters: tones at non-integer bins of 1000- and 16384-point records.
    for (const [count, cycles] of [[1000, 3.2], [1000, 47.31], [1000, 420.77], [16_384, 5000.5], [16_384, 12.25]]) {
      const sampleRateHz = 2000;
      const frequencyHz = (cycles * sampleRateHz) / count;
      const peak = estimateFrequencyFromSpectrum(tone(count, sampleRateHz, frequencyHz), { sampleRateHz });
      expect(peak.decimation).toBe(1);
      expect(peak.samplesUsed).toBe(count);
      expect(Math.abs(peak.frequencyHz - frequencyHz) / peak.resolutionHz).toBeLessThan(CLEAN_TONE_BINS);
    }
  });

  it('stays within 0.05 bin with a dc offset, harmonics and noise', () => {
    // Synthetic signals with known parameters: offset 3, harmonics at 2 % each, uniform noise ±0.05.
    for (const cycles of [3.4, 25.5, 300.1]) {
      const frequencyHz = (cycles * 1000) / 2000;
      const samples = tone(2000, 1000, frequencyHz, { offset: 3, harmonics: 0.02, noise: 0.1, seed: Math.round(cycles * 10) });
      const peak = estimateFrequencyFromSpectrum(samples, { sampleRateHz: 1000 });
      expect(Math.abs(peak.frequencyHz - frequencyHz) / peak.resolutionHz).toBeLessThan(DIRTY_TONE_BINS);
    }
  });

  it('analyses the first maxSamples points of a long record', () => {
    // Synthetic signal with known parameters: 100,000 points, 1234.5 cycles.
    const frequencyHz = (1234.5 * 50_000) / 100_000;
    const peak = estimateFrequencyFromSpectrum(tone(100_000, 50_000, frequencyHz), { sampleRateHz: 50_000 });
    expect(peak.samplesUsed).toBe(16_384);
    expect(peak.decimation).toBe(1);
    expect(peak.fftLength).toBe(32_768);
    expect(Math.abs(peak.frequencyHz - frequencyHz) / peak.resolutionHz).toBeLessThan(CLEAN_TONE_BINS);
  });

  it('block-averages the whole record when its first segment holds fewer than 8 cycles', () => {
    // Synthetic signal with known parameters: 1,000,000 points holding 3.3 cycles (0.05 in the first 16,384).
    const frequencyHz = 3.3;
    const peak = estimateFrequencyFromSpectrum(tone(1_000_000, 1_000_000, frequencyHz, { offset: 1 }), { sampleRateHz: 1_000_000 });
    expect(peak.decimation).toBe(62);
    expect(Math.abs(peak.frequencyHz - frequencyHz) / peak.resolutionHz).toBeLessThan(CLEAN_TONE_BINS);
  });

  it.skipIf(!hasNumpy)('matches the same recipe written with numpy (Hann, weighted mean removed, zero padding, log-parabola)', () => {
    const samples = tone(3000, 3000, 123.4567, { offset: 0.5, harmonics: 0.01, noise: 0.02, seed: 9 });
    // numpy reference of the documented recipe: symmetric Hann window over the segment, window-
    // weighted mean removed, zero padding to 2·nextpow2(n) (8× below 4096 points), peak above
    // 1.5 segment bins, parabola through the log magnitudes of the three highest bins.
    const reference = runPython<{ frequencyHz: number }>(
      `
import sys, json
import numpy as np
d = json.load(sys.stdin)
y = np.array(d['samples'])
n = y.size
w = 0.5 - 0.5 * np.cos(2 * np.pi * np.arange(n) / (n - 1))
x = w * (y - np.sum(w * y) / np.sum(w))
m = 1 << int(np.ceil(np.log2(n)))
m *= 8 if n <= 4096 else 2
p = np.abs(np.fft.rfft(x, m)) ** 2
first = int(np.ceil(1.5 * m / n))
k = first + int(np.argmax(p[first:-1]))
l, c, r = np.log(p[k - 1]), np.log(p[k]), np.log(p[k + 1])
print(json.dumps({'frequencyHz': (k + 0.5 * (l - r) / (l - 2 * c + r)) * d['sampleRateHz'] / m}))
`,
      { samples: Array.from(samples), sampleRateHz: 3000 },
    );
    const peak = estimateFrequencyFromSpectrum(samples, { sampleRateHz: 3000 });
    expect(Math.abs(peak.frequencyHz - reference.frequencyHz)).toBeLessThanOrEqual(RECIPE_RELATIVE * reference.frequencyHz);
  });

  it('refuses short records, bad options, NaN samples and a constant record', () => {
    expectInputError(() => estimateFrequencyFromSpectrum(new Float64Array(7), { sampleRateHz: 10 }), 'samples', /at least 8 samples, got 7/);
    expectInputError(() => estimateFrequencyFromSpectrum(new Float64Array(100), { sampleRateHz: -1 }), 'sampleRateHz', /sample rate > 0/);
    expectInputError(
      () => estimateFrequencyFromSpectrum(new Float64Array(100), { sampleRateHz: 10, maxSamples: 4 }),
      'maxSamples',
      /integer ≥ 8, got 4/,
    );
    const withNaN = tone(100, 100, 10);
    withNaN[50] = Number.NaN;
    expectInputError(() => estimateFrequencyFromSpectrum(withNaN, { sampleRateHz: 100 }), 'samples', /sample 50 is NaN/);
    expectInputError(() => estimateFrequencyFromSpectrum(new Float64Array(100).fill(2), { sampleRateHz: 100 }), 'samples', /no spectral peak/);
  });
});
