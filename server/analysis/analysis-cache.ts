// Session analyses kept between requests. Fitting a 100,000-point session takes seconds (reading
// the points, pairing, fitting, predicting, checking the mask), yet its stored points only change
// when a sweep gains points or is deleted: points are only ever appended, each (sweep, sequence)
// once, and revisions never change. So an analysis is kept under its session's *data version*
// (each live sweep with its point count, and the design revision) and served again while that
// version holds. Reading the version is one grouped count on the points' primary key.
import { QueryTypes, type Sequelize } from 'sequelize';
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { Circuit, LimitMaskData } from '../../shared/schemas/designs';
import type { Database } from '../db';
import { analyzeSession } from './session-analysis';

export interface AnalysedSession {
  id: string;
  designRevisionId: string;
  circuit: Circuit;
  limitMask: LimitMaskData;
}

export interface AnalysisCache {
  /** The session's analysis: the kept one while its data version holds, else a fresh one (kept). */
  analyse(database: Database, session: AnalysedSession, now: Date): Promise<SessionAnalysis>;
  /** How many analyses are kept and their CMRR points in all (for tests and logs). */
  size(): { analyses: number; points: number };
}

export interface AnalysisCacheOptions {
  /** CMRR points kept in all before the least recently used analyses are dropped (about 0.4 kB each). */
  maximumPoints?: number;
}

interface Kept {
  version: string;
  analysis: Promise<SessionAnalysis>;
  points: number;
}

/** The data version of a session: each live sweep with its point count, in a fixed order, and the revision. */
export async function sessionDataVersion(sequelize: Sequelize, session: Pick<AnalysedSession, 'id' | 'designRevisionId'>): Promise<string> {
  const rows = (await sequelize.query(
    `SELECT s.id, count(p.sequence)::int AS points
       FROM sweeps s LEFT JOIN sweep_points p ON p.sweep_id = s.id
      WHERE s.bench_session_id = $1 AND s.deleted_at IS NULL
      GROUP BY s.id ORDER BY s.id`,
    { bind: [session.id], type: QueryTypes.SELECT },
  )) as { id: string; points: number }[];
  return `${session.designRevisionId}|${rows.map((row) => `${row.id}:${row.points}`).join(',')}`;
}

/**
 * A least-recently-used store of session analyses, bounded by their CMRR points in all. Requests
 * that arrive while the same version is being computed share that computation; a computation
 * that fails is not kept.
 */
export function createAnalysisCache(options: AnalysisCacheOptions = {}): AnalysisCache {
  const maximumPoints = options.maximumPoints ?? 400_000;
  // A Map iterates in insertion order: re-inserting on use keeps the least recently used first.
  const kept = new Map<string, Kept>();
  let keptPoints = 0;

  const drop = (sessionId: string) => {
    const entry = kept.get(sessionId);
    if (!entry) return;
    kept.delete(sessionId);
    keptPoints -= entry.points;
  };
  const makeRoom = () => {
    for (const [sessionId] of kept) {
      if (keptPoints <= maximumPoints) return;
      drop(sessionId);
    }
  };

  return {
    async analyse(database, session, now) {
      const version = await sessionDataVersion(database.sequelize, session);
      const entry = kept.get(session.id);
      if (entry && entry.version === version) {
        kept.delete(session.id);
        kept.set(session.id, entry);
        return entry.analysis;
      }
      drop(session.id);
      const computing = analyzeSession(database, { id: session.id, circuit: session.circuit, limitMask: session.limitMask }, now);
      const fresh: Kept = { version, analysis: computing, points: 0 };
      kept.set(session.id, fresh);
      try {
        const analysis = await computing;
        if (kept.get(session.id) === fresh) {
          fresh.points = analysis.points.length;
          keptPoints += fresh.points;
          // One analysis larger than the whole budget is served but not kept.
          if (fresh.points > maximumPoints) drop(session.id);
          else makeRoom();
        }
        return analysis;
      } catch (error) {
        if (kept.get(session.id) === fresh) drop(session.id);
        throw error;
      }
    },
    size() {
      return { analyses: kept.size, points: keptPoints };
    },
  };
}
