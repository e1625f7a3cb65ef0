// The engine's analysis of one bench session: measured points paired and fitted, the design
// revision's prediction at the same frequencies, and the limit-mask verdicts.
import type { Sequelize } from 'sequelize';
import { predictDesign } from '../../shared/design-prediction';
import {
  checkAgainstLimitMask,
  EngineInputError,
  fitCmrrFrequencyResponse,
  pairCmrrPoints,
  sweepFromReadings,
  type Sweep,
} from '../../shared/engine';
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { Circuit, LimitMaskData } from '../../shared/schemas/designs';
import { sessionReadings, type SessionReadings } from '../operations/sweep-points';

function toSweep(readings: SessionReadings[], label: string): Sweep {
  // Several sweeps of one mode (a band measured in two parts, a repeat) are merged; a frequency
  // measured more than once is averaged.
  return sweepFromReadings(
    readings.map((reading) => ({
      line: reading.sequence,
      frequencyHz: reading.frequencyHz,
      vinVolts: reading.vinV,
      voutVolts: reading.voutV,
      phaseDeg: reading.phaseDeg,
      floorVolts: reading.floorV,
    })),
    { file: `${label} sweep`, averageRepeats: true, functionName: 'analysis' },
  );
}

export async function analyzeSession(
  sequelize: Sequelize,
  session: { id: string; circuit: Circuit; limitMask: LimitMaskData },
  now: Date,
): Promise<SessionAnalysis> {
  const readings = await sessionReadings(sequelize, session.id);
  const base: SessionAnalysis = {
    sessionId: session.id,
    status: 'incomplete',
    message: null,
    pointCounts: { differential: readings.differential.length, commonMode: readings['common-mode'].length },
    points: [],
    fit: null,
    warnings: [],
    prediction: [],
    limits: null,
    computedAt: now.toISOString(),
  };
  const missing = [
    readings.differential.length < 2 ? 'a differential sweep' : null,
    readings['common-mode'].length < 2 ? 'a common-mode sweep' : null,
  ].filter(Boolean);
  if (missing.length > 0) {
    return { ...base, message: `Needs ${missing.join(' and ')} of at least 2 frequencies before CMRR can be computed` };
  }
  try {
    const { points, warnings } = pairCmrrPoints(toSweep(readings.differential, 'differential'), toSweep(readings['common-mode'], 'common-mode'));
    const fit = fitCmrrFrequencyResponse(points);
    const frequencies = points.map((point) => point.frequencyHz);
    const prediction = predictDesign(session.circuit, frequencies);
    const check = checkAgainstLimitMask(points, { points: session.limitMask.points }, session.limitMask.guardBandDb);
    return {
      ...base,
      status: 'complete',
      points,
      fit,
      warnings,
      prediction,
      limits: {
        guardBandDb: session.limitMask.guardBandDb,
        overall: check.overall,
        verdicts: check.decisions.map((decision) => ({
          frequencyHz: decision.frequencyHz,
          cmrrDb: decision.cmrrDb,
          lowerBound: decision.lowerBound ?? false,
          limitDb: decision.limitDb,
          marginDb: decision.marginDb,
          outcome: decision.outcome,
        })),
      },
    };
  } catch (error) {
    if (error instanceof EngineInputError) return { ...base, status: 'error', message: error.message };
    throw error;
  }
}
