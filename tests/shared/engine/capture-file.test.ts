import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  CSV_TIME_GRID_TOLERANCE,
  parseCaptureCsv,
  parseCaptureFile,
  parseCaptureWav,
} from '../../../shared/engine/capture-file';
import { EngineInputError, type InputLocation } from '../../../shared/engine/errors';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

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

const FILE = 'hrb204-0007.csv';

describe('parseCaptureCsv', () => {
  it('reads a comma-separated capture with comments, blank lines, CRLF line ends and a byte-order mark', () => {
    const text = '\uFEFF# Halden Ridge Instruments lab\r\n# HRB204-0007\r\ntime_s,input_v,output_v\r\n\r\n0,0.5,-0.25\r\n0.001,0.25,1e-3\r\n# note\r\n0.002,-0.5,0.125\r\n';
    const capture = parseCaptureCsv(text, { file: FILE });
    // Values as written in the text above.
    expect(Array.from(capture.input)).toEqual([0.5, 0.25, -0.5]);
    expect(Array.from(capture.output)).toEqual([-0.25, 0.001, 0.125]);
    // 1/(0.002 s / 2 intervals) = 1000 Hz, up to the rounding of 0.002/2 (one ulp relative).
    expect(capture.sampleRateHz).toBeCloseTo(1000, 9);
    expect(capture).toMatchObject({ startTimeS: 0, frameCount: 3, format: 'csv', encoding: 'text', unit: 'V', file: FILE });
  });

  it('reads semicolon files with decimal commas, tab files, any column order, quoted names and ignores extra columns', () => {
    const semicolon = parseCaptureCsv('time_s;input_v;output_v\n1,5;0,25;-0,5\n1,6;0,5;1\n');
    expect(Array.from(semicolon.input)).toEqual([0.25, 0.5]);
    expect(semicolon.startTimeS).toBe(1.5);
    // 1/(1.6 − 1.5) = 10 Hz, up to the rounding of 1.6 − 1.5 in binary (≈ 1e-15 relative).
    expect(semicolon.sampleRateHz).toBeCloseTo(10, 9);
    const tab = parseCaptureCsv('"Output_V"\tnote\tTIME_S\tinput_v\n1\tx\t0\t2\n3\ty\t0.5\t4\n');
    expect(Array.from(tab.output)).toEqual([1, 3]);
    expect(Array.from(tab.input)).toEqual([2, 4]);
    expect(tab.sampleRateHz).toBe(2);
  });

  it(`accepts time stamps up to ${CSV_TIME_GRID_TOLERANCE * 100} % of a sample interval off the uniform grid`, () => {
    // Time stamps printed with few digits: 0, 0.3333, 0.6667, 1.0 (grid step 1/3, deviation 0.01 % of a step).
    const capture = parseCaptureCsv('time_s,input_v,output_v\n0,1,1\n0.3333,1,1\n0.6667,1,1\n1.0,1,1\n');
    expect(capture.sampleRateHz).toBe(3);
    // 4 % off the grid passes, 6 % fails (the tolerance is 5 %).
    expect(() => parseCaptureCsv('time_s,input_v,output_v\n0,1,1\n1.04,1,1\n2,1,1\n')).not.toThrow();
    expectInputError(
      () => parseCaptureCsv('time_s,input_v,output_v\n0,1,1\n1.06,1,1\n2,1,1\n', { file: FILE }),
      { file: FILE, row: 3, column: 'time_s' },
      /6\.00 % of a sample interval .* at most 5 %/,
    );
  });

  it('refuses a missing sample (a gap of one interval in the time column) at the first row off the grid', () => {
    const rows = [0, 1, 2, 4, 5, 6].map((time) => `${time / 1000},0,0`).join('\n');
    // Grid through 0 and 6 ms with 5 intervals: 1.2 ms per step, so the 1 ms stamp on line 3 is
    // 16.7 % of a step off; the first line beyond 5 % is reported.
    expectInputError(
      () => parseCaptureCsv(`time_s,input_v,output_v\n${rows}\n`, { file: FILE }),
      { file: FILE, row: 3, column: 'time_s' },
      /off the uniform grid/,
    );
  });

  it('refuses empty files, files with only a header and files with one data row', () => {
    expectInputError(() => parseCaptureCsv('', { file: FILE }), { file: FILE }, /the file is empty/);
    expectInputError(() => parseCaptureCsv('# only a comment\n\n', { file: FILE }), { file: FILE }, /the file is empty/);
    expectInputError(() => parseCaptureCsv('# c\ntime_s,input_v,output_v\n', { file: FILE }), { file: FILE, row: 2 }, /no data rows/);
    expectInputError(() => parseCaptureCsv('time_s,input_v,output_v\n0,1,2\n', { file: FILE }), { file: FILE, row: 1 }, /only one data row/);
  });

  it('refuses missing and repeated columns, naming them and the header line', () => {
    expectInputError(
      () => parseCaptureCsv('# c\ntime_s,input_v,vout\n0,1,2\n', { file: FILE }),
      { file: FILE, row: 2 },
      /lacks column "output_v" .*found "time_s", "input_v", "vout"/,
    );
    expectInputError(() => parseCaptureCsv('t,a,b\n', { file: FILE }), { file: FILE, row: 1 }, /lacks columns "time_s", "input_v", "output_v"/);
    expectInputError(
      () => parseCaptureCsv('time_s,input_v,output_v,input_v\n0,1,2,3\n', { file: FILE }),
      { file: FILE, row: 1, column: 4 },
      /column "input_v" appears twice \(columns 2 and 4\)/,
    );
  });

  it('refuses rows with the wrong number of fields', () => {
    expectInputError(
      () => parseCaptureCsv('time_s,input_v,output_v\n0,1,2\n0.1,1\n', { file: FILE }),
      { file: FILE, row: 3 },
      /expected 3 fields like the header, found 2/,
    );
  });

  it('refuses text, empty cells, NaN, Infinity and overflowing numbers in numeric cells, naming line and column', () => {
    const header = 'time_s,input_v,output_v\n0,1,2\n';
    expectInputError(() => parseCaptureCsv(`${header}0.1,abc,2\n`, { file: FILE }), { file: FILE, row: 3, column: 'input_v' }, /"abc" is not a number \(column 2\)/);
    expectInputError(() => parseCaptureCsv(`${header}0.1,1,\n`, { file: FILE }), { file: FILE, row: 3, column: 'output_v' }, /an empty cell is not a number/);
    expectInputError(() => parseCaptureCsv(`${header}0.1,1,1.5V\n`, { file: FILE }), { file: FILE, row: 3, column: 'output_v' }, /"1.5V" is not a number/);
    expectInputError(() => parseCaptureCsv(`${header}0.1,NaN,2\n`, { file: FILE }), { file: FILE, row: 3, column: 'input_v' }, /"NaN" is not a finite number/);
    expectInputError(() => parseCaptureCsv(`${header}0.1,1,-inf\n`, { file: FILE }), { file: FILE, row: 3, column: 'output_v' }, /"-inf" is not a finite number/);
    expectInputError(() => parseCaptureCsv(`${header}Infinity,1,2\n`, { file: FILE }), { file: FILE, row: 3, column: 'time_s' }, /"Infinity" is not a finite number/);
    expectInputError(() => parseCaptureCsv(`${header}0.1,1e999,2\n`, { file: FILE }), { file: FILE, row: 3, column: 'input_v' }, /outside the range of finite numbers/);
    // A decimal comma in a comma-separated file splits the cell: the field count catches it.
    expectInputError(() => parseCaptureCsv(`${header}0.1,1,5,2\n`, { file: FILE }), { file: FILE, row: 3 }, /found 4/);
  });

  it('refuses a time column that repeats or falls', () => {
    expectInputError(
      () => parseCaptureCsv('time_s,input_v,output_v\n0,1,2\n0.1,1,2\n0.1,1,2\n', { file: FILE }),
      { file: FILE, row: 4, column: 'time_s' },
      /time 0.1 s does not rise \(previous row has 0.1 s\)/,
    );
    expectInputError(
      () => parseCaptureCsv('time_s,input_v,output_v\n0,1,2\n0.1,1,2\n0.05,1,2\n', { file: FILE }),
      { file: FILE, row: 4, column: 'time_s' },
      /does not rise/,
    );
  });
});

