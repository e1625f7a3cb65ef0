// Every unit measured against one design revision, each with the engine's analysis.
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { Circuit, LimitMaskData } from '../../shared/schemas/designs';
import type { Database } from '../db';
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
  database: Database,
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
      analysis: await analyses.analyse(database, { id: session.id, designRevisionId: revision.id, circuit: revision.circuit, limitMask: revision.limitMask }, now),
    });
  }
  return units;
}

/** Distinct measured frequencies up to which the lot's predicted band is computed at each of them. */
export const lotBandExactFrequencies = 500;
/** Points per decade of the band's grid beyond that (the band is smooth; bandAt interpolates in log f). */
export const lotBandPointsPerDecade = 24;

/**
 * Where to compute the lot's predicted Monte Carlo band: at every measured frequency while there
 * are at most {@link lotBandExactFrequencies} of them; beyond (a unit measured at 100,000
 * frequencies would take 10,000 trials × 100,000 frequencies) a log grid of
 * {@link lotBandPointsPerDecade} per decade over the measured range with the mask's corners in
 * it. The trials are the same at every frequency (seeded), so the band at a mask frequency is the
 * same either way. Sorted, distinct, O(n log n) for n measured frequencies.
 *
 * @example lotBandFrequencies([10, 100, 1000], [10, 1000]) // → [10, 100, 1000]
 */
export function lotBandFrequencies(measuredHz: readonly number[], maskHz: readonly number[]): number[] {
  const distinct = [...new Set(measuredHz.filter((frequencyHz) => frequencyHz > 0))].sort((a, b) => a - b);
  if (distinct.length <= lotBandExactFrequencies) return distinct;
  const lowest = distinct[0];
  const highest = distinct[distinct.length - 1];
  const steps = Math.max(1, Math.ceil(Math.log10(highest / lowest) * lotBandPointsPerDecade));
  const grid = new Set<number>();
  for (let step = 0; step <= steps; step++) grid.add(step === steps ? highest : Number((lowest * (highest / lowest) ** (step / steps)).toPrecision(12)));
  for (const frequencyHz of maskHz) if (frequencyHz >= lowest && frequencyHz <= highest) grid.add(frequencyHz);
  return [...grid].sort((a, b) => a - b);
}
