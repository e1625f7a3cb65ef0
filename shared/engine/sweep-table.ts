// Building a sweep from any table: a header, rows of cells, and a mapping that says which column
// holds what and in which unit. The canonical CSV reader (sweep-file.ts), the server's streaming
// upload and the browser's mapping preview all go through the builder here, so they accept and
// refuse the same things with the same messages.
import { EngineInputError } from './errors';
import type { Sweep } from './sweep-file';

/** Which column holds a quantity, and how to turn its numbers into the sweep's unit. */
export interface SweepColumn {
  /** Header name of the column, as written in the file. */
  column: string;
  /** Converts a cell's number to Hz (frequency), volts (amplitudes) or degrees (phase). Default: unchanged. */
  toSweepUnit?: (value: number) => number;
  /** Describes the unit for messages, e.g. "mV peak". */
  unitLabel?: string;
}

/** The mapping from table columns to a sweep. */
export interface SweepColumnMapping {
  frequency: SweepColumn;
  vin: SweepColumn;
  vout: SweepColumn;
  phase?: SweepColumn | null;
  floor?: SweepColumn | null;
}

/** Options for {@link createSweepBuilder}. */
export interface SweepBuilderOptions {
  /** File name for messages and the result. */
  file?: string;
  /** Average rows that repeat a frequency instead of refusing the file (default false). */
  averageRepeats?: boolean;
  /** Accept a decimal comma in cells ("0,5"): only when the delimiter is not a comma. */
  allowDecimalComma?: boolean;
  /** Name used at the start of messages (default "parseSweepCsv"). */
  functionName?: string;
  /** 1-based line of the header, for messages about the header. */
  headerLine?: number;
}

/** Builds a sweep row by row; see {@link createSweepBuilder}. */
export interface SweepBuilder {
  /** Adds one data row; `line` is its 1-based line in the file. Throws on a bad cell. */
  addRow(line: number, cells: readonly string[]): void;
  /** Rows added so far. */
  readonly rowCount: number;
  /** Sorts, checks repeats and returns the sweep. Throws when there are fewer than 2 frequencies. */
  finish(): Sweep;
}

// A plain decimal number: sign, digits with an optional point, optional exponent. Anything else
// ("1.2V", "0x10", "1 000") is refused rather than half-read as Number() or parseFloat() would.
const decimalNumber = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
// The same with a decimal comma, for spreadsheets in decimal-comma locales (`1000;0,5;0,49`).
const decimalCommaNumber = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;
const notFinite = /^[+-]?(?:nan|inf|infinity)$/i;

/** Removes surrounding double quotes (and doubled inner quotes) and white space from a cell. */
export function unquoteCell(cell: string): string {
  const trimmed = cell.trim();
  if (trimmed.length >= 2 && trimmed.startsWith('"') && trimmed.endsWith('"')) {
    return trimmed.slice(1, -1).replace(/""/g, '"').trim();
  }
  return trimmed;
}

/**
 * Reads one numeric cell strictly: a plain decimal (a decimal comma too when allowed), never
 * text, NaN or Inf. O(length of the cell).
 *
 * @throws EngineInputError naming the file, row and column when the cell is empty, text, NaN/Inf or overflows.
 * @example parseNumberCell('2.5e3', false, { row: 4, column: 'frequency_hz' }) // 2500
 */
export function parseNumberCell(
  cell: string,
  allowDecimalComma: boolean,
  location: { file?: string; row: number; column: string },
  functionName = 'parseSweepCsv',
): number {
  const raw = unquoteCell(cell);
  if (raw === '') throw new EngineInputError(`${functionName}: the cell is empty, a number is required`, location);
  if (notFinite.test(raw)) throw new EngineInputError(`${functionName}: "${raw}" is not a finite number`, location);
  let value: number;
  if (decimalNumber.test(raw)) value = Number(raw);
  else if (allowDecimalComma && decimalCommaNumber.test(raw)) value = Number(raw.replace(',', '.'));
  else throw new EngineInputError(`${functionName}: "${raw}" is not a number`, location);
  if (!Number.isFinite(value)) throw new EngineInputError(`${functionName}: "${raw}" overflows to infinity`, location);
  return value;
}

