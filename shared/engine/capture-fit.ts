// Gain and phase of an amplifier from a two-channel capture (its input and output sampled
// together): both channels fitted with a sine of the same frequency (IEEE Std 1057 sine fits).
import { EngineInputError } from './errors';
import { fitSineFourParameter, fitSineThreeParameter, wrapDegrees, type SampleArray, type SineFit } from './sine-fit';
import { estimateFrequencyFromSpectrum } from './spectrum-peak';

/**
 * Fewest cycles of the fitted tone a capture must hold. Below about 3 cycles the sine, its dc
 * offset and (for the four-parameter fit) its frequency start to trade off against each other and
 * harmonics no longer average out, so amplitudes stop being trustworthy (common practice, no
 * source; IEEE Std 1057 fits are usually run on many more).
 */
export const MIN_CAPTURE_CYCLES = 3;

/**
 * The input amplitude must exceed this many times its noise-limited standard deviation
 * residualRms·sqrt(2/n) (white noise, from the least-squares covariance), or the input is taken
 * as having no signal: a gain divided by it would mean nothing. 10 leaves a false alarm on pure
 * noise practically impossible (common practice, no source).
 */
export const MIN_INPUT_SIGNAL_TO_UNCERTAINTY = 10;

/** A two-channel record, uniformly sampled. */
export interface CaptureRecord {
  /** Amplifier input samples (any unit; the output in the same unit). */
  input: SampleArray;
  /** Amplifier output samples, same length. */
  output: SampleArray;
  /** Sample rate (Hz). */
  sampleRateHz: number;
  /** Time of the first sample (s), phases refer to t = 0; default 0. */
  startTimeS?: number;
  /** File name for messages. */
  file?: string;
}

/** The fit of one channel. */
export interface ChannelFit {
  /** Peak amplitude, unit of the samples. */
  amplitude: number;
  /** Phase of amplitude·cos(2π·f·t + phase) at t = 0, degrees in (−180, 180]. */
  phaseDeg: number;
  /** Dc offset, unit of the samples. */
  offset: number;
  /** RMS of what the sine does not explain (noise, harmonics), unit of the samples. */
  residualRms: number;
}

/** Result of fitCapture. */
export interface CaptureFit {
  /** Frequency both channels were fitted at (Hz). */
  frequencyHz: number;
  /** 'given' by the caller, or 'estimated' by the four-parameter fit of the input channel. */
  frequencySource: 'given' | 'estimated';
  /** Output amplitude / input amplitude. */
  gain: number;
  /** 20·log10(gain) (dB); −Infinity when the output amplitude is exactly 0. */
  gainDb: number;
  /** Output phase − input phase, degrees in (−180, 180]. */
  phaseDeg: number;
  input: ChannelFit;
  output: ChannelFit;
  /** Sample rate (Hz). */
  sampleRateHz: number;
  /** Samples per channel. */
  samples: number;
  /** Cycles of the tone in the record: frequencyHz · samples / sampleRateHz. */
  cycles: number;
}

/** Options of fitCapture. */
export interface CaptureFitOptions {
  /** Known test frequency (Hz); when absent it is estimated from the input channel. */
  frequencyHz?: number;
}

function channelFit(fit: SineFit): ChannelFit {
  return { amplitude: fit.amplitude, phaseDeg: fit.phaseDeg, offset: fit.offset, residualRms: fit.residualRms };
}

/** Runs a fit, re-throwing its input errors with the file and channel named. */
function withChannel<T>(file: string | undefined, channel: 'input' | 'output', fit: () => T): T {
  try {
    return fit();
  } catch (error) {
    if (error instanceof EngineInputError) {
      // Drop the inner location prefix (`field "samples": `): the channel replaces it.
      const prefix = EngineInputError.describe('', error.location);
      const reason = error.message.startsWith(prefix) ? error.message.slice(prefix.length) : error.message;
      throw new EngineInputError(`${channel} channel: ${reason}`, { file, field: channel });
    }
    throw error;
  }
}

