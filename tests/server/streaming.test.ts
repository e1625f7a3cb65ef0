// The live-streaming endpoint /ws (docs/STREAMING.md) against real PostgreSQL: the protocol with a
// raw WebSocket client, then the durability the issue asks for — the bench client (a child process)
// streams through a cut socket and through a server killed with SIGKILL and started again, and every
// acknowledged point is stored exactly once.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import net from 'node:net';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import WebSocket from 'ws';
import { freePort } from '../../scripts/lib/postgres-cluster';
import { createAccessToken } from '../../server/auth/access-tokens';
import { hashPassword } from '../../server/auth/passwords';
import { bridgeFrontEndCircuit } from '../../server/demo/fictional-boards';
import { User } from '../../server/models';
import { demoAccounts } from '../../server/seed';
import { simulateAmplifierSweep } from '../../shared/engine/simulated-amplifier';
import { startTestApp, type TestApp } from '../helpers/test-app';
import { createTestDatabase, type TestDatabase } from '../helpers/test-database';

const root = fileURLToPath(new URL('../..', import.meta.url));
// Demo password from server/seed.ts.
const demoPassword = 'bench-demo';
// Invented demo design (the fictional lab's HRB-204 board, gain 10).
const design = {
  name: 'LC-Bridge front-end board HRB-204 (streaming test)',
  description: 'Demo design of the Halden Ridge Instruments lab.',
  revision: {
    label: 'rev C',
    changeNote: '',
    circuit: bridgeFrontEndCircuit({ ohms: [10_000, 100_000], sourceOhms: [0, 0] }),
    limitMask: { points: [{ frequencyHz: 10, minimumCmrrDb: 66 }, { frequencyHz: 20000, minimumCmrrDb: 55 }], guardBandDb: 1 },
  },
};

function sessionBody(designRevisionId: string, unitSerial: string) {
  return {
    designRevisionId,
    unitSerial,
    fixture: 'Bench 2 shielded fixture',
    differentialDrive: { acVolts: 0.1, acConvention: 'rms' },
    commonModeDrive: { acVolts: 1, acConvention: 'rms' },
  };
}

/** A raw WebSocket client that keeps every message and tells how the socket closed. */
interface TestSocket {
  socket: WebSocket;
  messages: Record<string, unknown>[];
  /** The next message (after those already taken) of the given type, waiting up to 10 s. */
  next(type: string): Promise<Record<string, unknown>>;
  send(message: unknown): void;
  closed: Promise<{ code: number; reason: string }>;
}

function connect(url: string, headers: Record<string, string> = {}): TestSocket {
  const socket = new WebSocket(url.replace(/^http/, 'ws') + '/ws', { headers });
  const messages: Record<string, unknown>[] = [];
  const waiters: (() => void)[] = [];
  const taken = new Set<number>();
  socket.on('message', (data) => {
    messages.push(JSON.parse(data.toString()) as Record<string, unknown>);
    for (const wake of waiters.splice(0)) wake();
  });
  const closed = new Promise<{ code: number; reason: string }>((resolve) =>
    socket.on('close', (code, reason) => {
      resolve({ code, reason: reason.toString() });
      for (const wake of waiters.splice(0)) wake();
    }),
  );
  socket.on('error', () => undefined);
  const next = async (type: string) => {
    const deadline = Date.now() + 10_000;
    for (;;) {
      const index = messages.findIndex((message, position) => !taken.has(position) && message.type === type);
      if (index >= 0) {
        taken.add(index);
        return messages[index];
      }
      if (socket.readyState === WebSocket.CLOSED || Date.now() > deadline) {
        throw new Error(`No "${type}" message; got ${JSON.stringify(messages).slice(0, 500)}`);
      }
      await new Promise<void>((resolve) => {
        waiters.push(resolve);
        setTimeout(resolve, 200);
      });
    }
  };
  return {
    socket,
    messages,
    next,
    closed,
    send: (message) => socket.send(typeof message === 'string' ? message : JSON.stringify(message)),
  };
}

