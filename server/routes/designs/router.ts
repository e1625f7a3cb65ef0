import { Router } from 'express';
import { createDesignSchema, designRevisionInputSchema, type DesignRevisionData } from '../../../shared/schemas/designs';
import type { AppContext } from '../../app-context';
import { authenticate, authorize } from '../../auth/middleware';
import { notFound } from '../../http/errors';
import { validateBody } from '../../http/validate';
import { Design, DesignRevision } from '../../models';
import { addDesignRevision, createDesign, loadDesignWithRevisions, sessionCountsByRevision } from '../../operations/designs';
import { presentDesignDetail, presentDesignRevision, presentDesignSummary } from '../../presenters/design';
import { monteCarloCmrrBand, summariseLot } from '../../../shared/analysis';
import { loadLot, lotBandFrequencies } from '../../analysis/lot';
import { thinAnalysis } from '../../analysis/thin-analysis';
import { csvDocument, safeFileName } from '../../exports/csv';

/** Points per unit the lot page gets: its overlay chart is one plot wide (the exports keep every point). */
const lotPageMaximumPoints = 2000;

export function designsRouter(context: AppContext): Router {
  const router = Router();
  const sequelize = context.database.sequelize;
  router.use(authenticate(context.sessions));

  router.get('/', async (_request, response) => {
    const designs = await Design.findAll({ order: [['name', 'ASC']] });
    const revisions = await DesignRevision.findAll({ order: [['revision', 'DESC']] });
    const counts = await sessionCountsByRevision(revisions.map((revision) => revision.id));
    const byDesign = new Map<string, DesignRevision[]>();
    for (const revision of revisions) byDesign.set(revision.designId, [...(byDesign.get(revision.designId) ?? []), revision]);
    response.json({ designs: designs.map((design) => presentDesignSummary(design, byDesign.get(design.id) ?? [], counts)) });
  });

  router.post('/', authorize('designer'), validateBody(createDesignSchema), async (request, response) => {
    const input = request.body as { name: string; description: string; revision: DesignRevisionData };
    const design = await createDesign(sequelize, input, response.locals.user);
    const loaded = await loadDesignWithRevisions(design.id);
    response.status(201).json({ design: presentDesignDetail(loaded!.design, loaded!.revisions, loaded!.sessionCounts) });
  });

  router.get('/:id', async (request, response) => {
    const loaded = await loadDesignWithRevisions(String(request.params.id));
    if (!loaded) throw notFound('No such design');
    response.json({ design: presentDesignDetail(loaded.design, loaded.revisions, loaded.sessionCounts) });
  });

  router.post('/:id/revisions', authorize('designer'), validateBody(designRevisionInputSchema), async (request, response) => {
    const designId = String(request.params.id);
    if (!(await Design.findByPk(designId))) throw notFound('No such design');
    const revision = await addDesignRevision(sequelize, designId, request.body as DesignRevisionData, response.locals.user);
    const loaded = await loadDesignWithRevisions(designId);
    const written = loaded!.revisions.find((candidate) => candidate.id === revision.id)!;
    response.status(201).json({ revision: presentDesignRevision(written, 0), design: presentDesignDetail(loaded!.design, loaded!.revisions, loaded!.sessionCounts) });
  });

  /** The lot; `forPage` thins each unit's analysis for drawing (the summary is made from every point first). */
  const lotOf = async (designId: string, revisionId: string, options: { forPage?: boolean } = {}) => {
    const revision = await DesignRevision.findOne({ where: { id: revisionId, designId }, include: [{ model: Design, as: 'design' }] });
    if (!revision?.design) throw notFound('No such design revision');
    const units = await loadLot(context.database, context.analyses, revision, context.now());
    const analysed = units.filter((unit) => unit.analysis.status === 'complete' && unit.analysis.points.length > 0);
    const frequencies = lotBandFrequencies(
      analysed.flatMap((unit) => unit.analysis.points.map((point) => point.frequencyHz)),
      revision.limitMask.points.map((point) => point.frequencyHz),
    );
    // The predicted spread of the lot: Monte Carlo over the revision's tolerances (seeded, so a
    // lot looks the same every time it is opened).
    const band = frequencies.length > 0 ? monteCarloCmrrBand(revision.circuit, frequencies, { trials: 10_000, seed: 1 }) : undefined;
    const summary = analysed.length > 0 ? summariseLot(analysed.map((unit) => ({ sessionId: unit.sessionId, unitSerial: unit.unitSerial, points: unit.analysis.points })), revision.limitMask, band) : null;
    return {
      design: { id: revision.design.id, name: revision.design.name },
      revision: { id: revision.id, revision: revision.revision, label: revision.label, circuit: revision.circuit, limitMask: revision.limitMask },
      units: options.forPage ? units.map((unit) => ({ ...unit, analysis: thinAnalysis(unit.analysis, lotPageMaximumPoints) })) : units,
      predictedBand: band?.points ?? [],
      summary,
    };
  };

  // Every unit measured against one revision (its latest session), each with its analysis.
  router.get('/:id/revisions/:revisionId/lot', async (request, response) => {
    response.json({ lot: await lotOf(String(request.params.id), String(request.params.revisionId), { forPage: true }) });
  });

  router.get('/:id/revisions/:revisionId/lot/export.json', async (request, response) => {
    const lot = await lotOf(String(request.params.id), String(request.params.revisionId));
    response.attachment(`${safeFileName(`${lot.design.name}-${lot.revision.label}-lot`)}.json`).json({ format: 'rejectra-lot/1', exportedAt: context.now().toISOString(), ...lot });
  });

  router.get('/:id/revisions/:revisionId/lot/export.csv', async (request, response) => {
    const lot = await lotOf(String(request.params.id), String(request.params.revisionId));
    const rows = lot.units.flatMap((unit) =>
      unit.analysis.points.map((point, index) => {
        const verdict = unit.analysis.limits?.verdicts[index];
        return [unit.unitSerial, unit.sessionId, unit.measuredAt, point.frequencyHz, point.cmrrDb, point.lowerBound, verdict?.limitDb ?? null, verdict?.marginDb ?? null, verdict?.outcome ?? ''];
      }),
    );
    response
      .type('text/csv; charset=utf-8')
      .attachment(`${safeFileName(`${lot.design.name}-${lot.revision.label}-lot`)}.csv`)
      .send(
        csvDocument(
          [`Rejectra lot: ${lot.design.name} ${lot.revision.label}; ${lot.units.length} units (latest session of each)`, 'cmrr_db of a lower_bound row is a lower bound'],
          ['unit_serial', 'session_id', 'measured_at', 'frequency_hz', 'cmrr_db', 'lower_bound', 'limit_db', 'margin_db', 'outcome'],
          rows,
        ),
      );
  });

  return router;
}