/**
 * Gain and phase of an amplifier from a two-channel capture. With a known frequency both channels
 * get the three-parameter sine fit of IEEE Std 1057 at it; otherwise the frequency comes from the
 * input channel (the drive, normally the cleaner signal): an interpolated peak of its Hann-windowed
 * spectrum starts the iterative four-parameter fit of IEEE Std 1057, and the output is then fitted
 * with the three-parameter fit at the frequency found, so both channels share one frequency.
 * gain = output amplitude / input amplitude, phaseDeg = output phase − input phase wrapped to
 * (−180, 180] (DOMAIN.md, sine fitting).
 *
 * @param record input and output samples (same unit, same length), sampleRateHz (Hz), startTimeS
 *   (s), file (for messages)
 * @param options frequencyHz (Hz), optional
 * @returns frequencyHz (Hz), frequencySource, gain, gainDb (dB), phaseDeg (degrees), per channel
 *   amplitude (peak), phaseDeg, offset, residualRms; sampleRateHz, samples, cycles
 * Cost: O(n): about 2 passes per channel with a given frequency; with an estimate, a spectrum of
 * at most 16,384 points plus about 3–6 passes over the input channel.
 * Throws EngineInputError (naming the file and the field or channel) when the channels differ in
 * length, the frequency is not within (0, sampleRateHz/2), the record holds fewer than
 * MIN_CAPTURE_CYCLES (3) cycles, the input channel has no sine above its noise (zero amplitude),
 * or a fit fails (NaN/Infinity, no convergence).
 * Example: `fitCapture({ input: sineAt1kHz, output: halfSineLagging30Deg, sampleRateHz: 48000 }, { frequencyHz: 1000 })`
 *   → gain 0.5, gainDb −6.02, phaseDeg −30.
 */
export function fitCapture(record: CaptureRecord, options: CaptureFitOptions = {}): CaptureFit {
  const { input, output, sampleRateHz, startTimeS = 0, file } = record;
  if (input.length !== output.length) {
    throw new EngineInputError(
      `fitCapture requires input and output of equal length, got ${input.length} and ${output.length}`,
      { file, field: 'output' },
    );
  }
  if (!Number.isFinite(sampleRateHz) || sampleRateHz <= 0) {
    throw new EngineInputError(`fitCapture requires a finite sample rate > 0 Hz, got ${sampleRateHz}`, {
      file,
      field: 'sampleRateHz',
    });
  }
  const samples = input.length;
  const durationS = samples / sampleRateHz;
  const checkCycles = (frequencyHz: number, how: string): void => {
    const cycles = frequencyHz * durationS;
    if (cycles < MIN_CAPTURE_CYCLES) {
      throw new EngineInputError(
        `the capture holds only ${cycles.toPrecision(3)} cycles of the ${how} ${frequencyHz.toPrecision(6)} Hz ` +
          `(${samples} samples at ${sampleRateHz} Hz); at least ${MIN_CAPTURE_CYCLES} cycles are needed`,
        { file, field: 'frequencyHz' },
      );
    }
  };

  let inputFit: SineFit;
  let frequencyHz: number;
  let frequencySource: CaptureFit['frequencySource'];
  if (options.frequencyHz !== undefined) {
    frequencyHz = options.frequencyHz;
    frequencySource = 'given';
    if (!Number.isFinite(frequencyHz) || frequencyHz <= 0 || frequencyHz >= sampleRateHz / 2) {
      throw new EngineInputError(
        `the frequency must be above 0 and below half the sample rate (${sampleRateHz / 2} Hz), got ${frequencyHz}`,
        { file, field: 'frequencyHz' },
      );
    }
    checkCycles(frequencyHz, 'given');
    inputFit = withChannel(file, 'input', () => fitSineThreeParameter(input, { sampleRateHz, frequencyHz, startTimeS }));
  } else {
    frequencySource = 'estimated';
    const start = withChannel(file, 'input', () => estimateFrequencyFromSpectrum(input, { sampleRateHz }));
    checkCycles(start.frequencyHz, 'estimated');
    inputFit = withChannel(file, 'input', () =>
      fitSineFourParameter(input, { sampleRateHz, initialFrequencyHz: start.frequencyHz, startTimeS }),
    );
    frequencyHz = inputFit.frequencyHz;
    checkCycles(frequencyHz, 'estimated');
  }
  const inputUncertainty = inputFit.residualRms * Math.sqrt(2 / samples);
  const zeroThreshold = 1e-12 * (Math.abs(inputFit.offset) + inputFit.amplitude);
  if (!(inputFit.amplitude > MIN_INPUT_SIGNAL_TO_UNCERTAINTY * inputUncertainty) || !(inputFit.amplitude > zeroThreshold)) {
    throw new EngineInputError(
      `the input channel has no sine at ${frequencyHz.toPrecision(6)} Hz above its noise (amplitude ` +
        `${inputFit.amplitude.toPrecision(3)}, residual RMS ${inputFit.residualRms.toPrecision(3)}); ` +
        'the gain needs a driven input',
      { file, field: 'input' },
    );
  }
  const outputFit = withChannel(file, 'output', () => fitSineThreeParameter(output, { sampleRateHz, frequencyHz, startTimeS }));
  const gain = outputFit.amplitude / inputFit.amplitude;
  return {
    frequencyHz,
    frequencySource,
    gain,
    gainDb: 20 * Math.log10(gain),
    phaseDeg: wrapDegrees(outputFit.phaseDeg - inputFit.phaseDeg),
    input: channelFit(inputFit),
    output: channelFit(outputFit),
    sampleRateHz,
    samples,
    cycles: frequencyHz * durationS,
  };
}