interface WavOptions {
  channels?: number;
  formatCode?: number;
  bits?: number;
  sampleRateHz?: number;
  extensible?: boolean;
  /** A LIST chunk of odd length before the data, to test chunk skipping and padding. */
  extraChunk?: boolean;
  /** Bytes cut from the end of the file. */
  truncateBy?: number;
  /** Declared data size, when it should differ from the real one. */
  dataSize?: number;
  blockAlign?: number;
}

/** A RIFF/WAVE file from frames of full-scale values, written field by field from the format's layout. */
function wavBytes(frames: number[][], options: WavOptions = {}): Uint8Array {
  const { channels = 2, formatCode = 3, bits = 32, sampleRateHz = 48_000, extensible = false, extraChunk = false } = options;
  const bytesPerSample = bits / 8;
  const blockAlign = options.blockAlign ?? channels * bytesPerSample;
  const dataLength = frames.length * channels * bytesPerSample;
  const fmtLength = extensible ? 40 : 16;
  const extra = extraChunk ? 8 + 5 + 1 : 0;
  const total = 12 + 8 + fmtLength + extra + 8 + dataLength;
  const bytes = new Uint8Array(total);
  const view = new DataView(bytes.buffer);
  const ascii = (offset: number, text: string): void => text.split('').forEach((ch, k) => (bytes[offset + k] = ch.charCodeAt(0)));
  ascii(0, 'RIFF');
  view.setUint32(4, total - 8, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  view.setUint32(16, fmtLength, true);
  view.setUint16(20, extensible ? 0xfffe : formatCode, true);
  view.setUint16(22, channels, true);
  view.setUint32(24, sampleRateHz, true);
  view.setUint32(28, sampleRateHz * blockAlign, true);
  view.setUint16(32, blockAlign, true);
  view.setUint16(34, bits, true);
  if (extensible) {
    view.setUint16(36, 22, true);
    view.setUint16(38, bits, true);
    view.setUint32(40, 3, true);
    // Sub-format GUID: format code, then the fixed tail 0000-0010-8000-00AA00389B71.
    view.setUint16(44, formatCode, true);
    bytes.set([0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71], 46);
  }
  let offset = 20 + fmtLength;
  if (extraChunk) {
    ascii(offset, 'LIST');
    view.setUint32(offset + 4, 5, true);
    ascii(offset + 8, 'INFOx');
    offset += 14;
  }
  ascii(offset, 'data');
  view.setUint32(offset + 4, options.dataSize ?? dataLength, true);
  offset += 8;
  for (const frame of frames) {
    for (let channel = 0; channel < channels; channel++) {
      const value = frame[channel] ?? 0;
      if (formatCode === 3 && bits === 32) view.setFloat32(offset, value, true);
      else if (formatCode === 3 && bits === 64) view.setFloat64(offset, value, true);
      else if (bits === 8) view.setUint8(offset, Math.round(value * 128) + 128);
      else if (bits === 16) view.setInt16(offset, Math.round(value * 32768), true);
      else if (bits === 24) {
        const code = Math.round(value * 8388608) & 0xffffff;
        bytes.set([code & 0xff, (code >> 8) & 0xff, (code >> 16) & 0xff], offset);
      } else if (bits === 32) view.setInt32(offset, Math.round(value * 2147483648), true);
      offset += bytesPerSample;
    }
  }
  return options.truncateBy ? bytes.slice(0, bytes.length - options.truncateBy) : bytes;
}

// Values exactly representable at 16 bits (multiples of 2^-15), so every encoding holds them exactly.
const FRAMES = [
  [0.5, -0.25],
  [-1, 0.125],
  [0.999969482421875, -0.000030517578125],
  [0, 0.75],
];
const WAV = 'hrb204-0007.wav';

const temporary = mkdtempSync(join(tmpdir(), 'capture-file-'));
afterAll(() => rmSync(temporary, { recursive: true, force: true }));

describe('parseCaptureWav', () => {
  for (const [encoding, formatCode, bits] of [['pcm16', 1, 16], ['pcm24', 1, 24], ['pcm32', 1, 32], ['float32', 3, 32]] as const) {
    it(`reads 2-channel ${encoding} as left = input, right = output, scaled to full scale`, () => {
      const capture = parseCaptureWav(wavBytes(FRAMES, { formatCode, bits, sampleRateHz: 96_000 }), { file: WAV });
      // Values as written above: exactly representable in every encoding.
      expect(Array.from(capture.input)).toEqual(FRAMES.map((frame) => frame[0]));
      expect(Array.from(capture.output)).toEqual(FRAMES.map((frame) => frame[1]));
      expect(capture).toMatchObject({ sampleRateHz: 96_000, startTimeS: 0, frameCount: 4, format: 'wav', encoding, unit: 'full-scale' });
      expect(capture.input).toBeInstanceOf(encoding === 'pcm32' ? Float64Array : Float32Array);
    });
  }

  it('reads WAVE_FORMAT_EXTENSIBLE, skips other chunks (with their pad byte) and works on unaligned buffers', () => {
    const bytes = wavBytes(FRAMES, { extensible: true, formatCode: 1, bits: 16, extraChunk: true });
    const unaligned = new Uint8Array(bytes.length + 1).subarray(1);
    unaligned.set(bytes);
    const capture = parseCaptureWav(unaligned);
    expect(Array.from(capture.output)).toEqual(FRAMES.map((frame) => frame[1]));
    const float = new Uint8Array(wavBytes(FRAMES, { extensible: true, formatCode: 3, bits: 32 }).length + 3).subarray(3);
    float.set(wavBytes(FRAMES, { extensible: true, formatCode: 3, bits: 32 }));
    expect(Array.from(parseCaptureWav(float).input)).toEqual(FRAMES.map((frame) => frame[0]));
  });

  it.skipIf(!hasNumpy)('reads the same values as scipy.io.wavfile for 16-, 24-, 32-bit PCM and 32-bit float', () => {
    // Values off the 16-bit grid, so each encoding rounds them its own way.
    const frames = Array.from({ length: 64 }, (_, n) => [0.9 * Math.sin(n / 3), 0.001 * Math.cos(n / 5) - 0.3]);
    const files = ([[1, 16], [1, 24], [1, 32], [3, 32]] as const).map(([formatCode, bits]) => {
      const path = join(temporary, `scipy-${formatCode}-${bits}.wav`);
      writeFileSync(path, wavBytes(frames, { formatCode, bits }));
      return path;
    });
    // scipy reference: integer PCM comes back as integers (24-bit left-justified in int32), so
    // dividing by 2^(8·itemsize − 1) gives full scale; float comes back as is.
    const reference = runPython<number[][][]>(
      `
import sys, json
import numpy as np
from scipy.io import wavfile
out = []
for path in json.load(sys.stdin):
    rate, data = wavfile.read(path)
    if data.dtype.kind == 'i':
        data = data.astype(np.float64) / float(2 ** (8 * data.dtype.itemsize - 1))
    out.append([data[:, 0].astype(np.float64).tolist(), data[:, 1].astype(np.float64).tolist()])
print(json.dumps(out))
`,
      files,
    );
    files.forEach((path, index) => {
      const capture = parseCaptureFile(new Uint8Array(readFileSync(path)), { file: path });
      expect(Array.from(capture.input)).toEqual(reference[index][0]);
      expect(Array.from(capture.output)).toEqual(reference[index][1]);
    });
  });

  it('refuses mono and multichannel files', () => {
    expectInputError(() => parseCaptureWav(wavBytes([[0.5], [0.25]], { channels: 1 }), { file: WAV }), { file: WAV, field: 'fmt.channels' }, /mono; a capture needs 2 channels/);
    expectInputError(() => parseCaptureWav(wavBytes([[0.5, 0, 0], [0.25, 0, 0]], { channels: 3 }), { file: WAV }), { file: WAV, field: 'fmt.channels' }, /3 channels; a capture needs exactly 2/);
  });

  it('refuses 8-bit PCM, 64-bit float, compressed and unknown encodings', () => {
    const cases: [WavOptions, RegExp][] = [
      [{ formatCode: 1, bits: 8 }, /unsupported sample encoding 8-bit integer PCM/],
      [{ formatCode: 3, bits: 64 }, /unsupported sample encoding 64-bit float/],
      [{ formatCode: 2, bits: 16 }, /format code 0x0002 \(Microsoft ADPCM, compressed\)/],
      [{ formatCode: 7, bits: 16 }, /format code 0x0007 \(µ-law, compressed\)/],
      [{ formatCode: 0x1234, bits: 16 }, /format code 0x1234;/],
      [{ formatCode: 1, bits: 8, extensible: true }, /8-bit integer PCM/],
    ];
    for (const [options, message] of cases) {
      expectInputError(() => parseCaptureWav(wavBytes(FRAMES, options), { file: WAV }), { file: WAV, field: 'fmt.encoding' }, message);
    }
  });

  it('refuses truncated files: a data chunk longer than the file, a partial frame, a short header', () => {
    expectInputError(
      () => parseCaptureWav(wavBytes(FRAMES, { truncateBy: 5 }), { file: WAV }),
      { file: WAV, field: 'data' },
      /truncated: the "data" chunk declares 32 bytes but only 27 follow/,
    );
    expectInputError(
      () => parseCaptureWav(wavBytes(FRAMES, { dataSize: 30 }), { file: WAV }),
      { file: WAV, field: 'data' },
      /truncated: the data \(30 bytes\) ends inside a frame of 8 bytes/,
    );
    const bytes = wavBytes(FRAMES);
    expectInputError(() => parseCaptureWav(bytes.slice(0, 30), { file: WAV }), { file: WAV, field: 'fmt' }, /"fmt " chunk is 10 bytes; at least 16/);
    expectInputError(() => parseCaptureWav(bytes.slice(0, 36), { file: WAV }), { file: WAV, field: 'data' }, /no "data" chunk/);
    expectInputError(() => parseCaptureWav(bytes.slice(0, 8), { file: WAV }), { file: WAV, field: 'RIFF header' }, /8 bytes, too short/);
    expectInputError(() => parseCaptureWav(bytes.slice(0, 12), { file: WAV }), { file: WAV, field: 'fmt' }, /no "fmt " chunk/);
  });

  it('refuses files that are not RIFF/WAVE, and RIFX/RF64 variants', () => {
    const text = new TextEncoder().encode('time_s,input_v,output_v\n0,1,1\n');
    expectInputError(() => parseCaptureWav(text, { file: WAV }), { file: WAV, field: 'RIFF header' }, /not a WAV file/);
    const rifx = wavBytes(FRAMES);
    rifx.set([0x52, 0x49, 0x46, 0x58], 0);
    expectInputError(() => parseCaptureWav(rifx, { file: WAV }), { file: WAV, field: 'RIFF header' }, /RIFX files are not supported/);
  });

  it('refuses NaN and infinite float samples, a zero sample rate, a wrong block align and fewer than 2 frames', () => {
    expectInputError(() => parseCaptureWav(wavBytes([[0, 0], [0, Number.NaN], [0, 0]]), { file: WAV }), { file: WAV, field: 'data' }, /frame 1 of the right \(output\) channel/);
    expectInputError(() => parseCaptureWav(wavBytes([[0, 0], [Infinity, 0]]), { file: WAV }), { file: WAV, field: 'data' }, /frame 1 of the left \(input\) channel/);
    expectInputError(() => parseCaptureWav(wavBytes(FRAMES, { sampleRateHz: 0 }), { file: WAV }), { file: WAV, field: 'fmt.sampleRate' }, /sample rate in the header is 0 Hz/);
    expectInputError(() => parseCaptureWav(wavBytes(FRAMES, { blockAlign: 6 }), { file: WAV }), { file: WAV, field: 'fmt.blockAlign' }, /block align 6/);
    expectInputError(() => parseCaptureWav(wavBytes([[0, 0]]), { file: WAV }), { file: WAV, field: 'data' }, /1 frame; a capture needs many/);
  });
});

describe('parseCaptureFile', () => {
  it('reads RIFF bytes as WAV whatever the name, and other bytes as CSV', () => {
    expect(parseCaptureFile(wavBytes(FRAMES), { file: 'mislabelled.csv' }).format).toBe('wav');
    expect(parseCaptureFile(new TextEncoder().encode('time_s,input_v,output_v\n0,1,1\n1,2,2\n'), { file: 'a.csv' }).format).toBe('csv');
    expect(parseCaptureFile('time_s,input_v,output_v\n0,1,1\n1,2,2\n').format).toBe('csv');
  });

  it('treats a .wav name with other content as a broken WAV, not as CSV', () => {
    const text = new TextEncoder().encode('time_s,input_v,output_v\n0,1,1\n');
    expectInputError(() => parseCaptureFile(text, { file: 'x.wav' }), { file: 'x.wav', field: 'RIFF header' }, /not a WAV file/);
  });
});
