import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { AppContext } from '../app-context';
import { BenchSession, DesignRevision } from '../models';
import { analyzeSession } from './session-analysis';

/** The analysis of a session by id, or null when there is no such session. */
export async function loadSessionAnalysis(context: Pick<AppContext, 'database' | 'now'>, sessionId: string): Promise<SessionAnalysis | null> {
  const session = await BenchSession.findByPk(sessionId, { include: [{ model: DesignRevision, as: 'designRevision' }] });
  if (!session || !session.designRevision) return null;
  return analyzeSession(
    context.database.sequelize,
    { id: session.id, circuit: session.designRevision.circuit, limitMask: session.designRevision.limitMask },
    context.now(),
  );
}