/** Picks the delimiter that splits a header line into the most fields: tab, semicolon or comma. */
export function detectDelimiter(headerLine: string): ',' | ';' | '\t' {
  let best: ',' | ';' | '\t' = ',';
  let bestCount = 0;
  for (const candidate of ['\t', ';', ','] as const) {
    const count = headerLine.split(candidate).length - 1;
    if (count > bestCount) {
      best = candidate;
      bestCount = count;
    }
  }
  return best;
}

/** A delimited text table: its header and its data rows with their line numbers. */
export interface DelimitedTable {
  delimiter: ',' | ';' | '\t';
  /** 1-based line of the header. */
  headerLine: number;
  /** Header cells as written (unquoted, trimmed). */
  header: string[];
  rows: { line: number; cells: string[] }[];
  /** True when reading stopped at `maximumRows`. */
  truncated: boolean;
}

/**
 * Splits delimited text into a header and rows: blank lines and lines starting with `#` are
 * skipped, the first other line is the header, the delimiter (comma, semicolon or tab) is detected
 * from it. Cells are not interpreted. O(length of the text).
 *
 * @throws EngineInputError when the text has no header line.
 * @example readDelimitedTable('# bench\nf;v\n1;2').header // ['f', 'v']
 */
export function readDelimitedTable(
  text: string,
  options: { file?: string; maximumRows?: number; functionName?: string; emptyMessage?: string } = {},
): DelimitedTable {
  const functionName = options.functionName ?? 'readDelimitedTable';
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  let headerIndex = -1;
  for (let index = 0; index < lines.length; index++) {
    const trimmed = lines[index].trim();
    if (trimmed !== '' && !trimmed.startsWith('#')) {
      headerIndex = index;
      break;
    }
  }
  if (headerIndex < 0) throw new EngineInputError(`${functionName}: ${options.emptyMessage ?? 'the file is empty (no header line)'}`, { file: options.file });
  const delimiter = detectDelimiter(lines[headerIndex]);
  const header = lines[headerIndex].split(delimiter).map(unquoteCell);
  const rows: DelimitedTable['rows'] = [];
  const maximumRows = options.maximumRows ?? Infinity;
  let truncated = false;
  for (let index = headerIndex + 1; index < lines.length; index++) {
    const trimmed = lines[index].trim();
    if (trimmed === '' || trimmed.startsWith('#')) continue;
    if (rows.length >= maximumRows) {
      truncated = true;
      break;
    }
    rows.push({ line: index + 1, cells: lines[index].split(delimiter) });
  }
  return { delimiter, headerLine: headerIndex + 1, header, rows, truncated };
}

type Quantity = 'frequency' | 'vin' | 'vout' | 'phase' | 'floor';

/** One reading already in the sweep's units: Hz, volts, degrees. */
export interface SweepReading {
  /** 1-based line (or sequence number) the reading came from, for messages. */
  line: number;
  frequencyHz: number;
  vinVolts: number;
  voutVolts: number;
  phaseDeg?: number | null;
  floorVolts?: number | null;
}

/** Options for {@link createSweepAccumulator}. */
export interface SweepAccumulatorOptions {
  file?: string;
  averageRepeats?: boolean;
  functionName?: string;
  headerLine?: number;
  /** Whether the sweep carries phases and floors (null arrays otherwise). */
  hasPhase: boolean;
  hasFloor: boolean;
  /** Column names used in messages (default frequency_hz, vin_v, vout_v, phase_deg, floor_v). */
  columnNames?: Partial<Record<Quantity, string>>;
}

/** Collects readings and turns them into a sweep; see {@link createSweepAccumulator}. */
export interface SweepAccumulator {
  add(reading: SweepReading): void;
  readonly rowCount: number;
  finish(): Sweep;
}

/** True when `compare` puts no neighbouring pair of `items` out of order (a NaN comparison counts as out of order). O(n). */
function isSortedBy<T>(items: readonly T[], compare: (a: T, b: T) => number): boolean {
  for (let index = 1; index < items.length; index++) {
    if (!(compare(items[index - 1], items[index]) <= 0)) return false;
  }
  return true;
}

