import { z } from 'zod';

export const sweepModes = ['differential', 'common-mode'] as const;
export type SweepMode = (typeof sweepModes)[number];
export const sweepModeSchema = z.enum(sweepModes, { error: 'Mode must be differential or common-mode' });

export const frequencyUnits = { Hz: 1, kHz: 1e3, MHz: 1e6 } as const;
export type FrequencyUnit = keyof typeof frequencyUnits;
export const amplitudeUnits = ['V', 'mV', 'µV', 'dBV'] as const;
export type AmplitudeUnit = (typeof amplitudeUnits)[number];
export type AmplitudeConvention = 'peak' | 'rms';

const amplitudeColumn = z.object({
  column: z.string().min(1),
  unit: z.enum(amplitudeUnits, { error: `Unit must be one of: ${amplitudeUnits.join(', ')}` }),
  convention: z.enum(['peak', 'rms'], { error: 'Convention must be peak or rms' }),
});

/**
 * How the columns of an uploaded table map onto a sweep. Amplitudes are stored in volts RMS
 * (dBV is RMS by its definition: dB re 1 V rms).
 */
export const columnMappingSchema = z.object({
  frequency: z.object({ column: z.string().min(1), unit: z.enum(['Hz', 'kHz', 'MHz'], { error: 'Unit must be Hz, kHz or MHz' }) }),
  vin: amplitudeColumn,
  vout: amplitudeColumn,
  phase: z.object({ column: z.string().min(1) }).nullable().default(null),
  floor: amplitudeColumn.nullable().default(null),
});
export type ColumnMapping = z.infer<typeof columnMappingSchema>;

/** The mapping a file with the engine's own header needs: volts, one convention. */
export function canonicalMapping(header: readonly string[]): ColumnMapping | null {
  const lower = header.map((name) => name.trim().toLowerCase());
  if (!['frequency_hz', 'vin_v', 'vout_v'].every((name) => lower.includes(name))) return null;
  const find = (name: string) => header[lower.indexOf(name)];
  return {
    frequency: { column: find('frequency_hz'), unit: 'Hz' },
    vin: { column: find('vin_v'), unit: 'V', convention: 'rms' },
    vout: { column: find('vout_v'), unit: 'V', convention: 'rms' },
    phase: lower.includes('phase_deg') ? { column: find('phase_deg') } : null,
    floor: lower.includes('floor_v') ? { column: find('floor_v'), unit: 'V', convention: 'rms' } : null,
  };
}

/** Converts one amplitude reading to volts RMS. */
export function amplitudeToRmsVolts(value: number, unit: AmplitudeUnit, convention: AmplitudeConvention): number {
  if (unit === 'dBV') return 10 ** (value / 20);
  const volts = unit === 'V' ? value : unit === 'mV' ? value * 1e-3 : value * 1e-6;
  return convention === 'peak' ? volts / Math.SQRT2 : volts;
}

export const uploadSweepFieldsSchema = z.object({
  mode: sweepModeSchema,
  mapping: z
    .string()
    .optional()
    .transform((text, context) => {
      if (text === undefined || text === '') return null;
      try {
        return JSON.parse(text) as unknown;
      } catch {
        context.addIssue({ code: 'custom', message: 'mapping is not valid JSON' });
        return z.NEVER;
      }
    })
    .pipe(columnMappingSchema.nullable()),
  averageRepeats: z.enum(['true', 'false']).default('false').transform((value) => value === 'true'),
  rememberMapping: z.enum(['true', 'false']).default('true').transform((value) => value === 'true'),
});

export interface SweepPoint {
  sequence: number;
  frequencyHz: number;
  vinV: number;
  voutV: number;
  phaseDeg: number | null;
  floorV: number | null;
  gain: number;
  gainDb: number;
  /** Common-mode points only: output below twice the floor. */
  atFloor: boolean;
}

export interface SweepSummary {
  id: string;
  sessionId: string;
  mode: SweepMode;
  source: 'upload' | 'captures' | 'stream' | 'demo';
  sourceName: string;
  state: 'streaming' | 'complete';
  pointCount: number;
  frequencyRangeHz: [number, number] | null;
  createdBy: { id: string; name: string };
  createdAt: string;
  deletedAt: string | null;
  deletedBy: { id: string; name: string } | null;
  deleteReason: string | null;
}

export const sweepPointsQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(1000).default(100),
  sort: z.enum(['sequence', 'frequencyHz', 'vinV', 'voutV', 'gain']).default('frequencyHz'),
  direction: z.enum(['asc', 'desc']).default('asc'),
});

export const deleteSweepSchema = z.object({
  reason: z.string({ error: 'Say why the sweep is deleted' }).trim().min(3, 'Say why the sweep is deleted').max(500),
});

/** One capture file's tag in a multi-file capture upload. */
export const captureTagSchema = z.object({
  file: z.string(),
  mode: sweepModeSchema,
  frequencyHz: z.number().positive('Frequency must be above zero').finite().nullable().default(null),
});
export const captureTagsSchema = z.array(captureTagSchema).min(1, 'Tag at least one capture');
