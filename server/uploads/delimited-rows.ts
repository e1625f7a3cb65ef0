// Streams an uploaded delimited text file through csv-parse into raw rows with their line
// numbers. The delimiter is detected from the header line (the first line that is neither blank
// nor a `#` comment) by the engine's own rule, so uploads and the CLI agree.
import { Transform, type Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { parse } from 'csv-parse';
import { detectDelimiter, EngineInputError } from '../../shared/engine';

export interface DelimitedRows {
  delimiter: ',' | ';' | '\t';
  headerLine: number;
  header: string[];
  rows: { line: number; cells: string[] }[];
}

/** Holds the stream back until the header line is complete, then reports it. */
function headerPeek(onHeader: (headerLine: string) => void): Transform {
  let pending = '';
  let found = false;
  return new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      if (found) return callback(null, chunk);
      pending += chunk.toString('utf8');
      const lines = pending.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
      // The last piece may be an unfinished line.
      for (const line of lines.slice(0, -1)) {
        const trimmed = line.trim();
        if (trimmed !== '' && !trimmed.startsWith('#')) {
          found = true;
          onHeader(line);
          const all = pending;
          pending = '';
          return callback(null, Buffer.from(all, 'utf8'));
        }
      }
      callback();
    },
    flush(callback) {
      if (!found && pending.trim() !== '') {
        const line = pending
          .replace(/^\uFEFF/, '')
          .split(/\r\n|\n|\r/)
          .find((candidate) => candidate.trim() !== '' && !candidate.trim().startsWith('#'));
        if (line !== undefined) {
          found = true;
          onHeader(line);
        }
      }
      callback(null, pending ? Buffer.from(pending, 'utf8') : undefined);
    },
  });
}

/**
 * Reads every row of a delimited text stream. Throws EngineInputError (with the file name and
 * line) when the file is empty or not readable as delimited text; `maximumRows` bounds memory.
 */
export async function readDelimitedRows(source: Readable, options: { file: string; maximumRows: number }): Promise<DelimitedRows> {
  let delimiter: ',' | ';' | '\t' = ',';
  const parser = parse({
    delimiter: ',',
    bom: true,
    comment: '#',
    comment_no_infix: true,
    skip_empty_lines: true,
    relax_column_count: true,
    relax_quotes: true,
    info: true,
  });
  const peek = headerPeek((headerLine) => {
    delimiter = detectDelimiter(headerLine);
    // csv-parse reads its options when the first byte arrives, which is after this point.
    (parser as unknown as { options: { delimiter: Buffer[] } }).options.delimiter = [Buffer.from(delimiter)];
  });
  const records: { line: number; cells: string[] }[] = [];
  const collect = new Transform({
    objectMode: true,
    transform(entry: { record: string[]; info: { lines: number } }, _encoding, callback) {
      if (records.length > options.maximumRows) {
        return callback(new EngineInputError(`the file has more than ${options.maximumRows} rows, the most one upload may hold`, { file: options.file, row: entry.info.lines }));
      }
      records.push({ line: entry.info.lines, cells: entry.record });
      callback();
    },
  });
  try {
    await pipeline(source, peek, parser, collect);
  } catch (error) {
    if (error instanceof EngineInputError) throw error;
    const csvError = error as { message?: string; lines?: number };
    throw new EngineInputError(`the file is not readable as delimited text (${csvError.message ?? String(error)})`, { file: options.file, row: csvError.lines });
  }
  if (records.length === 0) throw new EngineInputError('the file is empty (no header line)', { file: options.file });
  const [headerRecord, ...rows] = records;
  return { delimiter, headerLine: headerRecord.line, header: headerRecord.cells.map((cell) => cell.trim()), rows };
}
