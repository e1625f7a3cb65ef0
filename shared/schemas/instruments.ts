import { z } from 'zod';
import { optionalText, shortText } from './common';

export const instrumentKinds = ['signal generator', 'lock-in amplifier', 'audio analyser', 'oscilloscope', 'digitiser', 'differential probe', 'isolated probe', 'multimeter', 'fixture', 'other'] as const;

const isoDate = z.iso.date({ error: 'Use a date like 2026-03-31' });

export const instrumentInputSchema = z
  .object({
    name: shortText('Name', 120),
    kind: z.enum(instrumentKinds, { error: `Kind must be one of: ${instrumentKinds.join(', ')}` }),
    manufacturer: shortText('Manufacturer', 120),
    model: shortText('Model', 120),
    serialNumber: shortText('Serial number', 120),
    calibratedOn: isoDate.nullable().default(null),
    calibrationDueOn: isoDate.nullable().default(null),
    notes: optionalText('Notes'),
    retired: z.boolean().default(false),
  })
  .refine((value) => !value.calibratedOn || !value.calibrationDueOn || value.calibrationDueOn >= value.calibratedOn, {
    message: 'Calibration due date is before the calibration date',
    path: ['calibrationDueOn'],
  });
export type InstrumentInput = z.input<typeof instrumentInputSchema>;

export interface Instrument {
  id: string;
  name: string;
  kind: (typeof instrumentKinds)[number];
  manufacturer: string;
  model: string;
  serialNumber: string;
  calibratedOn: string | null;
  calibrationDueOn: string | null;
  /** `in-calibration`, `due-soon` (within 30 days), `overdue` or `unknown` (no due date), on the server's date. */
  calibrationState: 'in-calibration' | 'due-soon' | 'overdue' | 'unknown';
  notes: string;
  retired: boolean;
}
