// The bench side of the live-streaming protocol (docs/STREAMING.md): opens a sweep, sends numbered
// points in batches at the instrument's pace, keeps every point until an ack covers it, and after a
// dropped connection or a server restart reconnects with backoff and resends from the server's
// acknowledgedThrough + 1. Refusals the server states (bad token, forbidden or missing session,
// malformed message) are final: they end the stream with the server's own message.
import WebSocket from 'ws';

/**
 * Most points one `points` message may carry: the protocol's limit, `maximumPointsPerMessage` of
 * shared/schemas/stream.ts (tests/cli/stream.test.ts checks they agree). Not imported from there:
 * that module loads zod, which would double the CLI's start-up time.
 */
export const maximumPointsPerMessage = 5000;

/** One reading to stream; `seq` is its index + 1 in the points array. */
export interface ReadingToStream {
  frequencyHz: number;
  vinV: number;
  voutV: number;
  phaseDeg?: number | null;
  floorV?: number | null;
}

export interface StreamSweepOptions {
  /** Server base address: http(s)://host:port (or ws(s)://…; `/ws` is added when missing). */
  url: string;
  /** Personal access token (`rjt_…`). */
  token: string;
  sessionId: string;
  mode: 'differential' | 'common-mode';
  /** Unique within the session: opening the same key again resumes the same sweep. */
  key: string;
  sourceName: string;
  amplitudeConvention: 'rms' | 'peak';
  points: readonly ReadingToStream[];
  /** Points the instrument produces per second; null sends as fast as acknowledgements allow. */
  ratePointsPerSecond: number | null;
  /** Points per `points` message (1 … 5,000). */
  batchSize: number;
  /** Batches sent and not yet acknowledged, at most (default 8). */
  maximumBatchesInFlight?: number;
  /** Give up when no connection could be opened for this long, ms (default 60 s). */
  retryForMs?: number;
  /** Reconnect when the server says nothing for this long while points await an ack, ms (default 20 s). */
  silenceTimeoutMs?: number;
  /** Told about reconnects and other events worth a line on the console. */
  onNotice?: (text: string) => void;
  /** Called right after each batch is handed to the socket (for latency measurements). */
  onBatchSent?: (firstSeq: number, lastSeq: number) => void;
}

export interface StreamProgress {
  /** Points written to the socket, resends included. */
  pointsSent: number;
  /** Every point 1…pointsAcknowledged is committed on the server. */
  pointsAcknowledged: number;
  total: number;
  reconnects: number;
  seconds: number;
}

export interface StreamResult extends StreamProgress {
  sweepId: string;
  sessionId: string;
  mode: 'differential' | 'common-mode';
  /** Points stored in the sweep when it was closed (the server's count). */
  pointCount: number;
}

/** A refusal the server stated (or an address that is no streaming endpoint): retrying will not help. */
export class StreamRefusedError extends Error {
  constructor(
    message: string,
    readonly closeCode: number | null,
  ) {
    super(message);
    this.name = 'StreamRefusedError';
  }
}

/** Close codes after which reconnecting cannot succeed (docs/STREAMING.md, "Errors"). */
const finalCloseCodes = new Map<number, string>([
  [4400, 'malformed message'],
  [4401, 'not authenticated'],
  [4403, 'not allowed'],
  [4404, 'not found'],
  [1008, 'policy violation'],
  [1009, 'message too big'],
]);

/** The WebSocket address of the server's /ws endpoint. */
export function streamEndpoint(url: string): string {
  const parsed = new URL(url);
  if (parsed.protocol === 'http:') parsed.protocol = 'ws:';
  else if (parsed.protocol === 'https:') parsed.protocol = 'wss:';
  else if (parsed.protocol !== 'ws:' && parsed.protocol !== 'wss:') throw new Error(`--url must be an http(s) or ws(s) address, got "${url}"`);
  if (!parsed.pathname.endsWith('/ws')) parsed.pathname = `${parsed.pathname.replace(/\/+$/, '')}/ws`;
  return parsed.toString();
}

