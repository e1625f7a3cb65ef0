import { Router } from 'express';
import { createDesignSchema, designRevisionInputSchema, type DesignRevisionData } from '../../../shared/schemas/designs';
import type { AppContext } from '../../app-context';
import { authenticate, authorize } from '../../auth/middleware';
import { notFound } from '../../http/errors';
import { validateBody } from '../../http/validate';
import { Design, DesignRevision } from '../../models';
import { addDesignRevision, createDesign, loadDesignWithRevisions, sessionCountsByRevision } from '../../operations/designs';
import { presentDesignDetail, presentDesignRevision, presentDesignSummary } from '../../presenters/design';

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

  return router;
}
