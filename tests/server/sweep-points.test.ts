import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BenchSession, DesignRevision, Sweep, User } from '../../server/models';
import { insertPoints, sessionReadings, type PointRow } from '../../server/operations/sweep-points';
import { startTestApp, type TestApp } from '../helpers/test-app';

// The analysis reads a session's points back through sessionReadings; what it gets (which
// points, in which order, with which values) decides the analysis, so it is pinned here.
let app: TestApp;

beforeAll(async () => {
  app = await startTestApp({ seed: 'demo' });
});
afterAll(async () => {
  await app?.close();
});

const row = (sequence: number, frequencyHz: number, voutV: number, phaseDeg: number | null = null, floorV: number | null = null): PointRow => ({
  sequence,
  frequencyHz,
  vinV: 0.5,
  voutV,
  phaseDeg,
  floorV,
  sourceLine: null,
});

/** A session with the given sweeps, each created a second after the one before. */
async function sessionWith(sweeps: { mode: 'differential' | 'common-mode'; points: PointRow[]; deleted?: boolean }[]): Promise<string> {
  const revision = (await DesignRevision.findOne({ where: { label: 'rev D' } }))!;
  const technician = (await User.findOne({ where: { email: 'tech@rejectra.test' } }))!;
  const session = await BenchSession.create({
    id: randomUUID(),
    designRevisionId: revision.id,
    unitSerial: `HRB204-${randomUUID().slice(0, 8)}`,
    fixture: 'Bridge fixture BF-2',
    ambientTemperatureC: 23,
    differentialDrive: { acVolts: 0.1, acConvention: 'rms', dcVolts: 0 },
    commonModeDrive: { acVolts: 1, acConvention: 'rms', dcVolts: 0 },
    hazardousDrive: false,
    notes: '',
    status: 'open',
    archivedAt: null,
    archivedById: null,
    operatorId: technician.id,
    measuredAt: new Date('2026-11-01T10:00:00Z'),
  });
  let createdAt = Date.parse('2026-11-01T10:00:00Z');
  for (const input of sweeps) {
    createdAt += 1000;
    const sweep = await Sweep.create({
      id: randomUUID(),
      benchSessionId: session.id,
      mode: input.mode,
      source: 'upload',
      sourceName: `${input.mode}.csv`,
      clientKey: null,
      amplitudeConvention: 'rms',
      state: 'complete',
      createdById: technician.id,
      deletedAt: input.deleted ? new Date(createdAt) : null,
      deletedById: input.deleted ? technician.id : null,
      deleteReason: input.deleted ? 'wrong fixture' : null,
      createdAt: new Date(createdAt),
    } as never);
    await insertPoints(app.server.context.database.sequelize, sweep.id, input.points);
  }
  return session.id;
}

describe('sessionReadings', () => {
  it('gives the live sweeps’ points by mode, by frequency, then sweep creation, then sequence', async () => {
    const sessionId = await sessionWith([
      { mode: 'differential', points: [row(2, 1000, 5), row(1, 100, 5.1, 12.5, 1e-6), row(3, 10_000, 4.9)] },
      { mode: 'common-mode', points: [row(1, 100, 2e-4, null, 3e-5), row(2, 1000, 0, -170, 3e-5)] },
      // A later differential sweep repeating 1 kHz with a lower sequence: after the first sweep's 1 kHz.
      { mode: 'differential', points: [row(1, 1000, 5.2), row(2, 20_000, 4.5)] },
      { mode: 'common-mode', points: [row(1, 500, 1)], deleted: true },
    ]);
    const readings = await sessionReadings(app.server.context.database.pool, sessionId);
    expect(readings.differential).toEqual([
      { line: 1, frequencyHz: 100, vinVolts: 0.5, voutVolts: 5.1, phaseDeg: 12.5, floorVolts: 1e-6 },
      { line: 2, frequencyHz: 1000, vinVolts: 0.5, voutVolts: 5, phaseDeg: null, floorVolts: null },
      { line: 1, frequencyHz: 1000, vinVolts: 0.5, voutVolts: 5.2, phaseDeg: null, floorVolts: null },
      { line: 3, frequencyHz: 10_000, vinVolts: 0.5, voutVolts: 4.9, phaseDeg: null, floorVolts: null },
      { line: 2, frequencyHz: 20_000, vinVolts: 0.5, voutVolts: 4.5, phaseDeg: null, floorVolts: null },
    ]);
    expect(readings['common-mode']).toEqual([
      { line: 1, frequencyHz: 100, vinVolts: 0.5, voutVolts: 2e-4, phaseDeg: null, floorVolts: 3e-5 },
      { line: 2, frequencyHz: 1000, vinVolts: 0.5, voutVolts: 0, phaseDeg: -170, floorVolts: 3e-5 },
    ]);
  });

  it('reads back the stored doubles exactly', async () => {
    // Doubles that need all 17 significant digits to be written exactly (0.1 + 0.2 is 0.30000000000000004).
    const awkward = [1 / 3, 2 / 7, 0.1 + 0.2, Math.PI * 1e5, 1e-7 / 3];
    const sessionId = await sessionWith([{ mode: 'common-mode', points: awkward.map((value, index) => row(index + 1, 10 * (index + 1), value, value * 100, value / 10)) }]);
    const readings = await sessionReadings(app.server.context.database.pool, sessionId);
    expect(readings.differential).toEqual([]);
    expect(readings['common-mode'].map((reading) => [reading.voutVolts, reading.phaseDeg, reading.floorVolts])).toEqual(awkward.map((value) => [value, value * 100, value / 10]));
  });

  it('gives empty lists for a session without sweeps', async () => {
    const sessionId = await sessionWith([]);
    expect(await sessionReadings(app.server.context.database.pool, sessionId)).toEqual({ differential: [], 'common-mode': [] });
  });
});