/**
 * Collects readings already in Hz, volts and degrees, checking each: a frequency or drive that
 * is not positive, a negative output or floor, a zero output without a positive floor, a value
 * that is not finite. `finish()` sorts by frequency (a sweep in falling order is simply sorted),
 * refuses a repeated frequency unless `averageRepeats` (then means of vin, vout and floor, circular
 * mean of phase), and needs at least 2 frequencies. O(n log n) for n readings, O(n) when they arrive sorted.
 *
 * @throws EngineInputError naming the file, row and column of the first bad reading.
 * @example createSweepAccumulator({ hasPhase: false, hasFloor: false }) // then add() and finish()
 */
export function createSweepAccumulator(options: SweepAccumulatorOptions): SweepAccumulator {
  const file = options.file;
  const functionName = options.functionName ?? 'parseSweepCsv';
  const names: Record<Quantity, string> = {
    frequency: 'frequency_hz',
    vin: 'vin_v',
    vout: 'vout_v',
    phase: 'phase_deg',
    floor: 'floor_v',
    ...options.columnNames,
  };
  const frequencies: number[] = [];
  const vins: number[] = [];
  const vouts: number[] = [];
  const phases: number[] = [];
  const floors: number[] = [];
  const lines: number[] = [];
  // Defined once rather than per reading: a long sweep adds 100,000 readings.
  const at = (quantity: Quantity, line: number) => ({ file, row: line, column: names[quantity] });
  const requireFinite = (quantity: Quantity, value: number, line: number) => {
    if (!Number.isFinite(value)) throw new EngineInputError(`${functionName}: ${value} is not a finite number`, at(quantity, line));
  };

  return {
    get rowCount() {
      return frequencies.length;
    },
    add(reading) {
      const { line, frequencyHz, vinVolts, voutVolts } = reading;
      const phaseDeg = options.hasPhase ? (reading.phaseDeg ?? 0) : 0;
      const floorVolts = options.hasFloor ? (reading.floorVolts ?? 0) : 0;
      // In this order, so the first bad value of a row is the one named.
      requireFinite('frequency', frequencyHz, line);
      requireFinite('vin', vinVolts, line);
      requireFinite('vout', voutVolts, line);
      requireFinite('phase', phaseDeg, line);
      requireFinite('floor', floorVolts, line);
      if (!(frequencyHz > 0)) throw new EngineInputError(`${functionName}: frequency must be positive, got ${frequencyHz}`, at('frequency', line));
      if (!(vinVolts > 0)) throw new EngineInputError(`${functionName}: drive amplitude must be positive, got ${vinVolts}`, at('vin', line));
      if (floorVolts < 0) throw new EngineInputError(`${functionName}: noise floor cannot be negative, got ${floorVolts}`, at('floor', line));
      if (voutVolts < 0 || (voutVolts === 0 && !(floorVolts > 0))) {
        throw new EngineInputError(
          `${functionName}: output amplitude must be positive, got ${voutVolts}` +
            (voutVolts === 0 ? ` (a zero reading is accepted only with a positive ${names.floor} on the same row)` : ''),
          at('vout', line),
        );
      }
      frequencies.push(frequencyHz);
      vins.push(vinVolts);
      vouts.push(voutVolts);
      phases.push(phaseDeg);
      floors.push(floorVolts);
      lines.push(line);
    },
    finish() {
      if (frequencies.length === 0) {
        throw new EngineInputError(`${functionName}: the sweep file has a header but no data rows`, { file, row: options.headerLine });
      }
      if (frequencies.length === 1) {
        throw new EngineInputError(`${functionName}: the sweep has a single row; a sweep needs at least 2 frequencies`, { file, row: lines[0] });
      }
      const byFrequencyThenLine = (a: number, b: number) => frequencies[a] - frequencies[b] || lines[a] - lines[b];
      const order = frequencies.map((_, index) => index);
      // Readings read back from the database arrive in this order already, and the sort is
      // stable: it would leave them as they are. Checking is O(n), sorting 100,000 is not.
      if (!isSortedBy(order, byFrequencyThenLine)) order.sort(byFrequencyThenLine);

      // Each point is a run of equal frequencies in `order`, starting at runStarts[point].
      const runStarts: number[] = [];
      for (let position = 0; position < order.length; position++) {
        const index = order[position];
        if (position > 0 && frequencies[order[position - 1]] === frequencies[index]) {
          if (!options.averageRepeats) {
            throw new EngineInputError(
              `${functionName}: frequency ${frequencies[index]} Hz is repeated (also on line ${lines[order[runStarts[runStarts.length - 1]]]}); ` +
                'remove the repeat or ask for repeats to be averaged',
              { file, row: lines[index], column: names.frequency },
            );
          }
        } else {
          runStarts.push(position);
        }
      }
      if (runStarts.length < 2) {
        throw new EngineInputError(`${functionName}: after averaging repeats the sweep has a single frequency; at least 2 are needed`, { file, row: lines[0] });
      }

      const count = runStarts.length;
      const sweep: Sweep = {
        file,
        frequencyHz: new Float64Array(count),
        vinVolts: new Float64Array(count),
        voutVolts: new Float64Array(count),
        gain: new Float64Array(count),
        phaseDeg: options.hasPhase ? new Float64Array(count) : null,
        floorVolts: options.hasFloor ? new Float64Array(count) : null,
        lineNumber: new Int32Array(count),
        repeatCount: new Int32Array(count),
      };
      for (let point = 0; point < count; point++) {
        const start = runStarts[point];
        const end = point + 1 < count ? runStarts[point + 1] : order.length;
        const size = end - start;
        // The circular mean of phases is needed only where there are phases to average.
        const averagePhase = sweep.phaseDeg !== null && size > 1;
        let vin = 0;
        let vout = 0;
        let floor = 0;
        let sine = 0;
        let cosine = 0;
        let firstLine = Infinity;
        for (let position = start; position < end; position++) {
          const index = order[position];
          vin += vins[index];
          vout += vouts[index];
          floor += floors[index];
          if (averagePhase) {
            sine += Math.sin((phases[index] * Math.PI) / 180);
            cosine += Math.cos((phases[index] * Math.PI) / 180);
          }
          firstLine = Math.min(firstLine, lines[index]);
        }
        sweep.frequencyHz[point] = frequencies[order[start]];
        sweep.vinVolts[point] = vin / size;
        sweep.voutVolts[point] = vout / size;
        sweep.gain[point] = vout / vin;
        if (sweep.phaseDeg) sweep.phaseDeg[point] = averagePhase ? (Math.atan2(sine, cosine) * 180) / Math.PI : phases[order[start]];
        if (sweep.floorVolts) sweep.floorVolts[point] = floor / size;
        sweep.lineNumber[point] = firstLine;
        sweep.repeatCount[point] = size;
      }
      return sweep;
    },
  };
}

