// The Express application: security headers, the JSON API under /api, the built client.
import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { AppContext } from './app-context';
import { requireSameOrigin } from './auth/middleware';
import { errorHandler, notFound } from './http/errors';
import { authRouter } from './routes/auth/router';
import { designsRouter } from './routes/designs/router';
import { devMailRouter } from './routes/dev-mail/router';
import { healthRouter } from './routes/health/router';
import { instrumentsRouter } from './routes/instruments/router';
import { preferencesRouter } from './routes/preferences/router';
import { sessionsRouter } from './routes/sessions/router';
import { tokensRouter } from './routes/tokens/router';
import { usersRouter } from './routes/users/router';

export function createApp(context: AppContext): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Charts set inline styles; scripts stay same-origin only.
          'style-src': ["'self'", "'unsafe-inline'"],
          'connect-src': ["'self'", 'ws:', 'wss:'],
          'upgrade-insecure-requests': context.config.secureCookies ? [] : null,
        },
      },
      strictTransportSecurity: context.config.secureCookies,
    }),
  );

  const api = express.Router();
  api.use(express.json({ limit: '1mb' }));
  api.use(requireSameOrigin(() => context.config.appUrl, context.sessions.cookieName));
  api.use('/health', healthRouter(context));
  api.use('/auth', authRouter(context));
  api.use('/users', usersRouter(context));
  api.use('/dev/mail', devMailRouter(context));
  api.use('/instruments', instrumentsRouter(context));
  api.use('/designs', designsRouter(context));
  api.use('/sessions', sessionsRouter(context));
  api.use('/tokens', tokensRouter(context));
  api.use('/preferences', preferencesRouter(context));
  api.use((request, _response, next) => next(notFound(`No API route ${request.method} ${request.originalUrl}`)));
  app.use('/api', api);

  const indexFile = path.join(context.config.clientDir, 'index.html');
  if (existsSync(indexFile)) {
    app.use(express.static(context.config.clientDir, { index: false, maxAge: '1h' }));
    // Client-side routes all load the same page.
    app.get('/{*splat}', (_request, response) => response.sendFile(indexFile));
  } else {
    app.get('/', (_request, response) => {
      response.type('text').send('Rejectra API is running. The client is not built: run `npm run build` (npm start does this).');
    });
  }

  app.use(errorHandler(context.logger));
  return app;
}
