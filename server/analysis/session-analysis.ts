// The engine's analysis of one bench session: measured points paired and fitted, the design
// revision's prediction at the same frequencies, and the limit-mask verdicts.
import { predictDesign } from '../../shared/design-prediction';
import {
  EngineInputError,
  fitCmrrFrequencyResponse,
  limitMaskVerdicts,
  pairCmrrPoints,
  sweepFromReadings,
  type Sweep,
  type SweepReading,
} from '../../shared/engine';
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { Circuit, LimitMaskData } from '../../shared/schemas/designs';
import type { Database } from '../db';
import { sessionReadings } from '../operations/sweep-points';

function toSweep(readings: SweepReading[], label: string): Sweep {
  // Several sweeps of one mode (a band measured in two parts, a repeat) are merged; a frequency
  // measured more than once is averaged.
  return sweepFromReadings(readings, { file: `${label} sweep`, averageRepeats: true, functionName: 'analysis' });
}

export async function analyzeSession(
  database: Pick<Database, 'pool'>,
  session: { id: string; circuit: Circuit; limitMask: LimitMaskData },
  now: Date,
): Promise<SessionAnalysis> {
  const readings = await sessionReadings(database.pool, session.id);
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
    // Its messages name checkAgainstLimitMask, as the analysis's always have.
    const check = limitMaskVerdicts(points, { points: session.limitMask.points }, session.limitMask.guardBandDb, 'checkAgainstLimitMask');
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
        verdicts: check.verdicts,
      },
    };
  } catch (error) {
    if (error instanceof EngineInputError) return { ...base, status: 'error', message: error.message };
    throw error;
  }
}