function points(from: number, to: number, voutV = 0.001) {
  return Array.from({ length: to - from + 1 }, (_, index) => ({ seq: from + index, frequencyHz: 10 * (from + index), vinV: 1, voutV }));
}

describe('/ws streaming protocol', () => {
  let app: TestApp;
  let revisionId: string;
  let techToken: string;
  let techTokenId: string;
  let otherTechToken: string;

  const agent = () => request.agent(app.url).set('Origin', app.origin);
  const signedIn = async (email: string) => {
    const session = agent();
    await session.post('/api/auth/sign-in').send({ email, password: demoPassword }).expect(200);
    return session;
  };
  const newSession = async (unitSerial: string) => {
    const tech = await signedIn('tech@rejectra.test');
    const created = await tech.post('/api/sessions').send(sessionBody(revisionId, unitSerial)).expect(201);
    return created.body.session.id as string;
  };
  const bench = (token = techToken) => connect(app.url, { Authorization: `Bearer ${token}` });
  const storedSequences = async (sweepId: string) =>
    (
      (await app.server.context.database.sequelize.query('SELECT sequence FROM sweep_points WHERE sweep_id = $1 ORDER BY sequence', {
        bind: [sweepId],
        type: QueryTypes.SELECT,
      })) as { sequence: number }[]
    ).map((row) => row.sequence);
  const openSweep = async (client: TestSocket, sessionId: string, key: string, mode = 'differential') => {
    if (!client.messages.some((message) => message.type === 'sweep-opened')) await client.next('ready');
    client.send({ type: 'open-sweep', sessionId, mode, key, amplitudeConvention: 'rms', sourceName: 'test bench' });
    return (await client.next('sweep-opened')) as { sweepId: string; acknowledgedThrough: number };
  };

  beforeAll(async () => {
    app = await startTestApp();
    const designer = await signedIn('designer@rejectra.test');
    const created = await designer.post('/api/designs').send(design).expect(201);
    revisionId = created.body.design.revisions[0].id;
    const tech = await signedIn('tech@rejectra.test');
    const token = await tech.post('/api/tokens').send({ name: 'bench 2 laptop' }).expect(201);
    techToken = token.body.token.token;
    techTokenId = token.body.token.id;
    const other = await User.create({
      id: randomUUID(),
      email: 'second.tech@rejectra.test',
      name: 'Second Technician',
      role: 'technician',
      status: 'active',
      passwordHash: await hashPassword('another-bench-password'),
      lastSignInAt: null,
    });
    otherTechToken = (await createAccessToken(other.id, 'their bench')).token;
  });
  afterAll(async () => {
    await app?.close();
  });

  it('greets a valid token with ready and the owner', async () => {
    const client = bench();
    expect(await client.next('ready')).toMatchObject({ user: { name: 'Ines Halvorsen', role: 'technician' } });
    client.socket.close();
  });

  it('refuses a connection without credentials with a message, then closes 4401', async () => {
    const client = connect(app.url);
    expect((await client.next('error')).message).toMatch(/Sign in, or present a personal access token/);
    expect((await client.closed).code).toBe(4401);
  });

  it('refuses an unknown and a malformed token with 4401', async () => {
    const unknown = bench('rjt_thisTokenWasNeverIssuedByTheServer000000000');
    expect((await unknown.next('error')).message).toMatch(/not known/);
    expect((await unknown.closed).code).toBe(4401);
    const malformed = bench('not-a-token');
    expect((await malformed.next('error')).message).toMatch(/malformed/);
    expect((await malformed.closed).code).toBe(4401);
  });

  it('refuses a revoked token with a message naming it, then closes 4401', async () => {
    const tech = await signedIn('tech@rejectra.test');
    const created = await tech.post('/api/tokens').send({ name: 'old laptop' }).expect(201);
    await tech.delete(`/api/tokens/${created.body.token.id}`).expect(200);
    const client = bench(created.body.token.token);
    expect((await client.next('error')).message).toBe('The access token "old laptop" was revoked');
    expect((await client.closed).code).toBe(4401);
    expect(techTokenId).not.toBe(created.body.token.id);
  });

  it("refuses a technician's token writing to another technician's session with 4403", async () => {
    const sessionId = await newSession('HRB204-0101');
    const client = bench(otherTechToken);
    await client.next('ready');
    client.send({ type: 'open-sweep', sessionId, mode: 'differential', key: 'intruder' });
    expect((await client.next('error')).message).toMatch(/started by another technician/);
    expect((await client.closed).code).toBe(4403);
  });

  it('refuses an archived session with 4403 and an unknown one with 4404', async () => {
    const sessionId = await newSession('HRB204-0102');
    const lead = await signedIn('lead@rejectra.test');
    await lead.post(`/api/sessions/${sessionId}/archive`).expect(200);
    const client = bench();
    await client.next('ready');
    client.send({ type: 'open-sweep', sessionId, mode: 'differential', key: 'late' });
    expect((await client.next('error')).message).toMatch(/archived/);
    expect((await client.closed).code).toBe(4403);

    const missing = bench();
    await missing.next('ready');
    missing.send({ type: 'open-sweep', sessionId: 'no-such-session', mode: 'differential', key: 'k' });
    expect((await missing.next('error')).message).toMatch(/No bench session no-such-session/);
    expect((await missing.closed).code).toBe(4404);
  });

  it('answers text that is not JSON with an error, then closes 4400', async () => {
    const client = bench();
    await client.next('ready');
    client.send('{"type": "open-sweep", ');
    expect((await client.next('error')).message).toBe('Message is not valid JSON');
    expect((await client.closed).code).toBe(4400);
  });

  it('names a malformed field, then closes 4400, storing nothing of that batch', async () => {
    const sessionId = await newSession('HRB204-0103');
    const client = bench();
    const { sweepId } = await openSweep(client, sessionId, 'bad-field');
    client.send({ type: 'points', sweepId, points: [...points(1, 3), { seq: 4, frequencyHz: -5, vinV: 1, voutV: 0.1 }] });
    expect((await client.next('error')).message).toMatch(/points\.3\.frequencyHz: must be above zero/);
    expect((await client.closed).code).toBe(4400);
    expect(await storedSequences(sweepId)).toEqual([]);
  });

  it('refuses points for a sweep not opened on this connection with 4400', async () => {
    const client = bench();
    await client.next('ready');
    client.send({ type: 'points', sweepId: 'some-other-sweep', points: points(1, 2) });
    expect((await client.next('error')).message).toMatch(/not open on this connection: send open-sweep first/);
    expect((await client.closed).code).toBe(4400);
  });

  it('refuses a message over 1 MiB with a message saying so, then closes 1009', async () => {
    const client = bench();
    await client.next('ready');
    client.send(JSON.stringify({ type: 'subscribe', sessionId: 'x'.repeat(1024 * 1024 + 10) }));
    expect((await client.next('error')).message).toMatch(/larger than the 1048576 allowed; send fewer points per message/);
    expect((await client.closed).code).toBe(1009);
  });

  it('acknowledges points only once they are committed: every acked point is in sweep_points when the ack arrives', async () => {
    const sessionId = await newSession('HRB204-0104');
    const client = bench();
    const { sweepId, acknowledgedThrough } = await openSweep(client, sessionId, 'ack-after-commit');
    expect(acknowledgedThrough).toBe(0);
    // Twenty batches sent at once: acks arrive while later batches are still being written.
    for (let batch = 0; batch < 20; batch++) client.send({ type: 'points', sweepId, points: points(batch * 250 + 1, batch * 250 + 250) });
    let through = 0;
    while (through < 5000) {
      const ack = await client.next('ack');
      through = ack.through as number;
      const stored = await storedSequences(sweepId);
      expect(stored.length).toBeGreaterThanOrEqual(through);
      expect(stored.slice(0, through)).toEqual(Array.from({ length: through }, (_, index) => index + 1));
    }
    client.send({ type: 'close-sweep', sweepId });
    expect(await client.next('sweep-closed')).toMatchObject({ sweepId, pointCount: 5000 });
    client.socket.close();
  });

  it('stores a resent point once, keeping the first value, and resumes a sweep from its acknowledgedThrough', async () => {
    const sessionId = await newSession('HRB204-0105');
    const first = bench();
    const { sweepId } = await openSweep(first, sessionId, 'resend');
    first.send({ type: 'points', sweepId, points: points(1, 100, 0.001) });
    expect((await first.next('ack')).through).toBe(100);
    first.socket.terminate();

    const second = bench();
    const reopened = await openSweep(second, sessionId, 'resend');
    expect(reopened).toMatchObject({ sweepId, acknowledgedThrough: 100 });
    // A client that missed the ack resends 51…100 (with different readings) along with new points.
    second.send({ type: 'points', sweepId, points: points(51, 150, 0.002) });
    expect((await second.next('ack')).through).toBe(150);
    expect(await storedSequences(sweepId)).toEqual(Array.from({ length: 150 }, (_, index) => index + 1));
    const [{ vout }] = (await app.server.context.database.sequelize.query('SELECT vout_v AS vout FROM sweep_points WHERE sweep_id = $1 AND sequence = 60', {
      bind: [sweepId],
      type: QueryTypes.SELECT,
    })) as { vout: number }[];
    expect(vout).toBe(0.001);
    second.socket.close();
  });

  it('acknowledges out-of-order batches only through the first gap', async () => {
    const sessionId = await newSession('HRB204-0106');
    const client = bench();
    const { sweepId } = await openSweep(client, sessionId, 'out-of-order');
    client.send({ type: 'points', sweepId, points: points(51, 100) });
    expect((await client.next('ack')).through).toBe(0);
    client.send({ type: 'points', sweepId, points: points(151, 200) });
    expect((await client.next('ack')).through).toBe(0);
    client.send({ type: 'points', sweepId, points: points(1, 50) });
    expect((await client.next('ack')).through).toBe(100);
    client.socket.terminate();

    // The server works the gap out from the table after a reconnect too.
    const again = bench();
    expect((await openSweep(again, sessionId, 'out-of-order')).acknowledgedThrough).toBe(100);
    again.send({ type: 'points', sweepId, points: points(101, 150) });
    expect((await again.next('ack')).through).toBe(150);
    again.send({ type: 'points', sweepId, points: points(151, 200) });
    expect((await again.next('ack')).through).toBe(200);
    again.socket.close();
  });

  it('refuses to reopen a key with the other mode', async () => {
    const sessionId = await newSession('HRB204-0107');
    const client = bench();
    await openSweep(client, sessionId, 'one-mode');
    client.send({ type: 'open-sweep', sessionId, mode: 'common-mode', key: 'one-mode' });
    expect((await client.next('error')).message).toMatch(/belongs to a differential sweep/);
    expect((await client.closed).code).toBe(4400);
  });

  it('sends viewers signed in with a browser session the committed points, refits and sweep changes', async () => {
    const sessionId = await newSession('HRB204-0108');
    const signIn = await request(app.url).post('/api/auth/sign-in').set('Origin', app.origin).send({ email: 'lead@rejectra.test', password: demoPassword }).expect(200);
    const cookie = (signIn.headers['set-cookie'] as unknown as string[]).map((entry) => entry.split(';')[0]).join('; ');

    const viewer = connect(app.url, { Cookie: cookie, Origin: app.origin });
    expect(await viewer.next('ready')).toMatchObject({ user: { role: 'lead' } });
    viewer.send({ type: 'subscribe', sessionId });
    expect(await viewer.next('subscribed')).toEqual({ type: 'subscribed', sessionId });

    const client = bench();
    // Readings of the simulated instrument (invented demo amplifier), both drives.
    for (const mode of ['differential', 'common-mode'] as const) {
      const readings = simulateAmplifierSweep({
        mode,
        pointCount: 21,
        startFrequencyHz: 10,
        stopFrequencyHz: 100e3,
        gain: 10,
        mismatchFraction: 0.001,
        noiseVolts: 1e-6,
        driveVolts: 1,
        seed: 3,
      });
      const { sweepId } = await openSweep(client, sessionId, `viewer-${mode}`, mode);
      expect(await viewer.next('session-changed')).toMatchObject({ sessionId, reason: 'sweep-added' });
      client.send({ type: 'points', sweepId, points: readings.map((reading, index) => ({ seq: index + 1, ...reading })) });
      await client.next('ack');
      const pushed = await viewer.next('session-points');
      expect(pushed).toMatchObject({ sessionId, sweepId, mode });
      expect((pushed.points as { seq: number; voutV: number }[]).map((point) => point.seq)).toEqual(readings.map((_, index) => index + 1));
      expect((pushed.points as { voutV: number }[])[4].voutV).toBe(readings[4].voutV);
      client.send({ type: 'close-sweep', sweepId });
      expect(await client.next('sweep-closed')).toMatchObject({ sweepId, pointCount: 21 });
      expect(await viewer.next('session-changed')).toMatchObject({ sessionId, reason: 'sweep-closed' });
    }
    // Refits arrive at most every 250 ms (the hub's interval); one follows the last batch and counts both sweeps.
    let analysis = (await viewer.next('session-analysis')).analysis as { sessionId: string; pointCounts: { differential: number; commonMode: number }; status: string };
    while (analysis.pointCounts.commonMode < 21) analysis = (await viewer.next('session-analysis')).analysis as typeof analysis;
    expect(analysis).toMatchObject({ sessionId, pointCounts: { differential: 21, commonMode: 21 }, status: 'complete' });
    viewer.socket.close();
    client.socket.close();
  });

  it('refuses a browser connection from a foreign page with 4401', async () => {
    const signIn = await request(app.url).post('/api/auth/sign-in').set('Origin', app.origin).send({ email: 'lead@rejectra.test', password: demoPassword }).expect(200);
    const cookie = (signIn.headers['set-cookie'] as unknown as string[]).map((entry) => entry.split(';')[0]).join('; ');
    const viewer = connect(app.url, { Cookie: cookie, Origin: 'http://elsewhere.example' });
    expect((await viewer.next('error')).message).toMatch(/did not come from a Rejectra page/);
    expect((await viewer.closed).code).toBe(4401);
  });
});

