import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { authenticate, authorize } from '../../auth/middleware';
import { notFound } from '../../http/errors';
import { listMessages, readMessage } from '../../mail/mailbox';

/** What the local mail stand-in received; only when it is the mail service in use. */
export function devMailRouter(context: AppContext): Router {
  const router = Router();
  router.use(authenticate(context.sessions), authorize('lead'), (_request, _response, next) => {
    if (!context.config.mailIsLocalStandIn) return next(notFound('Mail goes to a real SMTP server (SMTP_URL is set); there is no local mailbox'));
    next();
  });

  router.get('/', async (_request, response) => {
    response.json({ messages: await listMessages(context.config.mailStandInDir) });
  });

  router.get('/:id', async (request, response) => {
    const message = await readMessage(context.config.mailStandInDir, String(request.params.id));
    if (!message) throw notFound('No such message in the local mailbox');
    response.json(message);
  });

  return router;
}
