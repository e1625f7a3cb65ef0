import { Router } from 'express';
import type { HealthResponse } from '../../../shared/schemas/auth';
import type { AppContext } from '../../app-context';
import { databaseIsUp } from '../../db';

export function healthRouter(context: AppContext): Router {
  const router = Router();
  router.get('/', async (_request, response) => {
    const up = await databaseIsUp(context.database);
    const body: HealthResponse = {
      status: up ? 'ok' : 'degraded',
      database: up ? 'up' : 'down',
      mail: context.config.mailIsLocalStandIn ? 'local-stand-in' : 'smtp',
      version: context.version,
    };
    response.status(up ? 200 : 503).json(body);
  });
  return router;
}
