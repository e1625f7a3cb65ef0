import type { BenchSessionDetail, BenchSessionSummary } from '../../shared/schemas/bench-sessions';
import type { SweepSummary } from '../../shared/schemas/sweeps';
import type { BenchSession, Design, DesignRevision, Sweep, User } from '../models';
import { calibrationState } from './instrument';

const person = (user: User | null | undefined) => (user ? { id: user.id, name: user.name } : { id: '', name: '(unknown)' });

export type LoadedSession = BenchSession & { designRevision: DesignRevision & { design: Design }; operator: User };

export function presentBenchSessionSummary(session: LoadedSession, sweepCounts: { differential: number; commonMode: number }): BenchSessionSummary {
  return {
    id: session.id,
    unitSerial: session.unitSerial,
    design: { id: session.designRevision.design.id, name: session.designRevision.design.name },
    designRevision: { id: session.designRevision.id, revision: session.designRevision.revision, label: session.designRevision.label },
    operator: person(session.operator),
    fixture: session.fixture,
    status: session.status,
    measuredAt: session.measuredAt.toISOString(),
    hazardousDrive: session.hazardousDrive,
    sweepCounts,
  };
}

export function presentBenchSessionDetail(session: LoadedSession, sweepCounts: { differential: number; commonMode: number }, today: Date): BenchSessionDetail {
  return {
    ...presentBenchSessionSummary(session, sweepCounts),
    ambientTemperatureC: session.ambientTemperatureC,
    differentialDrive: session.differentialDrive,
    commonModeDrive: session.commonModeDrive,
    notes: session.notes,
    instruments: (session.instruments ?? []).map((instrument) => ({
      id: instrument.id,
      name: instrument.name,
      model: `${instrument.manufacturer} ${instrument.model}`,
      serialNumber: instrument.serialNumber,
      calibratedOn: instrument.calibratedOn,
      calibrationDueOn: instrument.calibrationDueOn,
      calibrationState: calibrationState(instrument.calibrationDueOn, today),
    })),
    archivedAt: session.archivedAt ? session.archivedAt.toISOString() : null,
    archivedBy: session.archivedBy ? person(session.archivedBy) : null,
    createdAt: session.createdAt.toISOString(),
  };
}

export function presentSweep(sweep: Sweep, stats: { count: number; minimumHz: number | null; maximumHz: number | null } | undefined): SweepSummary {
  return {
    id: sweep.id,
    sessionId: sweep.benchSessionId,
    mode: sweep.mode,
    source: sweep.source,
    sourceName: sweep.sourceName,
    state: sweep.state,
    pointCount: stats?.count ?? 0,
    frequencyRangeHz: stats && stats.minimumHz !== null && stats.maximumHz !== null ? [stats.minimumHz, stats.maximumHz] : null,
    createdBy: person(sweep.createdBy),
    createdAt: sweep.createdAt.toISOString(),
    deletedAt: sweep.deletedAt ? sweep.deletedAt.toISOString() : null,
    deletedBy: sweep.deletedBy ? person(sweep.deletedBy) : null,
    deleteReason: sweep.deleteReason,
  };
}
