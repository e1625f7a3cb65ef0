import { Router } from 'express';
import { Op, QueryTypes, type Order, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { analysisPointsQuerySchema } from '../../../shared/schemas/analysis';
import { benchSessionListQuerySchema, createBenchSessionSchema } from '../../../shared/schemas/bench-sessions';
import { deleteSweepSchema, sweepPointsQuerySchema } from '../../../shared/schemas/sweeps';
import type { AppContext } from '../../app-context';
import { loadSessionAnalysis } from '../../analysis/load-session-analysis';
import { pageAnalysisPoints } from '../../analysis/analysis-points';
import { thinAnalysis } from '../../analysis/thin-analysis';
import { authenticate, authorize } from '../../auth/middleware';
import { badRequest, notFound } from '../../http/errors';
import { validateBody } from '../../http/validate';
import { BenchSession, Design, DesignRevision, Instrument, Sweep, User } from '../../models';
import { archiveSession, createBenchSession, deleteSweep } from '../../operations/bench-sessions';
import { pagePoints, sweepPointStats } from '../../operations/sweep-points';
import { presentBenchSessionDetail, presentBenchSessionSummary, presentSweep, type LoadedSession } from '../../presenters/bench-session';
import { handleCaptureUpload, handleSweepUpload } from '../../uploads/sweep-uploads';
import { loadSessionRecord, sendSessionCsv, sendSessionPdf } from './exports';

const sessionIncludes = [
  { model: DesignRevision, as: 'designRevision', include: [{ model: Design, as: 'design' }] },
  { model: User, as: 'operator' },
];

async function sweepCounts(context: AppContext, sessionIds: string[]) {
  const counts = new Map<string, { differential: number; commonMode: number }>();
  for (const id of sessionIds) counts.set(id, { differential: 0, commonMode: 0 });
  if (sessionIds.length === 0) return counts;
  const rows = (await context.database.sequelize.query(
    `SELECT bench_session_id AS "sessionId", mode, count(*)::int AS count FROM sweeps
      WHERE bench_session_id = ANY($1::text[]) AND deleted_at IS NULL GROUP BY bench_session_id, mode`,
    { bind: [sessionIds], type: QueryTypes.SELECT },
  )) as { sessionId: string; mode: string; count: number }[];
  for (const row of rows) {
    const entry = counts.get(row.sessionId)!;
    if (row.mode === 'differential') entry.differential = row.count;
    else entry.commonMode = row.count;
  }
  return counts;
}

export function sessionsRouter(context: AppContext): Router {
  const router = Router();
  const sequelize = context.database.sequelize;
  router.use(authenticate(context.sessions));

  const loadSession = async (id: string) => {
    const session = (await BenchSession.findByPk(id, {
      include: [...sessionIncludes, { model: Instrument, as: 'instruments', through: { attributes: [] } }, { model: User, as: 'archivedBy' }],
    })) as LoadedSession | null;
    if (!session) throw notFound('No such bench session');
    return session;
  };

  router.get('/', async (request, response) => {
    const parsed = benchSessionListQuerySchema.safeParse(request.query);
    if (!parsed.success) throw badRequest('Invalid list query', Object.fromEntries(parsed.error.issues.map((issue) => [issue.path.join('.'), issue.message])));
    const query = parsed.data;
    const where: WhereOptions = {};
    if (query.status) Object.assign(where, { status: query.status });
    if (query.designRevisionId) Object.assign(where, { designRevisionId: query.designRevisionId });
    if (query.designId) Object.assign(where, { '$designRevision.design_id$': query.designId });
    if (query.search) {
      const pattern = `%${query.search.replace(/[\\%_]/g, (character) => `\\${character}`)}%`;
      Object.assign(where, {
        [Op.or]: [
          { unitSerial: { [Op.iLike]: pattern } },
          { fixture: { [Op.iLike]: pattern } },
          { '$designRevision.design.name$': { [Op.iLike]: pattern } },
          { '$operator.name$': { [Op.iLike]: pattern } },
        ],
      });
    }
    const direction = query.direction.toUpperCase() as 'ASC' | 'DESC';
    const orderBy: Record<typeof query.sort, Order> = {
      measuredAt: [['measuredAt', direction]],
      unitSerial: [['unitSerial', direction]],
      status: [['status', direction], ['measuredAt', 'DESC']],
      design: [[{ model: DesignRevision, as: 'designRevision' }, { model: Design, as: 'design' }, 'name', direction], [{ model: DesignRevision, as: 'designRevision' }, 'revision', direction]],
      operator: [[{ model: User, as: 'operator' }, 'name', direction]],
    };
    const { rows, count } = await BenchSession.findAndCountAll({
      where,
      include: sessionIncludes,
      order: [...(orderBy[query.sort] as unknown[]), ['id', 'ASC']] as Order,
      limit: query.pageSize,
      offset: (query.page - 1) * query.pageSize,
      distinct: true,
    });
    const counts = await sweepCounts(context, rows.map((row) => row.id));
    response.json({
      items: (rows as LoadedSession[]).map((session) => presentBenchSessionSummary(session, counts.get(session.id)!)),
      page: query.page,
      pageSize: query.pageSize,
      total: count,
    });
  });

  router.post('/', authorize('technician'), validateBody(createBenchSessionSchema), async (request, response) => {
    const created = await createBenchSession(sequelize, request.body as z.output<typeof createBenchSessionSchema>, response.locals.user, context.now());
    const session = await loadSession(created.id);
    response.status(201).json({ session: presentBenchSessionDetail(session, { differential: 0, commonMode: 0 }, context.now()) });
  });

  router.get('/:id', async (request, response) => {
    const session = await loadSession(String(request.params.id));
    const counts = await sweepCounts(context, [session.id]);
    response.json({ session: presentBenchSessionDetail(session, counts.get(session.id)!, context.now()) });
  });

  router.post('/:id/archive', authorize('lead'), async (request, response) => {
    const id = String(request.params.id);
    await loadSession(id);
    await archiveSession(sequelize, id, response.locals.user, context.now());
    const session = await loadSession(id);
    const counts = await sweepCounts(context, [id]);
    context.hub.publish(id, { type: 'session-changed', sessionId: id, reason: 'archived' });
    response.json({ session: presentBenchSessionDetail(session, counts.get(id)!, context.now()) });
  });

  router.get('/:id/sweeps', async (request, response) => {
    const session = await loadSession(String(request.params.id));
    const sweeps = await Sweep.findAll({
      where: { benchSessionId: session.id },
      include: [
        { model: User, as: 'createdBy' },
        { model: User, as: 'deletedBy' },
      ],
      order: [['createdAt', 'ASC']],
    });
    const stats = await sweepPointStats(sequelize, sweeps.map((sweep) => sweep.id));
    response.json({ sweeps: sweeps.map((sweep) => presentSweep(sweep, stats.get(sweep.id))) });
  });

  router.post('/:id/sweeps', authorize('technician'), (request, response, next) => {
    handleSweepUpload(context, String(request.params.id), request, response).catch(next);
  });

  router.post('/:id/captures', authorize('technician'), (request, response, next) => {
    handleCaptureUpload(context, String(request.params.id), request, response).catch(next);
  });

  router.get('/:id/sweeps/:sweepId/points', async (request, response) => {
    const sweep = await Sweep.findOne({ where: { id: String(request.params.sweepId), benchSessionId: String(request.params.id) } });
    if (!sweep) throw notFound('No such sweep in this bench session');
    const parsed = sweepPointsQuerySchema.safeParse(request.query);
    if (!parsed.success) throw badRequest('Invalid points query', Object.fromEntries(parsed.error.issues.map((issue) => [issue.path.join('.'), issue.message])));
    const { rows, total } = await pagePoints(sequelize, sweep.id, parsed.data);
    response.json({
      items: rows.map((row) => {
        const gain = row.voutV / row.vinV;
        return { ...row, gain, gainDb: 20 * Math.log10(gain), atFloor: sweep.mode === 'common-mode' && row.floorV !== null && row.voutV < 2 * row.floorV };
      }),
      page: parsed.data.page,
      pageSize: parsed.data.pageSize,
      total,
    });
  });

  router.delete('/:id/sweeps/:sweepId', authorize('technician'), validateBody(deleteSweepSchema), async (request, response) => {
    const sessionId = String(request.params.id);
    const sweep = await deleteSweep(sequelize, { sessionId, sweepId: String(request.params.sweepId), reason: (request.body as { reason: string }).reason, actor: response.locals.user, now: context.now() });
    const loaded = await Sweep.findByPk(sweep.id, { include: [{ model: User, as: 'createdBy' }, { model: User, as: 'deletedBy' }] });
    const stats = await sweepPointStats(sequelize, [sweep.id]);
    context.hub.publish(sessionId, { type: 'session-changed', sessionId, reason: 'sweep-deleted' });
    context.hub.requestRefit(sessionId);
    response.json({ sweep: presentSweep(loaded!, stats.get(sweep.id)) });
  });

  const sessionDetail = async (id: string) => {
    const session = await loadSession(id);
    const counts = await sweepCounts(context, [session.id]);
    return presentBenchSessionDetail(session, counts.get(session.id)!, context.now());
  };

  router.get('/:id/export.csv', async (request, response) => {
    const id = String(request.params.id);
    sendSessionCsv(await loadSessionRecord(context, id, await sessionDetail(id)), response);
  });

  router.get('/:id/export.json', async (request, response) => {
    const id = String(request.params.id);
    const record = await loadSessionRecord(context, id, await sessionDetail(id));
    const sweeps = await Sweep.findAll({ where: { benchSessionId: id }, include: [{ model: User, as: 'createdBy' }, { model: User, as: 'deletedBy' }], order: [['createdAt', 'ASC']] });
    const stats = await sweepPointStats(sequelize, sweeps.map((sweep) => sweep.id));
    const points = await Promise.all(sweeps.map((sweep) => pagePoints(sequelize, sweep.id, { page: 1, pageSize: 10_000_000, sort: 'sequence', direction: 'asc' })));
    response.attachment(`${record.detail.unitSerial}.json`).json({
      format: 'rejectra-session/1',
      exportedAt: context.now().toISOString(),
      session: record.detail,
      design: record.design,
      sweeps: sweeps.map((sweep, index) => ({ ...presentSweep(sweep, stats.get(sweep.id)), points: points[index].rows })),
      analysis: record.analysis,
    });
  });

  router.get('/:id/report.pdf', async (request, response) => {
    const id = String(request.params.id);
    await sendSessionPdf(context, await loadSessionRecord(context, id, await sessionDetail(id)), request, response);
  });

  router.get('/:id/analysis', async (request, response) => {
    const maxPoints = request.query.maxPoints === undefined ? null : Number(request.query.maxPoints);
    if (maxPoints !== null && !(Number.isInteger(maxPoints) && maxPoints >= 100 && maxPoints <= 1_000_000)) {
      throw badRequest('maxPoints must be a whole number from 100 to 1,000,000', { maxPoints: 'from 100 to 1,000,000' });
    }
    const analysis = await loadSessionAnalysis(context, String(request.params.id));
    if (!analysis) throw notFound('No such bench session');
    response.json({ analysis: maxPoints === null ? analysis : thinAnalysis(analysis, maxPoints) });
  });

  router.get('/:id/analysis/points', async (request, response) => {
    const parsed = analysisPointsQuerySchema.safeParse(request.query);
    if (!parsed.success) throw badRequest('Invalid analysed-points query', Object.fromEntries(parsed.error.issues.map((issue) => [issue.path.join('.'), issue.message])));
    const analysis = await loadSessionAnalysis(context, String(request.params.id));
    if (!analysis) throw notFound('No such bench session');
    response.json(pageAnalysisPoints(analysis, parsed.data));
  });

  return router;
}
