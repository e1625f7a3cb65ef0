// Reading a two-channel capture (amplifier input and output, sampled together) from CSV text
// (`time_s,input_v,output_v`) or from a RIFF/WAVE file (left = input, right = output).
//
// WAV: a reader of our own rather than the `wavefile` package. wavefile 11.0.0 takes about 1.0 s
// to return the samples of a 1,000,000-frame stereo 32-bit float file on this machine
// (`new WaveFile(bytes).getSamples(false, Float64Array)`: it unpacks every sample through a
// generic per-value decoder), against a budget of 50 ms for reading and fitting such a file. The
// formats needed here are few (16/24/32-bit integer PCM, 32-bit float), so reading them straight
// from typed-array views takes a few milliseconds.
//
// CSV: a small line-by-line reader too: `csv-parse/sync` relies on Node's global Buffer, which the
// browser build of the engine does not have, and the format is narrow (numbers, one header line,
// `#` comments), which lets every message name its exact line and column.
import { EngineInputError } from './errors';
import type { SampleArray } from './sine-fit';

/** A two-channel capture with uniform sampling. */
export interface Capture {
  /** File name given by the caller (used in messages). */
  file?: string;
  /** Input channel (CSV: volts; WAV: fraction of full scale). */
  input: SampleArray;
  /** Output channel, same unit and length as `input`. */
  output: SampleArray;
  /** Sample rate (Hz): from the WAV header, or 1/(mean time step) of the CSV time column. */
  sampleRateHz: number;
  /** Time of the first sample (s): the first CSV time value, 0 for WAV. */
  startTimeS: number;
  /** Number of frames (samples per channel). */
  frameCount: number;
  /** Where it came from. */
  format: 'csv' | 'wav';
  /** Sample encoding: 'text' for CSV, 'pcm16' | 'pcm24' | 'pcm32' | 'float32' for WAV. */
  encoding: 'text' | 'pcm16' | 'pcm24' | 'pcm32' | 'float32';
  /** Unit of the samples: 'V' (CSV columns are volts) or 'full-scale' (WAV, ±1 = full scale). */
  unit: 'V' | 'full-scale';
}

/** Options shared by the capture parsers. */
export interface CaptureParseOptions {
  /** File name used in error messages and kept on the result. */
  file?: string;
}

/**
 * Largest allowed distance of a CSV time stamp from the uniform grid through the first and last
 * stamps, as a fraction of the sample interval. 5 % admits stamps printed with 6–7 significant
 * digits (their rounding is well inside it) while a missing or repeated sample (100 %) or a
 * changed sample rate is refused. Ignoring a deviation d (as a fraction of the interval) shifts
 * the phase of a tone at f by at most 360°·d·f/sampleRateHz.
 */
export const CSV_TIME_GRID_TOLERANCE = 0.05;

const CSV_COLUMNS = ['time_s', 'input_v', 'output_v'] as const;

// A plain decimal number; anything else ("1.2V", "0x10", "") is refused rather than half-read.
const decimalNumber = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
// With a decimal comma, accepted only when the delimiter is not a comma (`0,001;0,5;0,49`).
const decimalCommaNumber = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;
const notFinite = /^[+-]?(?:nan|inf|infinity)$/i;

function toBytes(input: Uint8Array | ArrayBuffer): Uint8Array {
  return input instanceof Uint8Array ? input : new Uint8Array(input);
}

