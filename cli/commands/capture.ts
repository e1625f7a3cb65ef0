// `rejectra capture FILE [--frequency HZ] [--json]`: gain and phase of an amplifier from a
// two-channel capture (CSV `time_s,input_v,output_v`, or a stereo WAV with left = input and
// right = output), by IEEE Std 1057 sine fits of both channels at one frequency.
import { readFileSync } from 'node:fs';
import { parseCaptureFile } from '../../shared/engine/capture-file';
import { fitCapture, type ChannelFit } from '../../shared/engine/capture-fit';
import { EngineInputError } from '../../shared/engine/errors';
import { parseCommandArgs } from '../parse-command-args';
import { formatTable } from '../table';

const usage = 'usage: rejectra capture FILE [--frequency HZ] [--json]\n';

// A plain decimal number, as the CSV reader accepts ("1e3" yes, "1k", "0x10" or "" no).
const decimalNumber = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** JSON without non-finite numbers (JSON has none): they become null. */
function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function channelJson(channel: ChannelFit): Record<string, number | null> {
  return {
    amplitude: finiteOrNull(channel.amplitude),
    phaseDeg: finiteOrNull(channel.phaseDeg),
    offset: finiteOrNull(channel.offset),
    residualRms: finiteOrNull(channel.residualRms),
  };
}

function formatNumber(value: number, significant = 6): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  return magnitude >= 1e-3 && magnitude < 1e7 ? Number(value.toPrecision(significant)).toString() : value.toExponential(significant - 1);
}


export async function run(args: string[]): Promise<number> {
  const parsed = parseCommandArgs('capture', usage, {
    args,
    allowPositionals: true,
    options: { frequency: { type: 'string' }, json: { type: 'boolean', default: false }, help: { type: 'boolean', short: 'h' } },
  });
  if (typeof parsed === 'number') return parsed;
  const { values, positionals } = parsed;
  if (positionals.length !== 1) {
    process.stderr.write(
      `rejectra capture: ${positionals.length === 0 ? 'missing FILE' : `expected one FILE, got ${positionals.length}`}\n${usage}`,
    );
    return 2;
  }
  const [file] = positionals;
  let frequencyHz: number | undefined;
  if (values.frequency !== undefined) {
    const text = values.frequency.trim();
    frequencyHz = decimalNumber.test(text) ? Number(text) : Number.NaN;
    if (!Number.isFinite(frequencyHz) || frequencyHz <= 0) {
      throw new EngineInputError(`"${values.frequency}" is not a frequency in Hz above 0`, { field: '--frequency' });
    }
  }
  let bytes: Uint8Array;
  try {
    bytes = readFileSync(file);
  } catch (error) {
    process.stderr.write(`rejectra capture: cannot read ${file}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}\n`);
    return 1;
  }
  const capture = parseCaptureFile(bytes, { file });
  const fit = fitCapture(
    { input: capture.input, output: capture.output, sampleRateHz: capture.sampleRateHz, startTimeS: capture.startTimeS, file },
    { frequencyHz },
  );

  if (values.json) {
    const document = {
      file,
      format: capture.format,
      encoding: capture.encoding,
      unit: capture.unit,
      frequencyHz: fit.frequencyHz,
      frequencySource: fit.frequencySource,
      gain: finiteOrNull(fit.gain),
      gainDb: finiteOrNull(fit.gainDb),
      phaseDeg: finiteOrNull(fit.phaseDeg),
      input: channelJson(fit.input),
      output: channelJson(fit.output),
      sampleRateHz: fit.sampleRateHz,
      samples: fit.samples,
      cycles: fit.cycles,
    };
    process.stdout.write(`${JSON.stringify(document, null, 2)}\n`);
    return 0;
  }
  const unit = capture.unit === 'V' ? 'V' : 'FS';
  const summary = formatTable([
    ['file', `${file} (${capture.format}, ${capture.encoding}; amplitudes peak, in ${capture.unit === 'V' ? 'volts' : 'full-scale units'})`],
    ['frequency', `${formatNumber(fit.frequencyHz, 9)} Hz (${fit.frequencySource})`],
    ['record', `${fit.samples} samples at ${formatNumber(fit.sampleRateHz, 9)} Hz, ${formatNumber(fit.cycles, 6)} cycles`],
    ['gain', `${formatNumber(fit.gain)} (${formatNumber(fit.gainDb, 5)} dB)`],
    ['phase', `${formatNumber(fit.phaseDeg, 5)}° (output − input)`],
  ]);
  const channels = formatTable([
    ['channel', `amplitude (${unit})`, 'phase (°)', `offset (${unit})`, `residual RMS (${unit})`],
    ...(['input', 'output'] as const).map((name) => [
      name,
      formatNumber(fit[name].amplitude),
      formatNumber(fit[name].phaseDeg, 5),
      formatNumber(fit[name].offset),
      formatNumber(fit[name].residualRms, 3),
    ]),
  ]);
  process.stdout.write(`${summary}\n\n${channels}\n`);
  return 0;
}
