import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createAnalysisCache, sessionDataVersion, type AnalysedSession } from '../../server/analysis/analysis-cache';
import { analyzeSession } from '../../server/analysis/session-analysis';
import { BenchSession, DesignRevision, User } from '../../server/models';
import type { SessionUser } from '../../server/auth/session-store';
import { addCompleteSweeps, createBenchSession, deleteSweep } from '../../server/operations/bench-sessions';
import { createBenchSessionSchema } from '../../shared/schemas/bench-sessions';
import { insertPoints } from '../../server/operations/sweep-points';
import { startTestApp, type TestApp } from '../helpers/test-app';

// Kept analyses must never be stale: every way the stored data of a session can change (a new
// sweep, points appended to a streaming sweep, a deleted sweep) gives a fresh analysis, and
// unchanged data gives the kept one. The demo lab's sessions are the subject.
let app: TestApp;
let lead: Awaited<ReturnType<TestApp['signedIn']>>;

beforeAll(async () => {
  app = await startTestApp({ seed: 'demo' });
  lead = await app.signedIn('lead@rejectra.test');
});
afterAll(async () => {
  await app?.close();
});

const database = () => app.server.context.database;
const sequelize = () => database().sequelize;

async function analysedSession(unitSerial: string): Promise<AnalysedSession> {
  const session = await BenchSession.findOne({ where: { unitSerial }, include: [{ model: DesignRevision, as: 'designRevision' }] });
  const revision = session!.designRevision!;
  return { id: session!.id, designRevisionId: revision.id, circuit: revision.circuit, limitMask: revision.limitMask };
}

/** A new open session on HRB-204 rev D with a 12-point differential and common-mode sweep. */
async function newSession(unitSerial: string): Promise<{ session: AnalysedSession; sweepIds: string[]; technicianId: string; operator: SessionUser }> {
  const revision = (await DesignRevision.findOne({ where: { label: 'rev D' } }))!;
  const technician = (await User.findOne({ where: { email: 'tech@rejectra.test' } }))!;
  const operator: SessionUser = { id: technician.id, email: technician.email, name: technician.name, role: technician.role, status: technician.status };
  const created = await createBenchSession(
    sequelize(),
    createBenchSessionSchema.parse({
      designRevisionId: revision.id,
      unitSerial,
      fixture: 'Bridge fixture BF-2',
      ambientTemperatureC: 23,
      differentialDrive: { acVolts: 0.1, acConvention: 'rms', dcVolts: 0 },
      commonModeDrive: { acVolts: 1, acConvention: 'rms', dcVolts: 0 },
    }),
    operator,
    new Date(),
  );
  const points = (gain: number) =>
    Array.from({ length: 12 }, (_, index) => ({ sequence: index + 1, frequencyHz: 10 * 2 ** index, vinV: 1, voutV: gain, phaseDeg: null, floorV: null, sourceLine: null }));
  const sweeps = await addCompleteSweeps(sequelize(), {
    sessionId: created.id,
    sweeps: [
      { mode: 'differential', source: 'upload', sourceName: 'd.csv', points: points(10) },
      { mode: 'common-mode', source: 'upload', sourceName: 'c.csv', points: points(0.001) },
    ],
    createdBy: { id: technician.id },
  });
  return {
    session: { id: created.id, designRevisionId: revision.id, circuit: revision.circuit, limitMask: revision.limitMask },
    sweepIds: sweeps.map((sweep) => sweep.id),
    technicianId: technician.id,
    operator,
  };
}