function decodeText(input: string | Uint8Array | ArrayBuffer): string {
  const text = typeof input === 'string' ? input : new TextDecoder('utf-8').decode(toBytes(input));
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

function unquote(field: string): string {
  const trimmed = field.trim();
  return trimmed.length >= 2 && trimmed.startsWith('"') && trimmed.endsWith('"') ? trimmed.slice(1, -1).trim() : trimmed;
}

/**
 * Reads a capture from CSV text: a header naming the columns `time_s`, `input_v` and `output_v`
 * (any order, case-insensitive, other columns ignored), then one row per sample; blank lines and
 * lines starting with `#` are skipped; the delimiter (comma, semicolon or tab) is the one the header
 * uses; with semicolon or tab a decimal comma is accepted. The time column must rise strictly and
 * lie on a uniform grid within CSV_TIME_GRID_TOLERANCE (5 %) of the sample interval.
 *
 * @param input the file's text or bytes (UTF-8)
 * @param options file (name for messages)
 * @returns a Capture in volts with sampleRateHz = (rows − 1)/(last time − first time) and
 *   startTimeS = first time
 * Cost: O(rows).
 * Throws EngineInputError naming the file, line (`row`, 1-based line number in the file) and
 * column for: no header or no data, fewer than 2 data rows, a missing or repeated column, a row
 * with the wrong number of fields, text or NaN/Infinity in a numeric cell, a time that does not
 * rise, a time off the uniform grid.
 * Example: `parseCaptureCsv('time_s,input_v,output_v\n0,0,0\n0.001,1,0.5\n')` → sampleRateHz 1000,
 *   frameCount 2.
 */
export function parseCaptureCsv(input: string | Uint8Array | ArrayBuffer, options: CaptureParseOptions = {}): Capture {
  const { file } = options;
  const text = decodeText(input);
  const lines = text.split('\n');
  let headerLine = -1;
  for (let index = 0; index < lines.length; index++) {
    const trimmed = lines[index].trim();
    if (trimmed !== '' && !trimmed.startsWith('#')) {
      headerLine = index;
      break;
    }
  }
  if (headerLine < 0) {
    throw new EngineInputError('the file is empty: expected a header `time_s,input_v,output_v` and data rows', { file });
  }
  const header = lines[headerLine].replace(/\r$/, '');
  const delimiter = [',', ';', '\t'].reduce((best, candidate) =>
    header.split(candidate).length > header.split(best).length ? candidate : best,
  );
  const names = header.split(delimiter).map((name) => unquote(name).toLowerCase());
  const columnIndex = new Map<string, number>();
  names.forEach((name, index) => {
    if (!(CSV_COLUMNS as readonly string[]).includes(name)) return;
    if (columnIndex.has(name)) {
      throw new EngineInputError(
        `column "${name}" appears twice (columns ${columnIndex.get(name)! + 1} and ${index + 1})`,
        { file, row: headerLine + 1, column: index + 1 },
      );
    }
    columnIndex.set(name, index);
  });
  const missing = CSV_COLUMNS.filter((name) => !columnIndex.has(name));
  if (missing.length > 0) {
    throw new EngineInputError(
      `the header lacks column${missing.length > 1 ? 's' : ''} ${missing.map((name) => `"${name}"`).join(', ')} ` +
        `(expected time_s, input_v, output_v; found ${names.map((name) => `"${name}"`).join(', ')})`,
      { file, row: headerLine + 1 },
    );
  }
  const timeColumn = columnIndex.get('time_s')!;
  const inputColumn = columnIndex.get('input_v')!;
  const outputColumn = columnIndex.get('output_v')!;
  const allowDecimalComma = delimiter !== ',';

  const capacity = lines.length - headerLine;
  const times = new Float64Array(capacity);
  const inputs = new Float64Array(capacity);
  const outputs = new Float64Array(capacity);
  const lineOf = new Int32Array(capacity);
  let rows = 0;

  const readCell = (cell: string, name: string, lineNumber: number, columnNumber: number): number => {
    const trimmed = unquote(cell);
    let value: number;
    if (decimalNumber.test(trimmed)) value = Number(trimmed);
    else if (allowDecimalComma && decimalCommaNumber.test(trimmed)) value = Number(trimmed.replace(',', '.'));
    else if (notFinite.test(trimmed)) {
      throw new EngineInputError(`"${trimmed}" is not a finite number`, { file, row: lineNumber, column: name });
    } else {
      const shown = trimmed === '' ? 'an empty cell' : `"${trimmed.length > 40 ? `${trimmed.slice(0, 40)}…` : trimmed}"`;
      throw new EngineInputError(`${shown} is not a number (column ${columnNumber})`, { file, row: lineNumber, column: name });
    }
    if (!Number.isFinite(value)) {
      throw new EngineInputError(`"${trimmed}" is outside the range of finite numbers`, { file, row: lineNumber, column: name });
    }
    return value;
  };

  for (let index = headerLine + 1; index < lines.length; index++) {
    let line = lines[index];
    if (line.endsWith('\r')) line = line.slice(0, -1);
    const trimmed = line.trim();
    if (trimmed === '' || trimmed.startsWith('#')) continue;
    const lineNumber = index + 1;
    const cells = line.split(delimiter);
    if (cells.length !== names.length) {
      throw new EngineInputError(`expected ${names.length} fields like the header, found ${cells.length}`, {
        file,
        row: lineNumber,
      });
    }
    times[rows] = readCell(cells[timeColumn], 'time_s', lineNumber, timeColumn + 1);
    inputs[rows] = readCell(cells[inputColumn], 'input_v', lineNumber, inputColumn + 1);
    outputs[rows] = readCell(cells[outputColumn], 'output_v', lineNumber, outputColumn + 1);
    lineOf[rows] = lineNumber;
    if (rows > 0 && !(times[rows] > times[rows - 1])) {
      throw new EngineInputError(
        `time ${times[rows]} s does not rise (previous row has ${times[rows - 1]} s); samples must be in time order without repeats`,
        { file, row: lineNumber, column: 'time_s' },
      );
    }
    rows++;
  }
  if (rows < 2) {
    throw new EngineInputError(
      rows === 0 ? 'the file has a header but no data rows' : 'the file has only one data row; a capture needs many samples',
      { file, row: headerLine + 1 },
    );
  }
  const startTimeS = times[0];
  const sampleIntervalS = (times[rows - 1] - startTimeS) / (rows - 1);
  for (let row = 1; row < rows - 1; row++) {
    const deviation = (times[row] - (startTimeS + row * sampleIntervalS)) / sampleIntervalS;
    if (Math.abs(deviation) > CSV_TIME_GRID_TOLERANCE) {
      throw new EngineInputError(
        `time ${times[row]} s is ${(Math.abs(deviation) * 100).toPrecision(3)} % of a sample interval ` +
          `(${sampleIntervalS.toPrecision(6)} s) off the uniform grid; at most ${CSV_TIME_GRID_TOLERANCE * 100} % is allowed ` +
          '(missing or repeated samples, or a changed sample rate?)',
        { file, row: lineOf[row], column: 'time_s' },
      );
    }
  }
  return {
    file,
    input: inputs.slice(0, rows),
    output: outputs.slice(0, rows),
    sampleRateHz: 1 / sampleIntervalS,
    startTimeS,
    frameCount: rows,
    format: 'csv',
    encoding: 'text',
    unit: 'V',
  };
}

const WAVE_FORMAT_PCM = 0x0001;
const WAVE_FORMAT_IEEE_FLOAT = 0x0003;
const WAVE_FORMAT_EXTENSIBLE = 0xfffe;
const KNOWN_COMPRESSED_FORMATS: Record<number, string> = {
  0x0002: 'Microsoft ADPCM',
  0x0006: 'A-law',
  0x0007: 'µ-law',
  0x0011: 'IMA ADPCM',
  0x0055: 'MPEG layer 3',
};

const littleEndianHost = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

function fourCharacterCode(bytes: Uint8Array, offset: number): string {
  return String.fromCharCode(bytes[offset], bytes[offset + 1], bytes[offset + 2], bytes[offset + 3]);
}

/** Copies a slice into a fresh buffer when it is not aligned for a typed-array view. */
function alignedView(bytes: Uint8Array, offset: number, length: number, alignment: number): { buffer: ArrayBuffer; byteOffset: number } {
  const absolute = bytes.byteOffset + offset;
  if (absolute % alignment === 0) return { buffer: bytes.buffer as ArrayBuffer, byteOffset: absolute };
  return { buffer: bytes.slice(offset, offset + length).buffer as ArrayBuffer, byteOffset: 0 };
}

/**
 * Reads a capture from a RIFF/WAVE file: exactly two channels (left = input, right = output),
 * 16-, 24- or 32-bit integer PCM or 32-bit IEEE float (format codes 1 and 3, also inside
 * WAVE_FORMAT_EXTENSIBLE); samples scaled to full scale (integer codes divided by 2^(bits−1), so
 * ±1 is full scale). Chunks other than `fmt ` and `data` are skipped.
 *
 * @param input the file's bytes
 * @param options file (name for messages)
 * @returns a Capture in full-scale units with sampleRateHz from the header and startTimeS 0;
 *   16/24-bit and float samples as Float32Array (exact), 32-bit integers as Float64Array
 * Cost: O(frames), typed-array views over the data (a 1,000,000-frame float file in a few ms).
 * Throws EngineInputError naming the file and the header field for: not RIFF/WAVE (or RIFX/RF64),
 * a missing or short `fmt ` chunk, no `data` chunk, a chunk running past the end of the file
 * (truncated), a data size that is not a whole number of frames, a channel count other than 2,
 * an encoding other than those above (e.g. 8-bit PCM, 64-bit float, compressed codes), a zero
 * sample rate, fewer than 2 frames, NaN/Infinity in float samples.
 * Example: `parseCaptureWav(bytesOfStereoFloatWav)` → { sampleRateHz: 48000, encoding: 'float32', … }.
 */
export function parseCaptureWav(input: Uint8Array | ArrayBuffer, options: CaptureParseOptions = {}): Capture {
  const { file } = options;
  const bytes = toBytes(input);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (bytes.length < 12) {
    throw new EngineInputError(`the file has ${bytes.length} bytes, too short for a RIFF/WAVE header (12 bytes)`, {
      file,
      field: 'RIFF header',
    });
  }
  const riff = fourCharacterCode(bytes, 0);
  if (riff === 'RIFX' || riff === 'RF64') {
    throw new EngineInputError(`${riff} files are not supported; save the capture as a plain little-endian RIFF WAV`, {
      file,
      field: 'RIFF header',
    });
  }
  if (riff !== 'RIFF' || fourCharacterCode(bytes, 8) !== 'WAVE') {
    throw new EngineInputError('not a WAV file: it does not start with "RIFF" … "WAVE"', { file, field: 'RIFF header' });
  }
  let format: { code: number; channels: number; sampleRateHz: number; blockAlign: number; bits: number } | null = null;
  let dataOffset = -1;
  let dataLength = 0;
  let offset = 12;
  while (offset + 8 <= bytes.length) {
    const id = fourCharacterCode(bytes, offset);
    const size = view.getUint32(offset + 4, true);
    const bodyOffset = offset + 8;
    const available = bytes.length - bodyOffset;
    if (id === 'fmt ') {
      if (size < 16 || available < 16) {
        throw new EngineInputError(
          `the "fmt " chunk is ${Math.min(size, available)} bytes; at least 16 are needed (truncated file?)`,
          { file, field: 'fmt' },
        );
      }
      let code = view.getUint16(bodyOffset, true);
      if (code === WAVE_FORMAT_EXTENSIBLE) {
        if (size < 40 || available < 40) {
          throw new EngineInputError('the "fmt " chunk of a WAVE_FORMAT_EXTENSIBLE file is shorter than 40 bytes', {
            file,
            field: 'fmt',
          });
        }
        // The sub-format GUID starts with the plain format code.
        code = view.getUint16(bodyOffset + 24, true);
      }
      format = {
        code,
        channels: view.getUint16(bodyOffset + 2, true),
        sampleRateHz: view.getUint32(bodyOffset + 4, true),
        blockAlign: view.getUint16(bodyOffset + 12, true),
        bits: view.getUint16(bodyOffset + 14, true),
      };
    } else if (id === 'data') {
      if (size > available) {
        throw new EngineInputError(
          `the file is truncated: the "data" chunk declares ${size} bytes but only ${available} follow`,
          { file, field: 'data' },
        );
      }
      dataOffset = bodyOffset;
      dataLength = size;
      if (format !== null) break;
    } else if (size > available) {
      throw new EngineInputError(`the file is truncated: chunk "${id}" declares ${size} bytes but only ${available} follow`, {
        file,
        field: id.trim(),
      });
    }
    offset = bodyOffset + size + (size % 2);
  }
  if (format === null) {
    throw new EngineInputError('no "fmt " chunk: the WAV header is missing or truncated', { file, field: 'fmt' });
  }
  if (dataOffset < 0) {
    throw new EngineInputError('no "data" chunk: the file holds no samples (truncated?)', { file, field: 'data' });
  }
  const { code, channels, sampleRateHz, blockAlign, bits } = format;
  if (channels !== 2) {
    throw new EngineInputError(
      channels === 1
        ? 'the WAV file is mono; a capture needs 2 channels (left = amplifier input, right = output)'
        : `the WAV file has ${channels} channels; a capture needs exactly 2 (left = amplifier input, right = output)`,
      { file, field: 'fmt.channels' },
    );
  }
  let encoding: Capture['encoding'];
  if (code === WAVE_FORMAT_PCM && (bits === 16 || bits === 24 || bits === 32)) {
    encoding = bits === 16 ? 'pcm16' : bits === 24 ? 'pcm24' : 'pcm32';
  } else if (code === WAVE_FORMAT_IEEE_FLOAT && bits === 32) {
    encoding = 'float32';
  } else {
    const described =
      code === WAVE_FORMAT_PCM
        ? `${bits}-bit integer PCM`
        : code === WAVE_FORMAT_IEEE_FLOAT
          ? `${bits}-bit float`
          : `format code 0x${code.toString(16).padStart(4, '0')}${KNOWN_COMPRESSED_FORMATS[code] ? ` (${KNOWN_COMPRESSED_FORMATS[code]}, compressed)` : ''}`;
    throw new EngineInputError(
      `unsupported sample encoding ${described}; supported are 16-, 24- and 32-bit integer PCM and 32-bit float`,
      { file, field: 'fmt.encoding' },
    );
  }
  const bytesPerSample = bits / 8;
  if (blockAlign !== channels * bytesPerSample) {
    throw new EngineInputError(`block align ${blockAlign} does not match 2 channels of ${bits} bits`, {
      file,
      field: 'fmt.blockAlign',
    });
  }
  if (sampleRateHz === 0) {
    throw new EngineInputError('the sample rate in the header is 0 Hz', { file, field: 'fmt.sampleRate' });
  }
  if (dataLength % blockAlign !== 0) {
    throw new EngineInputError(
      `the file is truncated: the data (${dataLength} bytes) ends inside a frame of ${blockAlign} bytes`,
      { file, field: 'data' },
    );
  }
  const frameCount = dataLength / blockAlign;
  if (frameCount < 2) {
    throw new EngineInputError(`the data holds ${frameCount} frame${frameCount === 1 ? '' : 's'}; a capture needs many`, {
      file,
      field: 'data',
    });
  }

  let left: SampleArray;
  let right: SampleArray;
  if (encoding === 'float32') {
    left = new Float32Array(frameCount);
    right = new Float32Array(frameCount);
    if (littleEndianHost) {
      const { buffer, byteOffset } = alignedView(bytes, dataOffset, dataLength, 4);
      const interleaved = new Float32Array(buffer, byteOffset, frameCount * 2);
      let bad = -1;
      for (let frame = 0, k = 0; frame < frameCount; frame++, k += 2) {
        const l = interleaved[k];
        const r = interleaved[k + 1];
        left[frame] = l;
        right[frame] = r;
        // l − l is NaN for NaN and ±Infinity, 0 otherwise.
        if (l - l !== 0 || r - r !== 0) {
          bad = frame;
          break;
        }
      }
      if (bad >= 0) throwNotFinite(file, bad, interleaved[2 * bad]);
    } else {
      for (let frame = 0; frame < frameCount; frame++) {
        left[frame] = view.getFloat32(dataOffset + 8 * frame, true);
        right[frame] = view.getFloat32(dataOffset + 8 * frame + 4, true);
        if (!Number.isFinite(left[frame]) || !Number.isFinite(right[frame])) throwNotFinite(file, frame, left[frame]);
      }
    }
  } else if (encoding === 'pcm16') {
    const scale = 1 / 32768;
    left = new Float32Array(frameCount);
    right = new Float32Array(frameCount);
    if (littleEndianHost) {
      const { buffer, byteOffset } = alignedView(bytes, dataOffset, dataLength, 2);
      const interleaved = new Int16Array(buffer, byteOffset, frameCount * 2);
      for (let frame = 0, k = 0; frame < frameCount; frame++, k += 2) {
        left[frame] = interleaved[k] * scale;
        right[frame] = interleaved[k + 1] * scale;
      }
    } else {
      for (let frame = 0; frame < frameCount; frame++) {
        left[frame] = view.getInt16(dataOffset + 4 * frame, true) * scale;
        right[frame] = view.getInt16(dataOffset + 4 * frame + 2, true) * scale;
      }
    }
  } else if (encoding === 'pcm24') {
    const scale = 1 / 8388608;
    left = new Float32Array(frameCount);
    right = new Float32Array(frameCount);
    for (let frame = 0, k = dataOffset; frame < frameCount; frame++, k += 6) {
      // Little-endian 24-bit two's complement: shift into the top of an int32, then back down.
      left[frame] = (((bytes[k] | (bytes[k + 1] << 8) | (bytes[k + 2] << 16)) << 8) >> 8) * scale;
      right[frame] = (((bytes[k + 3] | (bytes[k + 4] << 8) | (bytes[k + 5] << 16)) << 8) >> 8) * scale;
    }
  } else {
    // 32-bit integers carry more digits than a float32 holds: keep them in float64.
    const scale = 1 / 2147483648;
    left = new Float64Array(frameCount);
    right = new Float64Array(frameCount);
    if (littleEndianHost) {
      const { buffer, byteOffset } = alignedView(bytes, dataOffset, dataLength, 4);
      const interleaved = new Int32Array(buffer, byteOffset, frameCount * 2);
      for (let frame = 0, k = 0; frame < frameCount; frame++, k += 2) {
        left[frame] = interleaved[k] * scale;
        right[frame] = interleaved[k + 1] * scale;
      }
    } else {
      for (let frame = 0; frame < frameCount; frame++) {
        left[frame] = view.getInt32(dataOffset + 8 * frame, true) * scale;
        right[frame] = view.getInt32(dataOffset + 8 * frame + 4, true) * scale;
      }
    }
  }
  return {
    file,
    input: left,
    output: right,
    sampleRateHz,
    startTimeS: 0,
    frameCount,
    format: 'wav',
    encoding,
    unit: 'full-scale',
  };
}

function throwNotFinite(file: string | undefined, frame: number, leftValue: number): never {
  const channel = Number.isFinite(leftValue) ? 'right (output)' : 'left (input)';
  throw new EngineInputError(`frame ${frame} of the ${channel} channel is not a finite number`, { file, field: 'data' });
}

/**
 * Reads a capture file of either format: RIFF/WAVE when the bytes start with "RIFF" (or RIFX/RF64,
 * which are then refused with a reason) or the name ends in `.wav`; CSV otherwise.
 *
 * @param input the file's bytes (or text, which is always CSV)
 * @param options file (name for messages and for the extension)
 * @returns as parseCaptureWav or parseCaptureCsv
 * Cost: O(size). Throws as those two do.
 * Example: `parseCaptureFile(bytes, { file: 'hrb204-0007.wav' })` → { format: 'wav', … }.
 */
export function parseCaptureFile(input: string | Uint8Array | ArrayBuffer, options: CaptureParseOptions = {}): Capture {
  if (typeof input === 'string') return parseCaptureCsv(input, options);
  const bytes = toBytes(input);
  const head = bytes.length >= 4 ? fourCharacterCode(bytes, 0) : '';
  const looksLikeWav = head === 'RIFF' || head === 'RIFX' || head === 'RF64';
  if (looksLikeWav || /\.wave?$/i.test(options.file ?? '')) return parseCaptureWav(bytes, options);
  return parseCaptureCsv(bytes, options);
}