/**
 * A sweep from readings already in Hz, volts and degrees (points streamed from the bench or read
 * back from the database). Same checks as {@link createSweepAccumulator}. O(n log n).
 *
 * @throws EngineInputError for a bad reading, or fewer than 2 frequencies.
 * @example sweepFromReadings([{ line: 1, frequencyHz: 100, vinVolts: 1, voutVolts: 10 }, { line: 2, frequencyHz: 1000, vinVolts: 1, voutVolts: 9.9 }]).gain // [10, 9.9]
 */
export function sweepFromReadings(
  readings: Iterable<SweepReading>,
  options: Omit<SweepAccumulatorOptions, 'hasPhase' | 'hasFloor'> & { hasPhase?: boolean; hasFloor?: boolean } = {},
): Sweep {
  const list = Array.isArray(readings) ? (readings as SweepReading[]) : [...readings];
  const accumulator = createSweepAccumulator({
    ...options,
    functionName: options.functionName ?? 'sweepFromReadings',
    hasPhase: options.hasPhase ?? list.some((reading) => reading.phaseDeg !== null && reading.phaseDeg !== undefined),
    hasFloor: options.hasFloor ?? list.some((reading) => reading.floorVolts !== null && reading.floorVolts !== undefined),
  });
  for (const reading of list) accumulator.add(reading);
  return accumulator.finish();
}

