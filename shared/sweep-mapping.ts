// A stored column mapping (shared/schemas/sweeps.ts) as the engine's mapping with unit
// converters: used by the server's upload and by the browser's preview, so both read a file alike.
import type { SweepColumnMapping } from './engine';
import { amplitudeToRmsVolts, frequencyUnits, type ColumnMapping } from './schemas/sweeps';

/** The engine's column mapping for a stored one: frequencies to Hz, amplitudes to volts RMS. */
export function engineColumnMapping(mapping: ColumnMapping): SweepColumnMapping {
  const amplitude = (column: ColumnMapping['vin']) => ({
    column: column.column,
    toSweepUnit: (value: number) => amplitudeToRmsVolts(value, column.unit, column.convention),
    unitLabel: column.unit === 'dBV' ? 'dBV' : `${column.unit} ${column.convention}`,
  });
  const scale = frequencyUnits[mapping.frequency.unit];
  return {
    frequency: { column: mapping.frequency.column, toSweepUnit: (value) => value * scale, unitLabel: mapping.frequency.unit },
    vin: amplitude(mapping.vin),
    vout: amplitude(mapping.vout),
    phase: mapping.phase ? { column: mapping.phase.column, unitLabel: 'degrees' } : null,
    floor: mapping.floor ? amplitude(mapping.floor) : null,
  };
}
