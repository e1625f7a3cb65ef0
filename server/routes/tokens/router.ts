import { Router } from 'express';
import { createTokenSchema } from '../../../shared/schemas/tokens';
import type { AccessTokenSummary } from '../../../shared/schemas/tokens';
import type { AppContext } from '../../app-context';
import { createAccessToken } from '../../auth/access-tokens';
import { authenticate } from '../../auth/middleware';
import { conflict, notFound } from '../../http/errors';
import { validateBody } from '../../http/validate';
import { AccessToken } from '../../models';

function presentToken(record: AccessToken): AccessTokenSummary {
  return {
    id: record.id,
    name: record.name,
    prefix: record.tokenPrefix,
    createdAt: record.createdAt.toISOString(),
    lastUsedAt: record.lastUsedAt ? record.lastUsedAt.toISOString() : null,
    revokedAt: record.revokedAt ? record.revokedAt.toISOString() : null,
  };
}

/** A person's own personal access tokens (for bench programs). */
export function tokensRouter(context: AppContext): Router {
  const router = Router();
  router.use(authenticate(context.sessions));

  router.get('/', async (_request, response) => {
    const tokens = await AccessToken.findAll({ where: { userId: response.locals.user.id }, order: [['createdAt', 'DESC']] });
    response.json({ tokens: tokens.map(presentToken) });
  });

  router.post('/', validateBody(createTokenSchema), async (request, response) => {
    const { name } = request.body as { name: string };
    const active = await AccessToken.count({ where: { userId: response.locals.user.id, revokedAt: null } });
    if (active >= 20) throw conflict('You have 20 active tokens; revoke one before creating another');
    const { record, token } = await createAccessToken(response.locals.user.id, name);
    response.status(201).json({ token: { ...presentToken(record), token } });
  });

  router.delete('/:id', async (request, response) => {
    const record = await AccessToken.findOne({ where: { id: String(request.params.id), userId: response.locals.user.id } });
    if (!record) throw notFound('No such token of yours');
    if (!record.revokedAt) {
      record.revokedAt = context.now();
      await record.save();
    }
    response.json({ token: presentToken(record) });
  });

  return router;
}
