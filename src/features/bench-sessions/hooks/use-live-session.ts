import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import { streamCloseCodes, type ServerMessage } from '../../../../shared/schemas/stream';
import type { SweepSummary } from '../../../../shared/schemas/sweeps';
import { analysisQueryKey } from '../api/get-analysis';
import { sessionQueryKey } from '../api/get-session';
import { sweepPointsQueryKey } from '../api/get-sweep-points';
import { sweepsQueryKey } from '../api/get-sweeps';

export type LiveState =
  | { status: 'connecting' }
  | { status: 'live'; lastPointAt: number | null }
  | { status: 'reconnecting'; retryInSeconds: number }
  | { status: 'stopped'; message: string };

// Closes the server means for good: signed out, not allowed, no such session.
const finalCloseCodes = new Set<number>([streamCloseCodes.unauthorized, streamCloseCodes.forbidden, streamCloseCodes.notFound]);
const longestRetryMilliseconds = 10_000;
const pointsRefreshMilliseconds = 400;

type SessionPoints = Extract<ServerMessage, { type: 'session-points' }>;

/** Folds a live batch into the cached sweep list: count (seq numbers the points) and frequency range. */
export function applyLivePoints(sweeps: SweepSummary[], message: SessionPoints): SweepSummary[] | null {
  const index = sweeps.findIndex((sweep) => sweep.id === message.sweepId);
  if (index < 0) return null;
  const sweep = sweeps[index];
  let highestSeq = sweep.pointCount;
  let [low, high] = sweep.frequencyRangeHz ?? [Infinity, -Infinity];
  for (const point of message.points) {
    highestSeq = Math.max(highestSeq, point.seq);
    low = Math.min(low, point.frequencyHz);
    high = Math.max(high, point.frequencyHz);
  }
  const next = [...sweeps];
  next[index] = { ...sweep, pointCount: highestSeq, frequencyRangeHz: Number.isFinite(low) ? [low, high] : sweep.frequencyRangeHz };
  return next;
}

function handleMessage(queryClient: QueryClient, sessionId: string, message: ServerMessage, refreshPoints: (sweepId: string) => void): void {
  switch (message.type) {
    case 'session-points': {
      const key = sweepsQueryKey(sessionId);
      const cached = queryClient.getQueryData<{ sweeps: SweepSummary[] }>(key);
      const updated = cached ? applyLivePoints(cached.sweeps, message) : null;
      if (updated) queryClient.setQueryData(key, { sweeps: updated });
      else void queryClient.invalidateQueries({ queryKey: key });
      refreshPoints(message.sweepId);
      return;
    }
    case 'session-analysis':
      queryClient.setQueryData<{ analysis: SessionAnalysis }>(analysisQueryKey(sessionId), { analysis: message.analysis });
      return;
    case 'session-changed':
      void queryClient.invalidateQueries({ queryKey: sessionQueryKey(sessionId) });
      return;
    default:
      return;
  }
}

/**
 * Watches a bench session over the /ws socket (the browser's session cookie signs it in): points,
 * refits and changes land in the query cache as they arrive. Reconnects with a growing pause
 * (1 s, 2 s, 4 s… up to 10 s) when the connection drops, and catches up by refetching.
 */
export function useLiveSession(sessionId: string): LiveState {
  const queryClient = useQueryClient();
  const [state, setState] = useState<LiveState>({ status: 'connecting' });

  useEffect(() => {
    let socket: WebSocket | null = null;
    let stopped = false;
    let attempt = 0;
    let retryTimer: ReturnType<typeof setTimeout> | undefined;
    const pendingRefresh = new Map<string, ReturnType<typeof setTimeout>>();

    // Points arrive in bursts; refetch an open points table at most every 400 ms per sweep.
    const refreshPoints = (sweepId: string) => {
      if (pendingRefresh.has(sweepId)) return;
      pendingRefresh.set(
        sweepId,
        setTimeout(() => {
          pendingRefresh.delete(sweepId);
          void queryClient.invalidateQueries({ queryKey: sweepPointsQueryKey(sessionId, sweepId) });
        }, pointsRefreshMilliseconds),
      );
    };

    let subscribedBefore = false;
    function connect() {
      const protocol = window.location.protocol === 'https:' ? 'wss' : 'ws';
      socket = new WebSocket(`${protocol}://${window.location.host}/ws`);
      const current = socket;
      current.onmessage = (event) => {
        let message: ServerMessage;
        try {
          message = JSON.parse(String(event.data)) as ServerMessage;
        } catch {
          return;
        }
        if (message.type === 'ready') {
          current.send(JSON.stringify({ type: 'subscribe', sessionId }));
        } else if (message.type === 'subscribed') {
          attempt = 0;
          setState({ status: 'live', lastPointAt: null });
          // After a reconnect, read once whatever happened while we were away. On the first
          // subscription the page has just read it all, and the server sends a refit anyway.
          if (subscribedBefore) void queryClient.invalidateQueries({ queryKey: sessionQueryKey(sessionId) });
          subscribedBefore = true;
        } else if (message.type === 'error') {
          setState({ status: 'stopped', message: message.message });
        } else {
          if (message.type === 'session-points') setState({ status: 'live', lastPointAt: Date.now() });
          handleMessage(queryClient, sessionId, message, refreshPoints);
        }
      };
      current.onclose = (event) => {
        if (stopped) return;
        if (finalCloseCodes.has(event.code)) {
          setState({ status: 'stopped', message: event.reason || 'The server ended the live connection.' });
          return;
        }
        const delay = Math.min(1000 * 2 ** attempt, longestRetryMilliseconds);
        attempt += 1;
        setState({ status: 'reconnecting', retryInSeconds: Math.round(delay / 1000) });
        retryTimer = setTimeout(connect, delay);
      };
    }

    connect();
    return () => {
      stopped = true;
      clearTimeout(retryTimer);
      for (const timer of pendingRefresh.values()) clearTimeout(timer);
      socket?.close();
    };
  }, [sessionId, queryClient]);

  return state;
}
