// Who is watching which bench session, and what they are sent: new points as they are
// committed, and the engine's refit, recomputed at most a few times a second per session.
import type { WebSocket } from 'ws';
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { ServerMessage } from '../../shared/schemas/stream';

export type HubMessage = ServerMessage;

export interface SessionHub {
  subscribe(sessionId: string, socket: WebSocket): void;
  unsubscribe(sessionId: string, socket: WebSocket): void;
  /** Removes a socket from every session (on close). */
  drop(socket: WebSocket): void;
  publish(sessionId: string, message: HubMessage): void;
  /** Asks for a refit; runs at once if none ran recently, else once the interval has passed. */
  requestRefit(sessionId: string): void;
  viewerCount(sessionId: string): number;
  close(): void;
}

export function createSessionHub(options: { refit: (sessionId: string) => Promise<SessionAnalysis | null>; refitIntervalMs: number; onError: (error: unknown) => void }): SessionHub {
  const viewers = new Map<string, Set<WebSocket>>();
  const refitState = new Map<string, { running: boolean; pending: boolean; timer: NodeJS.Timeout | null; lastRunAt: number }>();

  const send = (socket: WebSocket, text: string) => {
    if (socket.readyState === socket.OPEN) socket.send(text);
  };

  const publish = (sessionId: string, message: HubMessage) => {
    const sockets = viewers.get(sessionId);
    if (!sockets || sockets.size === 0) return;
    const text = JSON.stringify(message);
    for (const socket of sockets) send(socket, text);
  };

  const runRefit = async (sessionId: string) => {
    const state = refitState.get(sessionId)!;
    state.running = true;
    state.pending = false;
    state.lastRunAt = Date.now();
    try {
      const analysis = await options.refit(sessionId);
      if (analysis) publish(sessionId, { type: 'session-analysis', sessionId, analysis });
    } catch (error) {
      options.onError(error);
    } finally {
      state.running = false;
      if (state.pending) schedule(sessionId);
    }
  };

  const schedule = (sessionId: string) => {
    const state = refitState.get(sessionId) ?? { running: false, pending: false, timer: null, lastRunAt: 0 };
    refitState.set(sessionId, state);
    state.pending = true;
    if (state.running || state.timer) return;
    const wait = Math.max(0, state.lastRunAt + options.refitIntervalMs - Date.now());
    state.timer = setTimeout(() => {
      state.timer = null;
      void runRefit(sessionId);
    }, wait);
  };

  return {
    subscribe(sessionId, socket) {
      const sockets = viewers.get(sessionId) ?? new Set();
      sockets.add(socket);
      viewers.set(sessionId, sockets);
    },
    unsubscribe(sessionId, socket) {
      viewers.get(sessionId)?.delete(socket);
    },
    drop(socket) {
      for (const sockets of viewers.values()) sockets.delete(socket);
    },
    publish,
    requestRefit(sessionId) {
      if ((viewers.get(sessionId)?.size ?? 0) === 0) return;
      schedule(sessionId);
    },
    viewerCount: (sessionId) => viewers.get(sessionId)?.size ?? 0,
    close() {
      for (const state of refitState.values()) if (state.timer) clearTimeout(state.timer);
      refitState.clear();
      viewers.clear();
    },
  };
}
