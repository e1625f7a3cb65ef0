// Frequency of the strongest tone in a record from the peak of its Hann-windowed, zero-padded
// spectrum, interpolated between bins: the start value of the four-parameter sine fit
// (IEEE Std 1057 starts that fit from a DFT estimate).
//
// No FFT package is installed for the engine, so a small radix-2 FFT lives here; a real record of
// length M is transformed as M/2 complex points and split afterwards, which halves the work.
import { EngineInputError } from './errors';
import type { SampleArray } from './sine-fit';

/** Result of estimateFrequencyFromSpectrum. */
export interface SpectrumPeak {
  /** Interpolated frequency of the strongest tone (Hz). */
  frequencyHz: number;
  /** Resolution of the analysed segment, sampleRateHz/(samples used × decimation) (Hz). */
  resolutionHz: number;
  /** Number of points analysed (after decimation, before zero padding). */
  samplesUsed: number;
  /** Block-averaging factor applied before the transform (1 = none). */
  decimation: number;
  /** Length of the zero-padded transform. */
  fftLength: number;
}

/** Options of estimateFrequencyFromSpectrum. */
export interface SpectrumPeakOptions {
  /** Sample rate (Hz), > 0. */
  sampleRateHz: number;
  /** Longest segment analysed (points), default 16,384; longer records use their start. */
  maxSamples?: number;
}

// Peaks closer to 0 Hz than this many bins of the analysed segment are not searched: the window's
// leakage of what is left of the dc offset lives there.
const LOWEST_SEARCHED_BIN = 1.5;
// When the peak in the record's first segment lies below this many bins (few cycles in the
// segment), the whole record is analysed again after block averaging.
const FEW_CYCLES_BINS = 8;
// Zero padding: ×8 for short segments (cheap, and it makes the three-point interpolation nearly
// unbiased), ×2 for long ones (keeps the transform fast).
const SHORT_SEGMENT = 4096;

/**
 * In-place iterative radix-2 decimation-in-time FFT of (re, im), length a power of two.
 * X[k] = Σ x[n]·e^{−2πi·k·n/N}. Cost O(N log N).
 */
function fftInPlace(re: Float64Array, im: Float64Array): void {
  const size = re.length;
  for (let i = 1, j = 0; i < size; i++) {
    let bit = size >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      const tr = re[i]; re[i] = re[j]; re[j] = tr;
      const ti = im[i]; im[i] = im[j]; im[j] = ti;
    }
  }
  const half = size >> 1;
  const cosTable = new Float64Array(half);
  const sinTable = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    cosTable[k] = Math.cos((2 * Math.PI * k) / size);
    sinTable[k] = -Math.sin((2 * Math.PI * k) / size);
  }
  for (let length = 2; length <= size; length <<= 1) {
    const halfLength = length >> 1;
    const tableStep = size / length;
    for (let start = 0; start < size; start += length) {
      for (let k = 0, t = 0; k < halfLength; k++, t += tableStep) {
        const wr = cosTable[t];
        const wi = sinTable[t];
        const a = start + k;
        const b = a + halfLength;
        const xr = re[b] * wr - im[b] * wi;
        const xi = re[b] * wi + im[b] * wr;
        re[b] = re[a] - xr;
        im[b] = im[a] - xi;
        re[a] += xr;
        im[a] += xi;
      }
    }
  }
}

/**
 * Power spectrum of a real sequence: |X[k]|², X[k] = Σ x[n]·e^{−2πi·k·n/M}, k = 0 … M/2, for a
 * length M that is a power of two ≥ 4. Radix-2 Cooley–Tukey FFT of the M/2 complex points
 * x[2n] + i·x[2n+1], split into the real sequence's spectrum (the standard real-input packing,
 * e.g. Numerical Recipes' realft — from memory).
 *
 * @param real samples (any unit u)
 * @returns M/2 + 1 powers (unit u²)
 * Cost: O(M log M).
 * Throws RangeError when the length is not a power of two ≥ 4 (a programming error, not input).
 * Example: `realPowerSpectrum(Float64Array.of(1, 0, -1, 0))` → [0, 4, 0].
 */
