// Reading one frequency sweep (differential or common-mode drive) from CSV text.
//
// The rows are read and checked by the table reader and sweep builder of sweep-table.ts, the same
// code that server uploads with other headers go through. A small parser of our own rather than
// csv-parse: `csv-parse/sync` (its Node entry, lib/sync.js)
// calls Node's global `Buffer`, which does not exist in a browser bundle, and its browser entry
// (`csv-parse/browser/esm/sync`) carries a Buffer polyfill the engine would then ship to Node and
// browser alike. The format here is narrow (numbers, one header, `#` comments), so a careful
// line-by-line reader is short, reports exact line numbers, and parses a 1,000-row sweep about
// three times faster than csv-parse/sync does here.
import { EngineInputError } from './errors';
import { createSweepBuilder, readDelimitedTable } from './sweep-table';

/** One sweep, sorted by rising frequency, one entry per distinct frequency. */
export interface Sweep {
  /** Name of the file the sweep came from, when the caller gave one (used in messages). */
  file?: string;
  /** Test frequencies in hertz, strictly rising. */
  frequencyHz: Float64Array;
  /** Drive amplitude in volts (peak or RMS: the same convention as `voutVolts`). */
  vinVolts: Float64Array;
  /** Output amplitude in volts. */
  voutVolts: Float64Array;
  /** `voutVolts / vinVolts`, dimensionless. */
  gain: Float64Array;
  /** Output phase relative to the drive in degrees, or null when the file has no `phase_deg` column. */
  phaseDeg: Float64Array | null;
  /** Output noise floor in volts (same bandwidth and convention), or null without `floor_v`. */
  floorVolts: Float64Array | null;
  /** 1-based line number in the file of each point (the first line when repeats were averaged). */
  lineNumber: Int32Array;
  /** How many rows were averaged into each point (1 unless `averageRepeats` merged repeats). */
  repeatCount: Int32Array;
}

/** Options for {@link parseSweepCsv}. */
export interface SweepParseOptions {
  /** File name used in error messages and kept on the result. */
  file?: string;
  /**
   * Average rows that repeat a frequency (mean of vin, vout, floor; circular mean of phase)
   * instead of rejecting the file. Default false: a repeated frequency is an error.
   */
  averageRepeats?: boolean;
}

const requiredColumns = ['frequency_hz', 'vin_v', 'vout_v'] as const;
const optionalColumns = ['phase_deg', 'floor_v'] as const;
type ColumnName = (typeof requiredColumns)[number] | (typeof optionalColumns)[number];


function decodeText(input: string | Uint8Array | ArrayBuffer): string {
  if (typeof input === 'string') return input;
  const bytes = input instanceof Uint8Array ? input : new Uint8Array(input);
  return new TextDecoder('utf-8').decode(bytes);
}



/**
 * Parses a sweep CSV: a header naming at least `frequency_hz`, `vin_v` and `vout_v` (optionally
 * `phase_deg` and `floor_v`, in any order, case-insensitive; other columns are ignored), then one
 * row per test frequency. Lines starting with `#` and blank lines are skipped. The delimiter
 * (comma, semicolon or tab) is detected from the header; with semicolon or tab, a decimal comma
 * is accepted. Cells may be double-quoted (but may not contain the delimiter). Rows in falling
 * order are sorted.
 *
 * Units: frequency in Hz, amplitudes and floor in volts (any one convention, peak or RMS, for
 * all of them), phase in degrees. Cost O(n log n) for n rows (the sort).
 *
 * Throws {@link EngineInputError} with file, line and column for: an empty file or one without
 * data rows, fewer than 2 points, a missing or duplicated column, a row with a different number of
 * cells than the header, text or NaN/Inf in a numeric cell, a frequency or vin that is zero or
 * negative, a vout that is negative or zero (zero is allowed only with a positive `floor_v`: a
 * reading below the floor), a negative floor, and a repeated frequency unless `averageRepeats`.
 *
 * @example parseSweepCsv('frequency_hz,vin_v,vout_v\n100,1,0.5\n1000,1,0.49').gain // Float64Array [0.5, 0.49]
 */
export function parseSweepCsv(input: string | Uint8Array | ArrayBuffer, options: SweepParseOptions = {}): Sweep {
  const file = options.file;
  const table = readDelimitedTable(decodeText(input), {
    file,
    functionName: 'parseSweepCsv',
    emptyMessage: 'the sweep file is empty (no header line frequency_hz,vin_v,vout_v)',
  });
  const lowerHeader = table.header.map((name) => name.toLowerCase());
  const known = new Set<string>([...requiredColumns, ...optionalColumns]);
  const seen = new Map<string, number>();
  lowerHeader.forEach((name, index) => {
    if (!known.has(name)) return;
    const previous = seen.get(name);
    if (previous !== undefined) {
      throw new EngineInputError(`parseSweepCsv: column "${name}" appears twice in the header (columns ${previous + 1} and ${index + 1})`, {
        file,
        row: table.headerLine,
        column: index + 1,
        field: name,
      });
    }
    seen.set(name, index);
  });
  for (const name of requiredColumns) {
    if (!seen.has(name)) {
      throw new EngineInputError(
        `parseSweepCsv: the header has no "${name}" column (found: ${lowerHeader.join(', ') || 'nothing'}; ` +
          `required: ${requiredColumns.join(', ')}; optional: ${optionalColumns.join(', ')})`,
        { file, row: table.headerLine, field: name },
      );
    }
  }
  const column = (name: ColumnName) => ({ column: table.header[seen.get(name)!] });
  const builder = createSweepBuilder(
    table.header,
    {
      frequency: column('frequency_hz'),
      vin: column('vin_v'),
      vout: column('vout_v'),
      phase: seen.has('phase_deg') ? column('phase_deg') : null,
      floor: seen.has('floor_v') ? column('floor_v') : null,
    },
    { file, averageRepeats: options.averageRepeats, allowDecimalComma: table.delimiter !== ',', headerLine: table.headerLine, functionName: 'parseSweepCsv' },
  );
  for (const row of table.rows) builder.addRow(row.line, row.cells);
  return builder.finish();
}
