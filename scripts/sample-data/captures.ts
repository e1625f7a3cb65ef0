// Writes the demo captures in sample-data/captures/: two-channel records (amplifier input and
// output) of the fictional Halden Ridge Instruments lab, as CSV and WAV, plus manifest.json with
// the parameters each record was synthesised from. Deterministic (seeded), so the files are
// reproducible: `node --import tsx scripts/sample-data/captures.ts`.
//
// Every number here is invented demo data.
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

type Encoding = 'pcm16' | 'pcm24' | 'float32';

interface ChannelSpec {
  /** Peak amplitude (V for CSV, full scale for WAV). */
  amplitude: number;
  /** Phase of amplitude·cos(2πft + phase) at t = 0, degrees. */
  phaseDeg: number;
  offset: number;
  /** Second and third harmonic amplitudes, relative to the fundamental. */
  harmonics: [number, number];
  /** RMS of added Gaussian noise. */
  noiseRms: number;
}

interface CaptureSpec {
  file: string;
  comment: string[];
  format: 'csv' | 'wav';
  delimiter?: ',' | ';' | '\t';
  decimalComma?: boolean;
  encoding?: Encoding;
  sampleRateHz: number;
  frames: number;
  startTimeS: number;
  frequencyHz: number;
  input: ChannelSpec;
  output: ChannelSpec;
  seed: number;
}

const specs: CaptureSpec[] = [
  {
    file: 'hrb204-0007-differential-1khz.csv',
    comment: [
      'Halden Ridge Instruments lab - LC-Bridge front-end board HRB-204, serial HRB204-0007',
      'differential drive, 1 kHz nominal, gain setting 10; two-channel capture, volts',
    ],
    format: 'csv',
    delimiter: ',',
    sampleRateHz: 200_000,
    frames: 4321,
    startTimeS: 0,
    frequencyHz: 1000,
    input: { amplitude: 0.1, phaseDeg: 12, offset: 0.0002, harmonics: [1e-4, 5e-5], noiseRms: 10e-6 },
    output: { amplitude: 0.99987, phaseDeg: 11.55, offset: -0.003, harmonics: [1e-4, 3e-5], noiseRms: 50e-6 },
    seed: 204_0007_1,
  },
  {
    file: 'hrb204-0012-common-mode-50hz.csv',
    comment: [
      'Halden Ridge Instruments lab - LC-Bridge front-end board HRB-204, serial HRB204-0012',
      'common-mode drive, 50 Hz, exported from a spreadsheet with semicolons and decimal commas',
    ],
    format: 'csv',
    delimiter: ';',
    decimalComma: true,
    sampleRateHz: 10_000,
    frames: 2050,
    startTimeS: 1.25,
    frequencyHz: 50,
    input: { amplitude: 2.0, phaseDeg: -40, offset: 0.01, harmonics: [2e-4, 1e-4], noiseRms: 100e-6 },
    output: { amplitude: 0.000502, phaseDeg: 51, offset: 0.0015, harmonics: [0, 0], noiseRms: 2e-6 },
    seed: 204_0012_2,
  },
  {
    file: 'hrb204-0007-common-mode-1khz.wav',
    comment: ['HRB204-0007, common-mode drive, 1 kHz, stereo 32-bit float, left = input, right = output'],
    format: 'wav',
    encoding: 'float32',
    sampleRateHz: 48_000,
    frames: 24_000,
    startTimeS: 0,
    frequencyHz: 1000,
    input: { amplitude: 0.5, phaseDeg: 0, offset: 0.0005, harmonics: [3e-5, 1e-5], noiseRms: 1e-6 },
    output: { amplitude: 0.00025, phaseDeg: 87, offset: 0.001, harmonics: [0, 0], noiseRms: 2e-6 },
    seed: 204_0007_3,
  },
  {
    file: 'hrb204-0012-common-mode-10khz-pcm24.wav',
    comment: ['HRB204-0012, common-mode drive, 10 kHz, stereo 24-bit PCM'],
    format: 'wav',
    encoding: 'pcm24',
    sampleRateHz: 96_000,
    frames: 24_000,
    startTimeS: 0,
    frequencyHz: 10_037.5,
    input: { amplitude: 0.4, phaseDeg: 30, offset: 0, harmonics: [1e-5, 1e-5], noiseRms: 2e-6 },
    output: { amplitude: 0.00126, phaseDeg: 118, offset: -0.0002, harmonics: [0, 0], noiseRms: 3e-6 },
    seed: 204_0012_4,
  },
  {
    file: 'hrb204-0012-differential-100hz-pcm16.wav',
    comment: ['HRB204-0012, differential drive, 100 Hz, stereo 16-bit PCM'],
    format: 'wav',
    encoding: 'pcm16',
    sampleRateHz: 8_000,
    frames: 4_100,
    startTimeS: 0,
    frequencyHz: 100,
    input: { amplitude: 0.05, phaseDeg: -90, offset: 0, harmonics: [0, 0], noiseRms: 20e-6 },
    output: { amplitude: 0.4999, phaseDeg: -90.2, offset: 0.0001, harmonics: [2e-4, 0], noiseRms: 20e-6 },
    seed: 204_0012_5,
  },
];

function gaussianSource(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  // Box–Muller; 1 − u keeps the logarithm's argument in (0, 1].
  return () => Math.sqrt(-2 * Math.log(1 - uniformFloat64(rng))) * Math.cos(2 * Math.PI * uniformFloat64(rng));
}