export function realPowerSpectrum(real: Float64Array): Float64Array {
  const size = real.length;
  if (size < 4 || (size & (size - 1)) !== 0) {
    throw new RangeError(`realPowerSpectrum requires a power-of-two length ≥ 4, got ${size}`);
  }
  const half = size / 2;
  const re = new Float64Array(half);
  const im = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    re[k] = real[2 * k];
    im[k] = real[2 * k + 1];
  }
  fftInPlace(re, im);
  const power = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) {
    const zr = re[k % half], zi = im[k % half];
    const cr = re[(half - k) % half], ci = -im[(half - k) % half];
    // Even part E = (Z[k] + conj Z[N−k])/2, odd part O = (Z[k] − conj Z[N−k])/(2i)
    const er = (zr + cr) / 2, ei = (zi + ci) / 2;
    const or = (zi - ci) / 2, oi = -(zr - cr) / 2;
    const angle = (-2 * Math.PI * k) / size;
    const wr = Math.cos(angle), wi = Math.sin(angle);
    const xr = er + wr * or - wi * oi;
    const xi = ei + wr * oi + wi * or;
    power[k] = xr * xr + xi * xi;
  }
  return power;
}

function nextPowerOfTwo(value: number): number {
  let power = 1;
  while (power < value) power *= 2;
  return power;
}

interface PeakSearch {
  bin: number;
  paddedBins: number;
  fftLength: number;
}

/** Hann-windowed, weighted-mean-removed, zero-padded spectrum of `segment`; interpolated peak bin. */
function interpolatedPeak(segment: Float64Array): PeakSearch | null {
  const length = segment.length;
  const padding = length <= SHORT_SEGMENT ? 8 : 2;
  const fftLength = Math.max(4, nextPowerOfTwo(length) * padding);
  const window = new Float64Array(length);
  let weightSum = 0;
  let weightedSum = 0;
  for (let n = 0; n < length; n++) {
    // Hann window over the segment (symmetric form).
    const weight = 0.5 - 0.5 * Math.cos((2 * Math.PI * n) / (length - 1));
    window[n] = weight;
    weightSum += weight;
    weightedSum += weight * segment[n];
  }
  // Removing the window-weighted mean makes the dc bin exactly zero.
  const mean = weightedSum / weightSum;
  const padded = new Float64Array(fftLength);
  for (let n = 0; n < length; n++) padded[n] = window[n] * (segment[n] - mean);
  const power = realPowerSpectrum(padded);
  const paddedBins = fftLength / length;
  const firstBin = Math.max(1, Math.ceil(LOWEST_SEARCHED_BIN * paddedBins));
  let peak = -1;
  let peakPower = 0;
  for (let k = firstBin; k < power.length - 1; k++) {
    if (power[k] > peakPower) {
      peakPower = power[k];
      peak = k;
    }
  }
  if (peak < 0 || !(peakPower > 0)) return null;
  // Three-point parabolic interpolation of the log magnitude ("Gaussian" interpolation; see e.g.
  // J. O. Smith, Spectral Audio Signal Processing, quadratic interpolation of spectral peaks —
  // from memory). Halving the log turns powers into magnitudes; the vertex does not change.
  const left = Math.log(Math.max(power[peak - 1], Number.MIN_VALUE));
  const centre = Math.log(peakPower);
  const right = Math.log(Math.max(power[peak + 1], Number.MIN_VALUE));
  const curvature = left - 2 * centre + right;
  const offset = curvature < 0 ? (0.5 * (left - right)) / curvature : 0;
  return { bin: peak + Math.max(-0.5, Math.min(0.5, offset)), paddedBins, fftLength };
}

