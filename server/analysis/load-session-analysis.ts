import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { AppContext } from '../app-context';
import { BenchSession, DesignRevision } from '../models';

/** The analysis of a session by id (kept while its points are unchanged), or null when there is no such session. */
export async function loadSessionAnalysis(context: Pick<AppContext, 'database' | 'now' | 'analyses'>, sessionId: string): Promise<SessionAnalysis | null> {
  const session = await BenchSession.findByPk(sessionId, { include: [{ model: DesignRevision, as: 'designRevision' }] });
  if (!session || !session.designRevision) return null;
  const revision = session.designRevision;
  return context.analyses.analyse(
    context.database,
    { id: session.id, designRevisionId: revision.id, circuit: revision.circuit, limitMask: revision.limitMask },
    context.now(),
  );
}
