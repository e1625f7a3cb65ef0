// The WebSocket endpoint /ws (protocol in docs/STREAMING.md): bench programs stream sweep points,
// browsers watch sessions. A point is acknowledged only after it is committed in PostgreSQL, and
// stored exactly once however often it is resent.
import { randomUUID } from 'node:crypto';
import type { IncomingMessage, Server } from 'node:http';
import type { Duplex } from 'node:stream';
import { WebSocketServer, type RawData, type WebSocket } from 'ws';
import { clientMessageSchema, maximumStreamMessageBytes, streamCloseCodes, type ServerMessage, type StreamPoint } from '../../shared/schemas/stream';
import type { AppContext } from '../app-context';
import { authenticateAccessToken } from '../auth/access-tokens';
import type { SessionUser } from '../auth/session-store';
import { AuditEvent, BenchSession, Sweep } from '../models';
import { contiguousThrough, insertPoints } from '../operations/sweep-points';
import type { HubMessage } from './session-hub';

interface OpenSweep {
  sweepId: string;
  sessionId: string;
  mode: 'differential' | 'common-mode';
  /** Every point 1…through is committed. */
  through: number;
  /** Committed points above `through` (arrived out of order). */
  above: Set<number>;
}

interface Connection {
  socket: WebSocket;
  user: SessionUser;
  sweeps: Map<string, OpenSweep>;
  queue: Promise<void>;
  alive: boolean;
}

class StreamRefusal extends Error {
  constructor(
    message: string,
    readonly closeCode: number,
  ) {
    super(message);
  }
}

const rank = { technician: 0, designer: 1, lead: 2 } as const;

function bearerToken(request: IncomingMessage): string | null {
  const header = request.headers.authorization;
  if (header?.startsWith('Bearer ')) return header.slice(7).trim();
  const url = new URL(request.url ?? '/', 'http://localhost');
  return url.searchParams.get('token');
}

export interface StreamServer {
  close(): Promise<void>;
  connectionCount(): number;
}