/**
 * Starts building a sweep from rows whose columns `mapping` names in `header`. Each row's cells
 * are read strictly ({@link parseNumberCell}), converted to Hz, volts and degrees with the
 * mapping's converters, then checked and collected as in {@link createSweepAccumulator}.
 * O(n log n) for n rows.
 *
 * @throws EngineInputError naming the file, row and column: a mapped column missing from or
 *   repeated in the header, a row with a different number of cells, and the checks above.
 * @example createSweepBuilder(['f', 'a', 'b'], { frequency: { column: 'f' }, vin: { column: 'a' }, vout: { column: 'b' } })
 */
export function createSweepBuilder(header: readonly string[], mapping: SweepColumnMapping, options: SweepBuilderOptions = {}): SweepBuilder {
  const file = options.file;
  const functionName = options.functionName ?? 'parseSweepCsv';
  const headerLine = options.headerLine;
  const allowDecimalComma = options.allowDecimalComma ?? false;

  const columnIndex = (quantity: Quantity, column: SweepColumn): number => {
    const wanted = column.column.trim().toLowerCase();
    const matches = header.map((name, index) => (name.trim().toLowerCase() === wanted ? index : -1)).filter((index) => index >= 0);
    if (matches.length === 0) {
      throw new EngineInputError(`${functionName}: the header has no "${column.column}" column for ${quantity} (found: ${header.join(', ') || 'nothing'})`, {
        file,
        row: headerLine,
        field: quantity,
      });
    }
    if (matches.length > 1) {
      throw new EngineInputError(`${functionName}: column "${column.column}" appears twice in the header (columns ${matches[0] + 1} and ${matches[1] + 1})`, {
        file,
        row: headerLine,
        column: matches[1] + 1,
        field: column.column,
      });
    }
    return matches[0];
  };
  const columns = {
    frequency: columnIndex('frequency', mapping.frequency),
    vin: columnIndex('vin', mapping.vin),
    vout: columnIndex('vout', mapping.vout),
    phase: mapping.phase ? columnIndex('phase', mapping.phase) : -1,
    floor: mapping.floor ? columnIndex('floor', mapping.floor) : -1,
  };
  const accumulator = createSweepAccumulator({
    file,
    functionName,
    headerLine,
    averageRepeats: options.averageRepeats,
    hasPhase: columns.phase >= 0,
    hasFloor: columns.floor >= 0,
    columnNames: {
      frequency: header[columns.frequency],
      vin: header[columns.vin],
      vout: header[columns.vout],
      ...(columns.phase >= 0 ? { phase: header[columns.phase] } : {}),
      ...(columns.floor >= 0 ? { floor: header[columns.floor] } : {}),
    },
  });

  const read = (cells: readonly string[], index: number, line: number, column: SweepColumn) => {
    const value = parseNumberCell(cells[index], allowDecimalComma, { file, row: line, column: header[index] }, functionName);
    return column.toSweepUnit ? column.toSweepUnit(value) : value;
  };

  return {
    get rowCount() {
      return accumulator.rowCount;
    },
    addRow(line, cells) {
      if (cells.length !== header.length) {
        throw new EngineInputError(`${functionName}: the row has ${cells.length} cells but the header has ${header.length}`, { file, row: line });
      }
      accumulator.add({
        line,
        frequencyHz: read(cells, columns.frequency, line, mapping.frequency),
        vinVolts: read(cells, columns.vin, line, mapping.vin),
        voutVolts: read(cells, columns.vout, line, mapping.vout),
        phaseDeg: columns.phase < 0 ? null : read(cells, columns.phase, line, mapping.phase!),
        floorVolts: columns.floor < 0 ? null : read(cells, columns.floor, line, mapping.floor!),
      });
    },
    finish: () => accumulator.finish(),
  };
}