function synthesise(spec: CaptureSpec, channel: ChannelSpec, gaussian: () => number): Float64Array {
  const samples = new Float64Array(spec.frames);
  const phase = (channel.phaseDeg * Math.PI) / 180;
  for (let n = 0; n < spec.frames; n++) {
    const angle = 2 * Math.PI * spec.frequencyHz * (spec.startTimeS + n / spec.sampleRateHz) + phase;
    samples[n] =
      channel.offset +
      channel.amplitude *
        (Math.cos(angle) + channel.harmonics[0] * Math.cos(2 * angle) + channel.harmonics[1] * Math.cos(3 * angle)) +
      channel.noiseRms * gaussian();
  }
  return samples;
}

/** Stereo RIFF/WAVE bytes (left, right) in the given encoding; samples in full-scale units. */
function encodeStereoWav(left: Float64Array, right: Float64Array, sampleRateHz: number, encoding: Encoding): Uint8Array {
  const bytesPerSample = encoding === 'pcm16' ? 2 : encoding === 'pcm24' ? 3 : 4;
  const blockAlign = 2 * bytesPerSample;
  const dataLength = left.length * blockAlign;
  const bytes = new Uint8Array(44 + dataLength);
  const view = new DataView(bytes.buffer);
  const ascii = (offset: number, text: string): void => {
    for (let k = 0; k < text.length; k++) bytes[offset + k] = text.charCodeAt(k);
  };
  ascii(0, 'RIFF');
  view.setUint32(4, 36 + dataLength, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  view.setUint32(16, 16, true);
  view.setUint16(20, encoding === 'float32' ? 3 : 1, true);
  view.setUint16(22, 2, true);
  view.setUint32(24, sampleRateHz, true);
  view.setUint32(28, sampleRateHz * blockAlign, true);
  view.setUint16(32, blockAlign, true);
  view.setUint16(34, bytesPerSample * 8, true);
  ascii(36, 'data');
  view.setUint32(40, dataLength, true);
  const fullScale = encoding === 'pcm16' ? 32768 : 8388608;
  const quantise = (value: number): number => Math.max(-fullScale, Math.min(fullScale - 1, Math.round(value * fullScale)));
  for (let frame = 0; frame < left.length; frame++) {
    for (const [channel, value] of [[0, left[frame]], [1, right[frame]]] as const) {
      const offset = 44 + frame * blockAlign + channel * bytesPerSample;
      if (encoding === 'float32') view.setFloat32(offset, value, true);
      else if (encoding === 'pcm16') view.setInt16(offset, quantise(value), true);
      else {
        const code = quantise(value) & 0xffffff;
        bytes[offset] = code & 0xff;
        bytes[offset + 1] = (code >> 8) & 0xff;
        bytes[offset + 2] = (code >> 16) & 0xff;
      }
    }
  }
  return bytes;
}

function formatCsvNumber(value: number, decimalComma: boolean): string {
  const text = Number(value.toPrecision(10)).toString();
  return decimalComma ? text.replace('.', ',') : text;
}

function writeCapture(directory: string, spec: CaptureSpec): void {
  const gaussian = gaussianSource(spec.seed);
  const input = synthesise(spec, spec.input, gaussian);
  const output = synthesise(spec, spec.output, gaussian);
  const path = join(directory, spec.file);
  if (spec.format === 'wav') {
    writeFileSync(path, encodeStereoWav(input, output, spec.sampleRateHz, spec.encoding!));
    return;
  }
  const delimiter = spec.delimiter ?? ',';
  const decimalComma = spec.decimalComma ?? false;
  const lines = [...spec.comment.map((line) => `# ${line}`), '# synthetic demo data', ['time_s', 'input_v', 'output_v'].join(delimiter)];
  for (let n = 0; n < spec.frames; n++) {
    const time = spec.startTimeS + n / spec.sampleRateHz;
    lines.push([time, input[n], output[n]].map((value) => formatCsvNumber(value, decimalComma)).join(delimiter));
  }
  writeFileSync(path, `${lines.join('\n')}\n`);
}

function main(): void {
  const directory = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'sample-data', 'captures');
  mkdirSync(directory, { recursive: true });
  for (const spec of specs) writeCapture(directory, spec);
  const manifest = {
    description:
      'Demo captures of the fictional Halden Ridge Instruments lab, synthesised by scripts/sample-data/captures.ts. ' +
      'Each channel is offset + amplitude·(cos(2π·f·t + phase) + harmonics) + Gaussian noise; amplitudes are peak, ' +
      'CSV in volts, WAV in full-scale units (left = input, right = output).',
    captures: specs.map((spec) => ({
      file: spec.file,
      format: spec.format,
      encoding: spec.encoding ?? 'text',
      sampleRateHz: spec.sampleRateHz,
      frames: spec.frames,
      startTimeS: spec.startTimeS,
      frequencyHz: spec.frequencyHz,
      gain: spec.output.amplitude / spec.input.amplitude,
      phaseDeg: spec.output.phaseDeg - spec.input.phaseDeg,
      input: spec.input,
      output: spec.output,
      comment: spec.comment,
    })),
  };
  writeFileSync(join(directory, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`);
  process.stdout.write(`wrote ${specs.length} captures and manifest.json to ${directory}\n`);
}

main();
