// Bench sessions and their sweeps: each write in one transaction, with the audit trail.
import { randomUUID } from 'node:crypto';
import type { Sequelize, Transaction } from 'sequelize';
import { driveIsHazardous } from '../../shared/schemas/bench-sessions';
import type { z } from 'zod';
import type { createBenchSessionSchema } from '../../shared/schemas/bench-sessions';
import type { Sweep as EngineSweep } from '../../shared/engine';
import type { SweepMode } from '../../shared/schemas/sweeps';
import type { SessionUser } from '../auth/session-store';
import { badRequest, conflict, forbidden, notFound } from '../http/errors';
import { AuditEvent, BenchSession, BenchSessionInstrument, DesignRevision, Instrument, Sweep } from '../models';
import { insertPoints, type PointRow } from './sweep-points';

type CreateBenchSession = z.output<typeof createBenchSessionSchema>;

export async function createBenchSession(sequelize: Sequelize, input: CreateBenchSession, operator: SessionUser, now: Date): Promise<BenchSession> {
  return sequelize.transaction(async (transaction) => {
    const revision = await DesignRevision.findByPk(input.designRevisionId, { transaction });
    if (!revision) throw badRequest('No such design revision', { designRevisionId: 'No such design revision' });
    const instrumentIds = [...new Set(input.instrumentIds)];
    if (instrumentIds.length > 0) {
      const found = await Instrument.findAll({ where: { id: instrumentIds }, transaction });
      const missing = instrumentIds.filter((id) => !found.some((instrument) => instrument.id === id));
      if (missing.length > 0) throw badRequest(`Unknown instrument(s): ${missing.join(', ')}`, { instrumentIds: 'unknown instrument' });
      const retired = found.filter((instrument) => instrument.retired);
      if (retired.length > 0) throw badRequest(`Retired instrument(s) cannot be used: ${retired.map((instrument) => instrument.name).join(', ')}`, { instrumentIds: 'retired' });
    }
    const session = await BenchSession.create(
      {
        id: randomUUID(),
        designRevisionId: revision.id,
        unitSerial: input.unitSerial,
        fixture: input.fixture,
        ambientTemperatureC: input.ambientTemperatureC,
        differentialDrive: input.differentialDrive,
        commonModeDrive: input.commonModeDrive,
        hazardousDrive: driveIsHazardous(input.commonModeDrive) || driveIsHazardous(input.differentialDrive),
        notes: input.notes,
        status: 'open',
        archivedAt: null,
        archivedById: null,
        operatorId: operator.id,
        measuredAt: input.measuredAt ? new Date(input.measuredAt) : now,
      },
      { transaction },
    );
    if (instrumentIds.length > 0) {
      await BenchSessionInstrument.bulkCreate(
        instrumentIds.map((instrumentId) => ({ benchSessionId: session.id, instrumentId, role: '' })),
        { transaction },
      );
    }
    if (session.hazardousDrive) {
      await AuditEvent.create(
        { actorId: operator.id, action: 'hazard-acknowledged', subjectType: 'bench-session', subjectId: session.id, details: { commonModeDrive: input.commonModeDrive } },
        { transaction },
      );
    }
    return session;
  });
}

/** Locks the session for a write and checks that it is open. */
export async function openSessionForWrite(sessionId: string, transaction: Transaction): Promise<BenchSession> {
  const session = await BenchSession.findByPk(sessionId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!session) throw notFound('No such bench session');
  if (session.status === 'archived') throw conflict('This bench session is archived; its record cannot change');
  return session;
}

/** Rows for `sweep_points` from an engine sweep (amplitudes already in volts of one convention). */
export function pointRowsFromSweep(sweep: EngineSweep): PointRow[] {
  return Array.from(sweep.frequencyHz, (frequencyHz, index) => ({
    sequence: index + 1,
    frequencyHz,
    vinV: sweep.vinVolts[index],
    voutV: sweep.voutVolts[index],
    phaseDeg: sweep.phaseDeg ? sweep.phaseDeg[index] : null,
    floorV: sweep.floorVolts ? sweep.floorVolts[index] : null,
    sourceLine: sweep.lineNumber[index],
  }));
}

export interface CompleteSweepInput {
  mode: SweepMode;
  source: 'upload' | 'captures' | 'demo';
  sourceName: string;
  points: PointRow[];
}

/**
 * Complete sweeps (an upload, a batch of captures, the demo) with all their points, in one
 * transaction: either every sweep is stored or none is.
 */
export async function addCompleteSweeps(
  sequelize: Sequelize,
  options: { sessionId: string; sweeps: CompleteSweepInput[]; createdBy: { id: string } },
): Promise<Sweep[]> {
  return sequelize.transaction(async (transaction) => {
    await openSessionForWrite(options.sessionId, transaction);
    const written: Sweep[] = [];
    for (const input of options.sweeps) {
      const sweep = await Sweep.create(
        {
          id: randomUUID(),
          benchSessionId: options.sessionId,
          mode: input.mode,
          source: input.source,
          sourceName: input.sourceName,
          clientKey: null,
          amplitudeConvention: 'rms',
          state: 'complete',
          createdById: options.createdBy.id,
          deletedAt: null,
          deletedById: null,
          deleteReason: null,
        },
        { transaction },
      );
      await insertPoints(sequelize, sweep.id, input.points, transaction);
      await AuditEvent.create(
        {
          actorId: options.createdBy.id,
          action: 'sweep-added',
          subjectType: 'sweep',
          subjectId: sweep.id,
          details: { sessionId: options.sessionId, mode: input.mode, source: input.source, sourceName: input.sourceName, points: input.points.length },
        },
        { transaction },
      );
      written.push(sweep);
    }
    return written;
  });
}

/** Marks a sweep deleted (the points stay, for the record) and says who and why. */
export async function deleteSweep(sequelize: Sequelize, options: { sessionId: string; sweepId: string; reason: string; actor: SessionUser; now: Date }): Promise<Sweep> {
  return sequelize.transaction(async (transaction) => {
    await openSessionForWrite(options.sessionId, transaction);
    const sweep = await Sweep.findOne({ where: { id: options.sweepId, benchSessionId: options.sessionId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!sweep) throw notFound('No such sweep in this bench session');
    if (sweep.deletedAt) throw conflict('This sweep is already deleted');
    if (options.actor.role !== 'lead' && sweep.createdById !== options.actor.id) {
      throw forbidden('Only the person who recorded a sweep, or a lead, can delete it');
    }
    sweep.deletedAt = options.now;
    sweep.deletedById = options.actor.id;
    sweep.deleteReason = options.reason;
    await sweep.save({ transaction });
    await AuditEvent.create(
      { actorId: options.actor.id, action: 'sweep-deleted', subjectType: 'sweep', subjectId: sweep.id, details: { sessionId: options.sessionId, reason: options.reason } },
      { transaction },
    );
    return sweep;
  });
}

export async function archiveSession(sequelize: Sequelize, sessionId: string, actor: SessionUser, now: Date): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const session = await openSessionForWrite(sessionId, transaction);
    const streaming = await Sweep.count({ where: { benchSessionId: sessionId, state: 'streaming', deletedAt: null }, transaction });
    if (streaming > 0) throw conflict('A sweep of this session is still streaming; close it before archiving');
    session.status = 'archived';
    session.archivedAt = now;
    session.archivedById = actor.id;
    await session.save({ transaction });
    await AuditEvent.create({ actorId: actor.id, action: 'session-archived', subjectType: 'bench-session', subjectId: sessionId, details: {} }, { transaction });
  });
}
