import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { authenticate } from '../../auth/middleware';
import { UserPreference } from '../../models';
import { columnMappingPreferenceKey } from '../../uploads/sweep-uploads';

/** The column mapping a person last used for a sweep upload (remembered by the upload itself). */
export function preferencesRouter(context: AppContext): Router {
  const router = Router();
  router.use(authenticate(context.sessions));
  router.get('/column-mapping', async (_request, response) => {
    const preference = await UserPreference.findOne({ where: { userId: response.locals.user.id, key: columnMappingPreferenceKey } });
    response.json({ columnMapping: preference ? preference.value : null });
  });
  return router;
}
