// Starts the API on a database: migrate, wire the context, listen.
import { readFileSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import pino, { type Logger } from 'pino';
import type { AppContext } from './app-context';
import { createApp } from './app';
import { createSessionStore } from './auth/session-store';
import type { ServerConfig } from './config';
import { openDatabase } from './db';
import { createMailer } from './mail/mailer';
import { createAnalysisCache } from './analysis/analysis-cache';
import { loadSessionAnalysis } from './analysis/load-session-analysis';
import { liveAnalysisMaximumPoints, thinAnalysis } from './analysis/thin-analysis';
import { createSessionHub } from './live/session-hub';
import { attachStreamServer } from './live/stream-server';
import { migrateToLatest } from './migrate';
import { initializeModels } from './models';

export interface RunningServer {
  url: string;
  port: number;
  context: AppContext;
  close(): Promise<void>;
}

const version = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;

export async function startServer(
  config: ServerConfig,
  options: { logger?: Logger; now?: () => Date } = {},
): Promise<RunningServer> {
  const logger = options.logger ?? pino({ level: config.logLevel, base: { service: 'rejectra' } });
  const database = openDatabase(config.databaseUrl);
  try {
    await database.sequelize.authenticate();
  } catch (error) {
    await database.close();
    const reason = error instanceof Error ? error.message : String(error);
    throw new Error(`Cannot reach PostgreSQL at ${redact(config.databaseUrl)}: ${reason}`, { cause: error });
  }
  const applied = await migrateToLatest(database.sequelize);
  if (applied.length > 0) logger.info({ applied }, 'migrations applied');
  initializeModels(database.sequelize);

  const now = options.now ?? (() => new Date());
  const analyses = createAnalysisCache();
  const context: AppContext = {
    config,
    database,
    hub: createSessionHub({
      // Viewers get the refit thinned for drawing, as the page asks for it over REST.
      refit: async (sessionId) => {
        const analysis = await loadSessionAnalysis({ database, now, analyses }, sessionId);
        return analysis && thinAnalysis(analysis, liveAnalysisMaximumPoints);
      },
      refitIntervalMs: 250,
      onError: (error) => logger.error({ err: error }, 'live refit failed'),
    }),
    analyses,
    sessions: createSessionStore(database.pool, { secureCookies: config.secureCookies }),
    mailer: createMailer({ smtpUrl: config.smtpUrl, from: config.mailFrom, localStandIn: config.mailIsLocalStandIn }),
    logger,
    version,
    now,
  };
  const app = createApp(context);
  const server: Server = await new Promise((resolve, reject) => {
    const listening = app.listen(config.port, config.host, () => resolve(listening));
    listening.once('error', reject);
  });
  const streams = attachStreamServer(server, context);
  const port = (server.address() as AddressInfo).port;
  // Started on "any free port": links and the Origin check use the port we got.
  if (config.port === 0) config.appUrl = `http://${config.host}:${port}`;
  return {
    url: `http://${config.host}:${port}`,
    port,
    context,
    async close() {
      await streams.close();
      context.hub.close();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      context.mailer.close();
      await database.close();
    },
  };
}

/** The connection string without its password, for messages. */
export function redact(databaseUrl: string): string {
  try {
    const url = new URL(databaseUrl);
    if (url.password) url.password = '***';
    return url.toString();
  } catch {
    return '(unparseable DATABASE_URL)';
  }
}
