// The sweep upload's mapping step, without the page: read the start of a file, guess or recall
// which column is which, and check the previewed rows with the same engine code the server runs,
// so the first problem shows (with its row and column) before anything is uploaded.
import { EngineInputError } from '../../../../shared/engine/errors';
import { createSweepBuilder, readDelimitedTable, type DelimitedTable } from '../../../../shared/engine/sweep-table';
import { engineColumnMapping } from '../../../../shared/sweep-mapping';
import {
  canonicalMapping,
  type AmplitudeUnit,
  type ColumnMapping,
  type FrequencyUnit,
} from '../../../../shared/schemas/sweeps';

/** How much of a file the browser reads for the preview, bytes. */
export const previewBytes = 64 * 1024;

export type SweepPreview = { table: DelimitedTable; fileName: string; fileBytes: number; partial: boolean };

/**
 * Splits the first `previewBytes` of a file's text into header and rows. When the file is longer,
 * the last line may be cut in the middle, so it is left out.
 * @throws EngineInputError when there is no header line.
 */
export function previewFromText(text: string, fileName: string, fileBytes: number): SweepPreview {
  const partial = fileBytes > previewBytes;
  const usable = partial ? text.slice(0, Math.max(0, text.lastIndexOf('\n'))) : text;
  return { table: readDelimitedTable(usable, { file: fileName, functionName: 'preview' }), fileName, fileBytes, partial };
}

/** Reads the preview of a chosen file in the browser (only its first 64 KB). */
export async function readPreview(file: File): Promise<SweepPreview> {
  const text = await file.slice(0, previewBytes).text();
  return previewFromText(text, file.name, file.size);
}

const tokens = (header: string) => header.toLowerCase().split(/[^a-z0-9µ]+/).filter(Boolean);

function findColumn(header: readonly string[], words: readonly string[], taken: Set<string>): string | null {
  for (const word of words) {
    const found = header.find((name) => !taken.has(name) && tokens(name).includes(word));
    if (found) return found;
  }
  return null;
}

function frequencyUnitOf(column: string): FrequencyUnit {
  const words = tokens(column);
  if (words.includes('mhz')) return 'MHz';
  if (words.includes('khz')) return 'kHz';
  return 'Hz';
}

function amplitudeOf(column: string): { unit: AmplitudeUnit; convention: 'peak' | 'rms' } {
  const words = tokens(column);
  const unit: AmplitudeUnit = words.includes('dbv') ? 'dBV' : words.includes('mv') ? 'mV' : words.includes('uv') || words.includes('µv') ? 'µV' : 'V';
  const convention = words.some((word) => word === 'pk' || word === 'peak' || word === 'vpk' || word === 'mvpk') ? 'peak' : 'rms';
  return { unit, convention };
}

/**
 * The best guess at a mapping from the header's words: the canonical header exactly, else columns
 * named like frequency / input / output / phase / floor, with units and peak/RMS read from the
 * name ("Freq (kHz)", "Out (mV pk)"). Unmatched quantities get the first unused column.
 */
export function guessMapping(header: readonly string[]): ColumnMapping {
  const canonical = canonicalMapping(header);
  if (canonical) return canonical;
  const taken = new Set<string>();
  const take = (words: readonly string[]) => {
    const found = findColumn(header, words, taken) ?? header.find((name) => !taken.has(name)) ?? header[0] ?? '';
    taken.add(found);
    return found;
  };
  const frequency = take(['frequency', 'freq', 'f', 'hz', 'khz', 'mhz']);
  const vin = take(['vin', 'in', 'input', 'drive', 'stimulus', 'source', 'ch1']);
  const vout = take(['vout', 'out', 'output', 'response', 'ch2']);
  const phaseColumn = findColumn(header, ['phase', 'deg', 'degrees'], taken);
  if (phaseColumn) taken.add(phaseColumn);
  const floorColumn = findColumn(header, ['floor', 'noise'], taken);
  return {
    frequency: { column: frequency, unit: frequencyUnitOf(frequency) },
    vin: { column: vin, ...amplitudeOf(vin) },
    vout: { column: vout, ...amplitudeOf(vout) },
    phase: phaseColumn ? { column: phaseColumn } : null,
    floor: floorColumn ? { column: floorColumn, ...amplitudeOf(floorColumn) } : null,
  };
}

/** The remembered mapping when it was made for exactly this header (same names, same order), else null. */
export function rememberedMappingFor(remembered: { header: string[]; mapping: ColumnMapping } | null | undefined, header: readonly string[]): ColumnMapping | null {
  if (!remembered) return null;
  if (remembered.header.length !== header.length || remembered.header.some((name, index) => name !== header[index])) return null;
  return remembered.mapping;
}

export type PreviewCheck =
  | { ok: true; rowsChecked: number; firstFrequencyHz: number | null; lastFrequencyHz: number | null }
  | { ok: false; message: string; row: number | null; column: string | number | null };

/**
 * Runs the previewed rows through the engine's sweep builder with this mapping. A partial preview
 * is not asked for two distinct frequencies of its own beyond what it holds; the server checks the
 * whole file again on upload.
 */
export function checkPreview(preview: SweepPreview, mapping: ColumnMapping, averageRepeats: boolean): PreviewCheck {
  try {
    const builder = createSweepBuilder(preview.table.header, engineColumnMapping(mapping), {
      file: preview.fileName,
      averageRepeats,
      allowDecimalComma: preview.table.delimiter !== ',',
      headerLine: preview.table.headerLine,
      functionName: 'upload',
    });
    for (const row of preview.table.rows) builder.addRow(row.line, row.cells);
    const sweep = builder.finish();
    const frequencies = sweep.frequencyHz;
    return { ok: true, rowsChecked: builder.rowCount, firstFrequencyHz: frequencies[0] ?? null, lastFrequencyHz: frequencies[frequencies.length - 1] ?? null };
  } catch (error) {
    if (error instanceof EngineInputError) {
      return { ok: false, message: error.message, row: error.location.row ?? null, column: error.location.column ?? null };
    }
    throw error;
  }
}
