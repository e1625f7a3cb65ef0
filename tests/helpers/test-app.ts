// A whole Rejectra server for a test file: its own database, its own mail stand-in
// folder and ports, the demo accounts seeded.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import pino from 'pino';
import request from 'supertest';
import { loadConfig, type ServerConfig } from '../../server/config';
import { listMessages, readMessage } from '../../server/mail/mailbox';
import { startMailStandIn, type MailStandIn } from '../../server/mail/local-stand-in';
import { seedDemo } from '../../server/seed';
import { startServer, type RunningServer } from '../../server/server';
import { createTestDatabase, type TestDatabase } from './test-database';

export interface TestApp {
  url: string;
  origin: string;
  server: RunningServer;
  config: ServerConfig;
  /** Messages the stand-in received, newest first, with their text. */
  mail(): Promise<{ to: string; subject: string; text: string }[]>;
  /** The link (`/link/<token>`) in the newest message to `to`. */
  linkSentTo(to: string): Promise<string>;
  /** Lets a test move the server's clock forward (link expiry). */
  advanceClock(milliseconds: number): void;
  /** A supertest agent signed in as `email` (demo password by default), sending the app's Origin. */
  signedIn(email: string, password?: string): Promise<ReturnType<typeof request.agent>>;
  close(): Promise<void>;
}

/**
 * `seed`: 'accounts' (default) the three demo sign-ins; 'demo' also the fictional lab's designs,
 * instruments and measured units; false nothing.
 */
export async function startTestApp(options: { seed?: 'accounts' | 'demo' | false; env?: NodeJS.ProcessEnv } = {}): Promise<TestApp> {
  const database: TestDatabase = await createTestDatabase();
  const mailDir = await mkdtemp(path.join(os.tmpdir(), 'rejectra-mail-'));
  const standIn: MailStandIn = await startMailStandIn({ port: 0, dir: mailDir });
  const config: ServerConfig = {
    ...loadConfig({
      DATABASE_URL: database.url,
      PORT: '0',
      MAIL_STAND_IN_DIR: mailDir,
      MAIL_STAND_IN_PORT: String(standIn.port),
      LOG_LEVEL: 'silent',
      // npm test builds the client into a folder of its own and names it here.
      ...(process.env.CLIENT_DIR ? { CLIENT_DIR: process.env.CLIENT_DIR } : {}),
      // Suites sign in far more often than a person; the limit has a test of its own.
      AUTH_RATE_LIMIT: '100000',
      ...options.env,
    }),
  };
  let clockOffset = 0;
  const server = await startServer(config, { logger: pino({ level: process.env.TEST_LOG_LEVEL ?? 'silent' }), now: () => new Date(Date.now() + clockOffset) });
  const seed = options.seed ?? 'accounts';
  if (seed !== false) await seedDemo(server.context.database.sequelize, { scenario: seed === 'demo' });

  const mail = async () => {
    const summaries = await listMessages(mailDir);
    const messages = await Promise.all(summaries.map((summary) => readMessage(mailDir, summary.id)));
    return messages.filter((message) => message !== null).map(({ to, subject, text }) => ({ to, subject, text }));
  };

  return {
    url: server.url,
    origin: server.url,
    server,
    config: server.context.config,
    mail,
    async linkSentTo(to) {
      const message = (await mail()).find((candidate) => candidate.to.includes(to));
      if (!message) throw new Error(`No e-mail to ${to} in the stand-in`);
      const match = message.text.match(/https?:\/\/\S+\/link\/[A-Za-z0-9_-]+/);
      if (!match) throw new Error(`The e-mail to ${to} holds no link:\n${message.text}`);
      return match[0];
    },
    advanceClock(milliseconds) {
      clockOffset += milliseconds;
    },
    async signedIn(email, password = 'bench-demo') {
      const agent = request.agent(server.url).set('Origin', server.url);
      await agent.post('/api/auth/sign-in').send({ email, password }).expect(200);
      return agent;
    },
    async close() {
      await server.close();
      await standIn.close();
      await database.drop();
      await rm(mailDir, { recursive: true, force: true });
    },
  };
}
