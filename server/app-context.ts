import type { AnalysisCache } from './analysis/analysis-cache';
import type { Logger } from 'pino';
import type { SessionStore } from './auth/session-store';
import type { ServerConfig } from './config';
import type { Database } from './db';
import type { SessionHub } from './live/session-hub';
import type { Mailer } from './mail/mailer';

/** What route handlers need, built once at start-up and passed to every router. */
export interface AppContext {
  config: ServerConfig;
  database: Database;
  sessions: SessionStore;
  mailer: Mailer;
  logger: Logger;
  version: string;
  /** Live viewers of bench sessions. */
  hub: SessionHub;
  /** Session analyses kept while their points are unchanged. */
  analyses: AnalysisCache;
  /** Clock used for link expiry; tests replace it. */
  now: () => Date;
}