export function attachStreamServer(server: Server, context: AppContext): StreamServer {
  const sequelize = context.database.sequelize;
  // The protocol limit is checked by hand so the client gets a message before the close;
  // ws itself drops anything beyond four times that.
  const wss = new WebSocketServer({ noServer: true, maxPayload: maximumStreamMessageBytes * 4 });
  const connections = new Set<Connection>();

  const send = (socket: WebSocket, message: ServerMessage | HubMessage) => {
    if (socket.readyState === socket.OPEN) socket.send(JSON.stringify(message));
  };
  const refuse = (socket: WebSocket, message: string, code: number) => {
    send(socket, { type: 'error', message });
    socket.close(code, message.slice(0, 120));
  };

  async function identify(request: IncomingMessage): Promise<SessionUser | string> {
    const token = bearerToken(request);
    if (token) {
      const check = await authenticateAccessToken(token, context.now());
      return check.ok ? check.user : check.reason;
    }
    const sessionId = context.sessions.readSessionId(request.headers.cookie);
    if (!sessionId) return 'Sign in, or present a personal access token (Authorization: Bearer …)';
    const origin = request.headers.origin;
    if (origin && new URL(origin).host !== request.headers.host && new URL(origin).origin !== new URL(context.config.appUrl).origin) {
      return 'Refused: the connection did not come from a Rejectra page';
    }
    const validated = await context.sessions.validate(sessionId);
    if (!validated || validated.user.status !== 'active') return 'Your session has ended; sign in again';
    return validated.user;
  }

  async function writableSession(user: SessionUser, sessionId: string): Promise<BenchSession> {
    const session = await BenchSession.findByPk(sessionId);
    if (!session) throw new StreamRefusal(`No bench session ${sessionId}`, streamCloseCodes.notFound);
    if (session.status === 'archived') throw new StreamRefusal('This bench session is archived; sweeps cannot be added', streamCloseCodes.forbidden);
    if (rank[user.role] < rank.designer && session.operatorId !== user.id) {
      throw new StreamRefusal('You may not write to this bench session: it was started by another technician', streamCloseCodes.forbidden);
    }
    return session;
  }

  async function handle(connection: Connection, data: RawData): Promise<void> {
    const size = Array.isArray(data) ? data.reduce((sum, part) => sum + part.length, 0) : (data as Buffer).byteLength;
    if (size > maximumStreamMessageBytes) {
      throw new StreamRefusal(`Message of ${size} bytes is larger than the ${maximumStreamMessageBytes} allowed; send fewer points per message`, streamCloseCodes.messageTooBig);
    }
    let json: unknown;
    try {
      json = JSON.parse(data.toString());
    } catch {
      throw new StreamRefusal('Message is not valid JSON', streamCloseCodes.badMessage);
    }
    const parsed = clientMessageSchema.safeParse(json);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      throw new StreamRefusal(`Malformed message: ${issue.path.join('.') || 'message'}: ${issue.message}`, streamCloseCodes.badMessage);
    }
    const message = parsed.data;
    const { socket, user } = connection;

    switch (message.type) {
      case 'open-sweep': {
        await writableSession(user, message.sessionId);
        let sweep = await Sweep.findOne({ where: { benchSessionId: message.sessionId, clientKey: message.key } });
        if (sweep) {
          if (sweep.mode !== message.mode) throw new StreamRefusal(`Sweep key "${message.key}" belongs to a ${sweep.mode} sweep`, streamCloseCodes.badMessage);
          if (sweep.deletedAt) throw new StreamRefusal(`Sweep key "${message.key}" belongs to a deleted sweep; use a new key`, streamCloseCodes.forbidden);
        } else {
          sweep = await sequelize.transaction(async (transaction) => {
            const created = await Sweep.create(
              {
                id: randomUUID(),
                benchSessionId: message.sessionId,
                mode: message.mode,
                source: 'stream',
                sourceName: message.sourceName || 'live stream',
                clientKey: message.key,
                amplitudeConvention: message.amplitudeConvention,
                state: 'streaming',
                createdById: user.id,
                deletedAt: null,
                deletedById: null,
                deleteReason: null,
              },
              { transaction },
            );
            await AuditEvent.create(
              { actorId: user.id, action: 'sweep-added', subjectType: 'sweep', subjectId: created.id, details: { sessionId: message.sessionId, mode: message.mode, source: 'stream' } },
              { transaction },
            );
            return created;
          });
          context.hub.publish(message.sessionId, { type: 'session-changed', sessionId: message.sessionId, reason: 'sweep-added' });
        }
        const through = await contiguousThrough(sequelize, sweep.id);
        connection.sweeps.set(sweep.id, { sweepId: sweep.id, sessionId: message.sessionId, mode: sweep.mode, through, above: new Set() });
        send(socket, { type: 'sweep-opened', sweepId: sweep.id, sessionId: message.sessionId, mode: sweep.mode, acknowledgedThrough: through });
        return;
      }
      case 'points': {
        const open = connection.sweeps.get(message.sweepId);
        if (!open) throw new StreamRefusal(`Sweep ${message.sweepId} is not open on this connection: send open-sweep first`, streamCloseCodes.badMessage);
        const points = message.points as StreamPoint[];
        const rows = points.map((point) => ({
          sequence: point.seq,
          frequencyHz: point.frequencyHz,
          vinV: point.vinV,
          voutV: point.voutV,
          phaseDeg: point.phaseDeg ?? null,
          floorV: point.floorV ?? null,
          sourceLine: null,
        }));
        // One statement, its own implicit transaction: committed when it returns.
        await insertPoints(sequelize, open.sweepId, rows);
        // An in-order batch (the usual case) moves `through` without going through the set.
        let inOrder = open.above.size === 0 && points[0].seq <= open.through + 1;
        for (let index = 1; inOrder && index < points.length; index++) inOrder = points[index].seq === points[index - 1].seq + 1;
        if (inOrder) {
          open.through = Math.max(open.through, points[points.length - 1].seq);
        } else {
          for (const point of points) if (point.seq > open.through) open.above.add(point.seq);
          while (open.above.has(open.through + 1)) {
            open.above.delete(open.through + 1);
            open.through += 1;
          }
        }
        send(socket, { type: 'ack', sweepId: open.sweepId, through: open.through });
        // Copying the batch for viewers costs allocations a stream with nobody watching does not need.
        if (context.hub.viewerCount(open.sessionId) > 0) {
          context.hub.publish(open.sessionId, {
            type: 'session-points',
            sessionId: open.sessionId,
            sweepId: open.sweepId,
            mode: open.mode,
            points: points.map((point) => ({ seq: point.seq, frequencyHz: point.frequencyHz, vinV: point.vinV, voutV: point.voutV, phaseDeg: point.phaseDeg ?? null, floorV: point.floorV ?? null })),
          });
        }
        context.hub.requestRefit(open.sessionId);
        return;
      }
      case 'close-sweep': {
        const open = connection.sweeps.get(message.sweepId);
        if (!open) throw new StreamRefusal(`Sweep ${message.sweepId} is not open on this connection`, streamCloseCodes.badMessage);
        await Sweep.update({ state: 'complete' }, { where: { id: open.sweepId } });
        const pointCount = await contiguousThrough(sequelize, open.sweepId);
        connection.sweeps.delete(open.sweepId);
        send(socket, { type: 'sweep-closed', sweepId: open.sweepId, pointCount });
        context.hub.publish(open.sessionId, { type: 'session-changed', sessionId: open.sessionId, reason: 'sweep-closed' });
        context.hub.requestRefit(open.sessionId);
        return;
      }
      case 'subscribe': {
        if (!(await BenchSession.findByPk(message.sessionId))) throw new StreamRefusal(`No bench session ${message.sessionId}`, streamCloseCodes.notFound);
        context.hub.subscribe(message.sessionId, socket);
        send(socket, { type: 'subscribed', sessionId: message.sessionId });
        // No refit here: a viewer reads the current analysis over REST when it opens the session,
        // and a refit of a long session is seconds of server work; refits follow new points.
        return;
      }
      case 'unsubscribe': {
        context.hub.unsubscribe(message.sessionId, socket);
        return;
      }
    }
  }

  const onUpgrade = (request: IncomingMessage, socket: Duplex, head: Buffer) => {
    if (new URL(request.url ?? '/', 'http://localhost').pathname !== '/ws') {
      socket.destroy();
      return;
    }
    wss.handleUpgrade(request, socket, head, (ws) => {
      void identify(request)
        .then((identity) => {
          if (typeof identity === 'string') return refuse(ws, identity, streamCloseCodes.unauthorized);
          const connection: Connection = { socket: ws, user: identity, sweeps: new Map(), queue: Promise.resolve(), alive: true };
          connections.add(connection);
          ws.on('pong', () => (connection.alive = true));
          ws.on('message', (data) => {
            // Messages of one connection are handled in order, so acknowledgements are too.
            connection.queue = connection.queue
              .then(() => handle(connection, data))
              .catch((error: unknown) => {
                if (error instanceof StreamRefusal) return refuse(ws, error.message, error.closeCode);
                context.logger.error({ err: error }, 'stream message failed');
                refuse(ws, 'Internal error while handling the message; reconnect and resend what was not acknowledged', 1011);
              });
          });
          ws.on('close', () => {
            connections.delete(connection);
            context.hub.drop(ws);
          });
          send(ws, { type: 'ready', user: { name: identity.name, role: identity.role } });
        })
        .catch((error: unknown) => {
          context.logger.error({ err: error }, 'stream authentication failed');
          refuse(ws, 'Internal error while checking who you are', 1011);
        });
    });
  };
  server.on('upgrade', onUpgrade);

  const heartbeat = setInterval(() => {
    for (const connection of connections) {
      if (!connection.alive) {
        connection.socket.terminate();
        continue;
      }
      connection.alive = false;
      connection.socket.ping();
    }
  }, 30_000);
  heartbeat.unref();

  return {
    connectionCount: () => connections.size,
    async close() {
      clearInterval(heartbeat);
      server.off('upgrade', onUpgrade);
      for (const connection of connections) connection.socket.close(1001, 'Server is stopping; reconnect and resend what was not acknowledged');
      await new Promise<void>((resolve) => wss.close(() => resolve()));
    },
  };
}
