import { z } from 'zod';
import { finiteNumber, nonNegativeNumber, optionalText, shortText } from './common';

/**
 * A drive signal: an ac amplitude (RMS or peak) with an optional dc part. The common-mode drive of
 * a current-sense stage, for instance, is the supply rail (dc) plus the test tone.
 */
export const driveSchema = z.object({
  acVolts: nonNegativeNumber('Drive amplitude'),
  acConvention: z.enum(['rms', 'peak'], { error: 'Convention must be rms or peak' }),
  dcVolts: finiteNumber('Drive dc level').default(0),
});
export type Drive = z.infer<typeof driveSchema>;

/**
 * Hazardous-live thresholds (DOMAIN.md, "Safety": roughly 30 V rms or 60 V dc; IEC 61010-1 sets
 * about 33 V rms / 70 V dc, from memory). A combined peak above 60 V counts too.
 */
export const hazardThresholds = { acRmsVolts: 30, dcVolts: 60, peakVolts: 60 } as const;

export function driveRmsVolts(drive: Drive): number {
  return drive.acConvention === 'rms' ? drive.acVolts : drive.acVolts / Math.SQRT2;
}

/** True when the drive is above the usual hazardous-live thresholds. */
export function driveIsHazardous(drive: Drive): boolean {
  const acRms = driveRmsVolts(drive);
  const peak = Math.abs(drive.dcVolts) + acRms * Math.SQRT2;
  return acRms > hazardThresholds.acRmsVolts || Math.abs(drive.dcVolts) > hazardThresholds.dcVolts || peak > hazardThresholds.peakVolts;
}

export const createBenchSessionSchema = z
  .object({
    designRevisionId: z.string({ error: 'Choose the design revision this unit is built to' }).min(1, 'Choose the design revision this unit is built to'),
    unitSerial: shortText('Unit serial number', 80),
    fixture: shortText('Fixture', 200),
    ambientTemperatureC: finiteNumber('Ambient temperature')
      .refine((value) => value > -60 && value < 150, 'Ambient temperature must be between −60 and 150 °C')
      .nullable()
      .default(null),
    instrumentIds: z.array(z.string()).max(20, 'At most 20 instruments').default([]),
    differentialDrive: driveSchema,
    commonModeDrive: driveSchema,
    /** Must be true when the common-mode drive is hazardous: the person has read the caution. */
    hazardAcknowledged: z.boolean().default(false),
    notes: optionalText('Notes', 4000),
    measuredAt: z.iso.datetime({ error: 'Use an ISO date and time' }).optional(),
  })
  .refine((value) => !driveIsHazardous(value.commonModeDrive) || value.hazardAcknowledged, {
    message: 'This common-mode drive is hazardous live: confirm the safety caution before going on',
    path: ['hazardAcknowledged'],
  });
export type CreateBenchSessionInput = z.input<typeof createBenchSessionSchema>;

export const benchSessionListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(['measuredAt', 'unitSerial', 'design', 'status', 'operator']).default('measuredAt'),
  direction: z.enum(['asc', 'desc']).default('desc'),
  designId: z.string().optional(),
  designRevisionId: z.string().optional(),
  status: z.enum(['open', 'archived']).optional(),
  search: z.string().trim().max(80).optional(),
});
export type BenchSessionListQuery = z.input<typeof benchSessionListQuerySchema>;

export interface BenchSessionSummary {
  id: string;
  unitSerial: string;
  design: { id: string; name: string };
  designRevision: { id: string; revision: number; label: string };
  operator: { id: string; name: string };
  fixture: string;
  status: 'open' | 'archived';
  measuredAt: string;
  hazardousDrive: boolean;
  sweepCounts: { differential: number; commonMode: number };
}

export interface BenchSessionDetail extends BenchSessionSummary {
  ambientTemperatureC: number | null;
  differentialDrive: Drive;
  commonModeDrive: Drive;
  notes: string;
  instruments: { id: string; name: string; model: string; serialNumber: string; calibratedOn: string | null; calibrationDueOn: string | null; calibrationState: string }[];
  archivedAt: string | null;
  archivedBy: { id: string; name: string } | null;
  createdAt: string;
}
