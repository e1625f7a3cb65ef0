// Server configuration from the environment, with the defaults the README lists.
import path from 'node:path';

export interface ServerConfig {
  /** PostgreSQL connection string. */
  databaseUrl: string;
  host: string;
  port: number;
  /** Public origin of the app, used in e-mailed links and the Origin check. */
  appUrl: string;
  /** `smtp://host:port` of the outgoing mail server. */
  smtpUrl: string;
  /** True when smtpUrl is the local stand-in (its messages can be read in the app). */
  mailIsLocalStandIn: boolean;
  /** Folder where the local mail stand-in keeps what it receives. */
  mailStandInDir: string;
  mailFrom: string;
  /** Send the session cookie with `Secure` (needed behind https). */
  secureCookies: boolean;
  /** Folder holding the built client (`vite build`), served when present. */
  clientDir: string;
  /** Requests a client may make to sign-in / password-reset per window. */
  authRateLimit: { windowMs: number; limit: number };
  logLevel: string;
  /** Upload size limits. */
  uploads: { sweepFileBytes: number; captureFileBytes: number };
}

export const defaults = {
  port: 5480,
  smtpPort: 5481,
  postgresPort: 5482,
  dataDir: '.data',
} as const;

function integer(name: string, value: string | undefined, fallback: number): number {
  if (value === undefined || value === '') return fallback;
  const parsed = Number(value);
  if (!Number.isInteger(parsed) || parsed < 0) {
    throw new Error(`Configuration: ${name} must be a whole number, got "${value}"`);
  }
  return parsed;
}

/** Reads the configuration; throws naming the variable when one is malformed. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env, root = process.cwd()): ServerConfig {
  const port = integer('PORT', env.PORT, defaults.port);
  const host = env.HOST || '127.0.0.1';
  const dataDir = path.resolve(root, env.REJECTRA_DATA_DIR || defaults.dataDir);
  const standInUrl = `smtp://127.0.0.1:${integer('MAIL_STAND_IN_PORT', env.MAIL_STAND_IN_PORT, defaults.smtpPort)}`;
  const databaseUrl =
    env.DATABASE_URL || `postgres://postgres@127.0.0.1:${integer('PGPORT', env.PGPORT, defaults.postgresPort)}/rejectra`;
  return {
    databaseUrl,
    host,
    port,
    appUrl: (env.APP_URL || `http://${host}:${port}`).replace(/\/+$/, ''),
    smtpUrl: env.SMTP_URL || standInUrl,
    mailIsLocalStandIn: !env.SMTP_URL,
    mailStandInDir: path.resolve(root, env.MAIL_STAND_IN_DIR || path.join(dataDir, 'mail')),
    mailFrom: env.MAIL_FROM || 'Rejectra <no-reply@rejectra.test>',
    secureCookies: env.COOKIE_SECURE === 'true',
    clientDir: path.resolve(root, env.CLIENT_DIR || 'dist/client'),
    authRateLimit: {
      windowMs: integer('AUTH_RATE_WINDOW_MS', env.AUTH_RATE_WINDOW_MS, 15 * 60_000),
      limit: integer('AUTH_RATE_LIMIT', env.AUTH_RATE_LIMIT, 30),
    },
    logLevel: env.LOG_LEVEL || 'info',
    uploads: {
      sweepFileBytes: integer('UPLOAD_SWEEP_MAX_BYTES', env.UPLOAD_SWEEP_MAX_BYTES, 50 * 1024 * 1024),
      captureFileBytes: integer('UPLOAD_CAPTURE_MAX_BYTES', env.UPLOAD_CAPTURE_MAX_BYTES, 64 * 1024 * 1024),
    },
  };
}