/**
 * Frequency of the strongest tone in a uniformly sampled record, from the interpolated peak of the
 * Hann-windowed, zero-padded DFT (window-weighted mean removed; parabolic interpolation of the log
 * magnitude between the three highest bins). Analyses the first `maxSamples` points; when the tone
 * has fewer than 8 cycles there, the whole record, block-averaged down to about `maxSamples`
 * points, is analysed instead. Accurate to a few hundredths of a bin of the analysed segment for a
 * clean tone, enough to start the four-parameter sine fit (fitSineFourParameter).
 *
 * @param samples one channel (any unit)
 * @param options sampleRateHz (Hz), maxSamples (points, default 16,384)
 * @returns frequencyHz (Hz), resolutionHz (Hz), samplesUsed, decimation, fftLength
 * Cost: O(M log M) with M ≤ 2·nextPow2(maxSamples) (8× padding below 4,096 points), plus O(n)
 * for block averaging when it is needed.
 * Throws EngineInputError for fewer than 8 samples, a bad sample rate, NaN/Infinity in the
 * samples, or a record with no peak (constant).
 * Example: `estimateFrequencyFromSpectrum(Float64Array.from({ length: 4096 }, (_, n) => Math.sin(2 * Math.PI * 123.4 * n / 4096)), { sampleRateHz: 4096 })`
 *   → frequencyHz ≈ 123.4.
 */
export function estimateFrequencyFromSpectrum(samples: SampleArray, options: SpectrumPeakOptions): SpectrumPeak {
  const functionName = 'estimateFrequencyFromSpectrum';
  const { sampleRateHz, maxSamples = 16_384 } = options;
  if (!Number.isFinite(sampleRateHz) || sampleRateHz <= 0) {
    throw new EngineInputError(`${functionName} requires a finite sample rate > 0 Hz, got ${sampleRateHz}`, {
      field: 'sampleRateHz',
    });
  }
  if (!Number.isInteger(maxSamples) || maxSamples < 8) {
    throw new EngineInputError(`${functionName} requires maxSamples to be an integer ≥ 8, got ${maxSamples}`, {
      field: 'maxSamples',
    });
  }
  if (samples.length < 8) {
    throw new EngineInputError(`${functionName} requires at least 8 samples, got ${samples.length}`, { field: 'samples' });
  }
  const firstLength = Math.min(samples.length, maxSamples);
  const first = Float64Array.from(samples.subarray(0, firstLength));
  for (let n = 0; n < firstLength; n++) {
    if (!Number.isFinite(first[n])) {
      throw new EngineInputError(`${functionName}: sample ${n} is ${first[n]}`, { field: 'samples' });
    }
  }
  let peak = interpolatedPeak(first);
  let decimation = 1;
  let samplesUsed = firstLength;
  if (samples.length > firstLength && (peak === null || peak.bin / peak.paddedBins < FEW_CYCLES_BINS)) {
    // Few cycles in the first segment: block-average the whole record (a boxcar low-pass, which is
    // harmless for a tone this slow) and look again.
    decimation = Math.ceil(samples.length / maxSamples);
    samplesUsed = Math.floor(samples.length / decimation);
    const averaged = new Float64Array(samplesUsed);
    for (let j = 0; j < samplesUsed; j++) {
      let sum = 0;
      for (let k = j * decimation, end = k + decimation; k < end; k++) sum += samples[k];
      averaged[j] = sum / decimation;
    }
    if (averaged.some((value) => !Number.isFinite(value))) {
      throw new EngineInputError(`${functionName}: the samples contain NaN or Infinity`, { field: 'samples' });
    }
    peak = interpolatedPeak(averaged);
  }
  if (peak === null) {
    throw new EngineInputError(`${functionName}: the record has no spectral peak (is it constant?)`, { field: 'samples' });
  }
  const decimatedRateHz = sampleRateHz / decimation;
  return {
    frequencyHz: (peak.bin * decimatedRateHz) / peak.fftLength,
    resolutionHz: decimatedRateHz / samplesUsed,
    samplesUsed,
    decimation,
    fftLength: peak.fftLength,
  };
}
