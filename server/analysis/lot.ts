// Every unit measured against one design revision, each with the engine's analysis.
import type { Sequelize } from 'sequelize';
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { Circuit, LimitMaskData } from '../../shared/schemas/designs';
import { BenchSession, User } from '../models';
import type { AnalysisCache } from './analysis-cache';

export interface LotUnit {
  sessionId: string;
  unitSerial: string;
  measuredAt: string;
  status: 'open' | 'archived';
  operator: string;
  analysis: SessionAnalysis;
}

/** The latest session of each unit serial against the revision (a unit measured twice counts once). */
export async function loadLot(
  sequelize: Sequelize,
  analyses: AnalysisCache,
  revision: { id: string; circuit: Circuit; limitMask: LimitMaskData },
  now: Date,
): Promise<LotUnit[]> {
  const sessions = await BenchSession.findAll({
    where: { designRevisionId: revision.id },
    include: [{ model: User, as: 'operator' }],
    order: [['unitSerial', 'ASC'], ['measuredAt', 'DESC']],
  });
  const latest = new Map<string, BenchSession>();
  for (const session of sessions) if (!latest.has(session.unitSerial)) latest.set(session.unitSerial, session);
  const units: LotUnit[] = [];
  for (const session of latest.values()) {
    units.push({
      sessionId: session.id,
      unitSerial: session.unitSerial,
      measuredAt: session.measuredAt.toISOString(),
      status: session.status,
      operator: session.operator?.name ?? '',
      analysis: await analyses.analyse(sequelize, { id: session.id, designRevisionId: revision.id, circuit: revision.circuit, limitMask: revision.limitMask }, now),
    });
  }
  return units;
}