// ---------------------------------------------------------------------------------------------
// Durability: the bench client (child process) against a server in a child process of its own.

interface Child {
  process: ChildProcess;
  /** What the child wrote to stdout. */
  stdout: () => string;
  /** stdout and stderr together, for failure messages. */
  output: () => string;
  exited: Promise<number | null>;
}

function startChild(args: string[], env: NodeJS.ProcessEnv): Child {
  const child = spawn(process.execPath, ['--import', 'tsx', ...args], { cwd: root, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let output = '';
  child.stdout!.on('data', (chunk: Buffer) => {
    stdout += chunk.toString('utf8');
    output += chunk.toString('utf8');
  });
  child.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString('utf8')));
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  return { process: child, stdout: () => stdout, output: () => output, exited };
}

async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 20_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe().catch(() => null);
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

/** A TCP relay whose connections can be cut at once (both sides destroyed, as a pulled cable would). */
async function startRelay(targetPort: number): Promise<{ port: number; cut(): number; close(): Promise<void> }> {
  const pairs = new Set<[net.Socket, net.Socket]>();
  const server = net.createServer((incoming) => {
    const outgoing = net.connect(targetPort, '127.0.0.1');
    const pair: [net.Socket, net.Socket] = [incoming, outgoing];
    pairs.add(pair);
    incoming.pipe(outgoing).pipe(incoming);
    const drop = () => {
      incoming.destroy();
      outgoing.destroy();
      pairs.delete(pair);
    };
    incoming.on('error', drop).on('close', drop);
    outgoing.on('error', drop).on('close', drop);
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return {
    port: (server.address() as net.AddressInfo).port,
    cut() {
      const count = pairs.size;
      for (const [incoming, outgoing] of pairs) {
        incoming.resetAndDestroy();
        outgoing.destroy();
      }
      pairs.clear();
      return count;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

interface CliDocument {
  sweepId: string;
  sessionId: string;
  mode: string;
  pointsSent: number;
  pointsAcknowledged: number;
  pointCount: number;
  reconnects: number;
  seconds: number;
}

describe('streaming through a cut socket and a killed server', () => {
  let database: TestDatabase;
  let db: pg.Client;
  let port: number;
  let server: Child | null = null;
  let baseUrl: string;
  let token: string;
  let revisionId: string;
  let tech: ReturnType<typeof request.agent>;
  const serverEnv = () => ({
    DATABASE_URL: database.url,
    PORT: String(port),
    HOST: '127.0.0.1',
    LOG_LEVEL: 'warn',
    // Nothing is mailed here; a port nobody listens on keeps the server from looking for a stand-in.
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
  });
  let smtpPort: number;

  const startApiServer = async () => {
    server = startChild(['server/main.ts'], serverEnv());
    const started = server;
    await waitFor(`the server on port ${port} (output: ${started.output()})`, async () => (await fetch(`${baseUrl}/api/health`)).ok);
  };
  const storedCounts = async (sessionId: string) => {
    const { rows } = await db.query(
      `SELECT count(*)::int AS total, count(DISTINCT p.sequence)::int AS distinct_sequences, coalesce(min(p.sequence), 0) AS lowest, coalesce(max(p.sequence), 0) AS highest
         FROM sweep_points p JOIN sweeps s ON s.id = p.sweep_id WHERE s.bench_session_id = $1`,
      [sessionId],
    );
    return rows[0] as { total: number; distinct_sequences: number; lowest: number; highest: number };
  };
  const expectStoredOnce = async (document: CliDocument, total: number, seed: number) => {
    const { rows } = await db.query('SELECT sequence, count(*)::int AS copies, min(frequency_hz) AS frequency FROM sweep_points WHERE sweep_id = $1 GROUP BY sequence ORDER BY sequence', [
      document.sweepId,
    ]);
    expect(rows).toHaveLength(total);
    expect(rows.every((row, index) => row.sequence === index + 1 && row.copies === 1)).toBe(true);
    // The stored readings are the simulated instrument's, point for point (defaults of `rejectra stream --simulate`).
    const expected = simulateAmplifierSweep({
      mode: 'common-mode',
      pointCount: total,
      startFrequencyHz: 10,
      stopFrequencyHz: 100e3,
      gain: 10,
      mismatchFraction: 0.001,
      opAmp: { openLoopGainDb: 120, gainBandwidthHz: 8e6, cmrrDb: 110, cmrrCornerHz: 2000 },
      noiseVolts: 1e-6,
      driveVolts: 1,
      seed,
    });
    expect(rows.every((row, index) => row.frequency === expected[index].frequencyHz)).toBe(true);
  };
  const newSession = async (unitSerial: string) =>
    (await tech.post('/api/sessions').send(sessionBody(revisionId, unitSerial)).expect(201)).body.session.id as string;
  const streamCli = (url: string, sessionId: string, seed: number, total: number) =>
    startChild(
      ['cli/main.ts', 'stream', '--url', url, '--session', sessionId, '--mode', 'common-mode', '--simulate', '--points', String(total), '--seed', String(seed), '--rate', '1500', '--batch', '50', '--json'],
      { REJECTRA_TOKEN: token },
    );

  beforeAll(async () => {
    database = await createTestDatabase();
    port = await freePort();
    smtpPort = await freePort();
    baseUrl = `http://127.0.0.1:${port}`;
    // The server migrates the new database as it starts; the demo accounts are then written here
    // (a seeding child process would add seconds, and the demo scenario is not needed).
    await startApiServer();
    db = new pg.Client({ connectionString: database.url });
    await db.connect();
    const passwordHash = await hashPassword(demoPassword);
    for (const account of demoAccounts) {
      await db.query(`INSERT INTO users (id, email, name, role, status, password_hash, created_at, updated_at) VALUES ($1, $2, $3, $4, 'active', $5, now(), now())`, [
        randomUUID(),
        account.email,
        account.name,
        account.role,
        passwordHash,
      ]);
    }
    const designer = request.agent(baseUrl).set('Origin', baseUrl);
    await designer.post('/api/auth/sign-in').send({ email: 'designer@rejectra.test', password: demoPassword }).expect(200);
    revisionId = (await designer.post('/api/designs').send(design).expect(201)).body.design.revisions[0].id;
    tech = request.agent(baseUrl).set('Origin', baseUrl);
    await tech.post('/api/auth/sign-in').send({ email: 'tech@rejectra.test', password: demoPassword }).expect(200);
    token = (await tech.post('/api/tokens').send({ name: 'durability bench' }).expect(201)).body.token.token;
  }, 60_000);

  afterAll(async () => {
    server?.process.kill('SIGKILL');
    await server?.exited;
    await db?.end();
    await database?.drop();
  });

  it('finishes a sweep whose socket is cut mid-stream: every point stored exactly once', async () => {
    const sessionId = await newSession('HRB204-0201');
    const relay = await startRelay(port);
    const total = 3000;
    const cli = streamCli(`http://127.0.0.1:${relay.port}`, sessionId, 11, total);
    const before = await waitFor('points to arrive', async () => {
      const counts = await storedCounts(sessionId);
      return counts.total >= 600 ? counts : null;
    });
    expect(relay.cut()).toBeGreaterThan(0);
    expect(before.total).toBeLessThan(total);
    const status = await cli.exited;
    await relay.close();
    expect(status, cli.output()).toBe(0);
    const document = JSON.parse(cli.stdout()) as CliDocument;
    expect(document).toMatchObject({ sessionId, mode: 'common-mode', pointsAcknowledged: total, pointCount: total });
    expect(document.reconnects).toBeGreaterThanOrEqual(1);
    expect(await storedCounts(sessionId)).toEqual({ total, distinct_sequences: total, lowest: 1, highest: total });
    await expectStoredOnce(document, total, 11);
  });

  it('finishes a sweep through a server killed with SIGKILL mid-stream and started again: every point stored exactly once', async () => {
    const sessionId = await newSession('HRB204-0202');
    const total = 3000;
    const cli = streamCli(baseUrl, sessionId, 12, total);
    const before = await waitFor('points to arrive', async () => {
      const counts = await storedCounts(sessionId);
      return counts.total >= 500 ? counts : null;
    });
    server!.process.kill('SIGKILL');
    await server!.exited;
    const atKill = await storedCounts(sessionId);
    expect(atKill.total).toBeLessThan(total);
    expect(atKill.total).toBeGreaterThanOrEqual(before.total);
    // Stored points are never duplicated, also right after the kill.
    expect(atKill.distinct_sequences).toBe(atKill.total);
    await startApiServer();
    const status = await cli.exited;
    expect(status, cli.output()).toBe(0);
    const document = JSON.parse(cli.stdout()) as CliDocument;
    expect(document).toMatchObject({ sessionId, pointsAcknowledged: total, pointCount: total });
    expect(document.reconnects).toBeGreaterThanOrEqual(1);
    expect(await storedCounts(sessionId)).toEqual({ total, distinct_sequences: total, lowest: 1, highest: total });
    await expectStoredOnce(document, total, 12);
  });
});
