import type { Instrument as InstrumentView } from '../../shared/schemas/instruments';
import type { Instrument } from '../models';

const dueSoonDays = 30;

/** Calibration state on a given day (dates compared as ISO strings, UTC). */
export function calibrationState(dueOn: string | null, today: Date): InstrumentView['calibrationState'] {
  if (!dueOn) return 'unknown';
  const todayIso = today.toISOString().slice(0, 10);
  if (dueOn < todayIso) return 'overdue';
  const soon = new Date(today.getTime() + dueSoonDays * 24 * 3600_000).toISOString().slice(0, 10);
  return dueOn <= soon ? 'due-soon' : 'in-calibration';
}

export function presentInstrument(instrument: Instrument, today: Date): InstrumentView {
  return {
    id: instrument.id,
    name: instrument.name,
    kind: instrument.kind,
    manufacturer: instrument.manufacturer,
    model: instrument.model,
    serialNumber: instrument.serialNumber,
    calibratedOn: instrument.calibratedOn,
    calibrationDueOn: instrument.calibrationDueOn,
    calibrationState: calibrationState(instrument.calibrationDueOn, today),
    notes: instrument.notes,
    retired: instrument.retired,
  };
}