describe('createAnalysisCache', () => {
  it('serves the kept analysis while the data are unchanged, equal to a fresh one', async () => {
    const cache = createAnalysisCache();
    const session = await analysedSession('HRB204-0007');
    const first = await cache.analyse(database(), session, new Date('2026-11-01T10:00:00Z'));
    const second = await cache.analyse(database(), session, new Date('2026-11-01T11:00:00Z'));
    expect(second).toBe(first);
    expect(second.computedAt).toBe('2026-11-01T10:00:00.000Z');
    const fresh = await analyzeSession(database(), session, new Date('2026-11-01T10:00:00Z'));
    expect(second).toEqual(fresh);
    expect(cache.size()).toEqual({ analyses: 1, points: first.points.length });
  });

  it('shares one computation between requests that arrive together', async () => {
    const cache = createAnalysisCache();
    const session = await analysedSession('HRB204-0003');
    const [a, b, c] = await Promise.all([0, 1, 2].map(() => cache.analyse(database(), session, new Date())));
    expect(b).toBe(a);
    expect(c).toBe(a);
  });

  it('computes afresh after a new sweep, after points appended to a sweep, and after a sweep is deleted', async () => {
    const cache = createAnalysisCache();
    const { session, sweepIds, technicianId, operator } = await newSession('HRB204-9301');
    const before = await cache.analyse(database(), session, new Date());
    expect(before.status).toBe('complete');
    expect(before.pointCounts).toEqual({ differential: 12, commonMode: 12 });

    // Points appended to the common-mode sweep, as a stream does.
    await insertPoints(sequelize(), sweepIds[1], [{ sequence: 13, frequencyHz: 50_000, vinV: 1, voutV: 0.002, phaseDeg: null, floorV: null, sourceLine: null }]);
    const appended = await cache.analyse(database(), session, new Date());
    expect(appended).not.toBe(before);
    expect(appended.pointCounts).toEqual({ differential: 12, commonMode: 13 });

    // A further differential sweep.
    await addCompleteSweeps(sequelize(), {
      sessionId: session.id,
      sweeps: [{ mode: 'differential', source: 'upload', sourceName: 'd2.csv', points: [{ sequence: 1, frequencyHz: 50_000, vinV: 1, voutV: 9.9, phaseDeg: null, floorV: null, sourceLine: null }] }],
      createdBy: { id: technicianId },
    });
    const added = await cache.analyse(database(), session, new Date());
    expect(added).not.toBe(appended);
    expect(added.pointCounts).toEqual({ differential: 13, commonMode: 13 });

    // The common-mode sweep deleted on record: no CMRR any more.
    await deleteSweep(sequelize(), { sessionId: session.id, sweepId: sweepIds[1], reason: 'wrong fixture', actor: operator, now: new Date() });
    const deleted = await cache.analyse(database(), session, new Date());
    expect(deleted.status).toBe('incomplete');
    expect(deleted.pointCounts).toEqual({ differential: 13, commonMode: 0 });
    expect(await cache.analyse(database(), session, new Date())).toBe(deleted);
  });

  it('drops the least recently used analyses beyond its point budget', async () => {
    const a = await analysedSession('HRB204-0003');
    const b = await analysedSession('HRB204-0005');
    const c = await analysedSession('HRB204-0006');
    const probe = await analyzeSession(database(), a, new Date());
    // Room for two demo sessions (each a whole number of points, the same count across the lot).
    const cache = createAnalysisCache({ maximumPoints: 2 * probe.points.length });
    const keptA = await cache.analyse(database(), a, new Date());
    const keptB = await cache.analyse(database(), b, new Date());
    expect(await cache.analyse(database(), a, new Date())).toBe(keptA); // a is now the most recently used
    await cache.analyse(database(), c, new Date()); // b goes
    expect(cache.size().analyses).toBe(2);
    expect(await cache.analyse(database(), a, new Date())).toBe(keptA);
    expect(await cache.analyse(database(), b, new Date())).not.toBe(keptB);
  });

  it('names each live sweep with its point count and the revision in the data version', async () => {
    const session = await analysedSession('HRB204-0007');
    const version = await sessionDataVersion(sequelize(), session);
    expect(version).toMatch(new RegExp(`^${session.designRevisionId}\\|[^:,]+:\\d+,[^:,]+:\\d+$`));
  });
});

describe('GET /api/sessions/:id/analysis with kept analyses', () => {
  it('answers from the kept analysis until the session gains a sweep', async () => {
    const { session, technicianId } = await newSession('HRB204-9302');
    const first = (await lead.get(`/api/sessions/${session.id}/analysis`).expect(200)).body.analysis;
    app.advanceClock(60_000);
    const again = (await lead.get(`/api/sessions/${session.id}/analysis`).expect(200)).body.analysis;
    expect(again.computedAt).toBe(first.computedAt);
    await addCompleteSweeps(sequelize(), {
      sessionId: session.id,
      sweeps: [{ mode: 'common-mode', source: 'upload', sourceName: 'c2.csv', points: [{ sequence: 1, frequencyHz: 40_000, vinV: 1, voutV: 0.003, phaseDeg: null, floorV: null, sourceLine: null }] }],
      createdBy: { id: technicianId },
    });
    const after = (await lead.get(`/api/sessions/${session.id}/analysis`).expect(200)).body.analysis;
    expect(after.computedAt).not.toBe(first.computedAt);
    expect(after.pointCounts.commonMode).toBe(13);
  });
});