/** Streams one sweep to the end (close-sweep acknowledged). Rejects with StreamRefusedError or Error. */
export function streamSweep(options: StreamSweepOptions): { done: Promise<StreamResult>; progress(): StreamProgress; cancel(): void } {
  const total = options.points.length;
  const batchSize = Math.min(Math.max(1, Math.floor(options.batchSize)), maximumPointsPerMessage);
  const maximumInFlight = options.maximumBatchesInFlight ?? 8;
  const retryForMs = options.retryForMs ?? 60_000;
  const silenceTimeoutMs = options.silenceTimeoutMs ?? 20_000;
  const endpoint = streamEndpoint(options.url);
  const notice = options.onNotice ?? (() => undefined);

  const startedAt = performance.now();
  let acknowledged = 0;
  let pointsSent = 0;
  let reconnects = 0;
  let sweepId: string | null = null;
  let finished = false;
  let socket: WebSocket | null = null;
  let lastError: string | null = null;
  let failedAttempts = 0;
  /** When the current run of failed connections began (null while connected and streaming). */
  let failingSince: number | null = null;
  let pumpTimer: NodeJS.Timeout | null = null;
  let retryTimer: NodeJS.Timeout | null = null;
  let silenceTimer: NodeJS.Timeout | null = null;

  // Per connection: next seq to send, seqs that end batches still awaiting an ack, close sent.
  let nextSeq = 1;
  let batchEnds: number[] = [];
  let closeSent = false;
  let opened = false;

  let resolve!: (result: StreamResult) => void;
  let reject!: (error: Error) => void;
  const done = new Promise<StreamResult>((resolvePromise, rejectPromise) => {
    resolve = resolvePromise;
    reject = rejectPromise;
  });

  const seconds = () => (performance.now() - startedAt) / 1000;
  const progress = (): StreamProgress => ({ pointsSent, pointsAcknowledged: acknowledged, total, reconnects, seconds: seconds() });

  const clearTimers = () => {
    for (const timer of [pumpTimer, retryTimer, silenceTimer]) if (timer) clearTimeout(timer);
    pumpTimer = retryTimer = silenceTimer = null;
  };
  const finish = (outcome: { result: StreamResult } | { error: Error }) => {
    if (finished) return;
    finished = true;
    clearTimers();
    if (socket && socket.readyState !== WebSocket.CLOSED) socket.close(1000, 'done');
    if ('result' in outcome) resolve(outcome.result);
    else reject(outcome.error);
  };

  /** How many points the instrument has produced by now (all of them without a rate). */
  const available = () => (options.ratePointsPerSecond ? Math.min(total, Math.floor((seconds() * options.ratePointsPerSecond) + 1e-9)) : total);

  const armSilenceTimer = () => {
    if (silenceTimer) clearTimeout(silenceTimer);
    silenceTimer = null;
    if (finished || !socket) return;
    if (batchEnds.length === 0 && !closeSent && opened) return;
    const watched = socket;
    silenceTimer = setTimeout(() => {
      notice(`no answer from the server for ${Math.round(silenceTimeoutMs / 1000)} s; reconnecting`);
      watched.terminate();
    }, silenceTimeoutMs);
  };

  const send = (message: unknown) => socket!.send(JSON.stringify(message));

  const pump = () => {
    if (pumpTimer) clearTimeout(pumpTimer);
    pumpTimer = null;
    if (finished || !socket || socket.readyState !== WebSocket.OPEN || !opened || sweepId === null) return;
    while (batchEnds.length < maximumInFlight && nextSeq <= total) {
      const ready = available();
      const wanted = Math.min(batchSize, total - nextSeq + 1);
      if (ready - nextSeq + 1 < wanted) {
        // Wait until the instrument has produced a whole batch.
        const dueSeconds = (nextSeq + wanted - 1) / options.ratePointsPerSecond!;
        pumpTimer = setTimeout(pump, Math.max(1, (dueSeconds - seconds()) * 1000));
        return;
      }
      const last = nextSeq + wanted - 1;
      const batch = new Array<object>(wanted);
      for (let seq = nextSeq; seq <= last; seq++) {
        const point = options.points[seq - 1];
        batch[seq - nextSeq] = {
          seq,
          frequencyHz: point.frequencyHz,
          vinV: point.vinV,
          voutV: point.voutV,
          ...(point.phaseDeg !== undefined && point.phaseDeg !== null ? { phaseDeg: point.phaseDeg } : {}),
          ...(point.floorV !== undefined && point.floorV !== null ? { floorV: point.floorV } : {}),
        };
      }
      send({ type: 'points', sweepId, points: batch });
      options.onBatchSent?.(nextSeq, last);
      pointsSent += wanted;
      batchEnds.push(last);
      nextSeq = last + 1;
      armSilenceTimer();
    }
    if (acknowledged >= total && !closeSent) {
      closeSent = true;
      send({ type: 'close-sweep', sweepId });
      armSilenceTimer();
    }
  };

  const scheduleReconnect = (why: string) => {
    if (finished) return;
    failingSince ??= performance.now();
    if (performance.now() - failingSince > retryForMs) {
      finish({ error: new Error(`gave up after ${Math.round(retryForMs / 1000)} s without a working connection to ${endpoint}: ${why}`) });
      return;
    }
    const delayMs = Math.min(2000, 100 * 2 ** failedAttempts) * (0.5 + Math.random() / 2);
    failedAttempts += 1;
    notice(`${why}; reconnecting in ${(delayMs / 1000).toFixed(1)} s (acknowledged ${acknowledged} of ${total})`);
    retryTimer = setTimeout(() => {
      retryTimer = null;
      reconnects += 1;
      connect();
    }, delayMs);
  };

  const connect = () => {
    nextSeq = acknowledged + 1;
    batchEnds = [];
    closeSent = false;
    opened = false;
    lastError = null;
    const current = new WebSocket(endpoint, { headers: { Authorization: `Bearer ${options.token}` }, handshakeTimeout: 10_000 });
    socket = current;
    let httpRefusal: string | null = null;

    current.on('unexpected-response', (_request, response) => {
      const status = response.statusCode ?? 0;
      httpRefusal = `the server answered HTTP ${status} instead of opening a WebSocket at ${endpoint}`;
      current.terminate();
      if (status >= 500) httpRefusal = null;
    });
    current.on('open', armSilenceTimer);
    current.on('error', (error) => {
      lastError = lastError ?? error.message;
    });
    current.on('message', (data) => {
      if (current !== socket || finished) return;
      let message: { type?: string; [field: string]: unknown };
      try {
        message = JSON.parse(data.toString()) as typeof message;
      } catch {
        return;
      }
      switch (message.type) {
        case 'ready':
          send({ type: 'open-sweep', sessionId: options.sessionId, mode: options.mode, key: options.key, amplitudeConvention: options.amplitudeConvention, sourceName: options.sourceName });
          armSilenceTimer();
          return;
        case 'sweep-opened': {
          sweepId = String(message.sweepId);
          const through = Number(message.acknowledgedThrough);
          acknowledged = Math.max(acknowledged, through);
          nextSeq = through + 1;
          opened = true;
          failedAttempts = 0;
          failingSince = null;
          armSilenceTimer();
          pump();
          return;
        }
        case 'ack': {
          const through = Number(message.through);
          if (through > acknowledged) acknowledged = through;
          batchEnds = batchEnds.filter((end) => end > through);
          armSilenceTimer();
          pump();
          return;
        }
        case 'sweep-closed':
          finish({ result: { ...progress(), sweepId: sweepId!, sessionId: options.sessionId, mode: options.mode, pointCount: Number(message.pointCount) } });
          return;
        case 'error':
          lastError = String(message.message);
          return;
        default:
          return;
      }
    });
    current.on('close', (code, reasonBuffer) => {
      if (current !== socket || finished) return;
      if (silenceTimer) clearTimeout(silenceTimer);
      if (pumpTimer) clearTimeout(pumpTimer);
      silenceTimer = pumpTimer = null;
      const reason = lastError ?? (reasonBuffer.toString() || null);
      if (httpRefusal) {
        finish({ error: new StreamRefusedError(httpRefusal, null) });
        return;
      }
      const finalMeaning = finalCloseCodes.get(code);
      if (finalMeaning) {
        finish({ error: new StreamRefusedError(`refused by the server (${code}, ${finalMeaning}): ${reason ?? 'no reason given'}`, code) });
        return;
      }
      const why = code === 1006 ? `connection lost${reason ? ` (${reason})` : ''}` : `the server closed the connection (${code}${reason ? `: ${reason}` : ''})`;
      scheduleReconnect(why);
    });
  };

  connect();
  return {
    done,
    progress,
    cancel: () => finish({ error: new Error('cancelled') }),
  };
}
