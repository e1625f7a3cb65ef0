/// <reference lib="webworker" />
// The tolerance explorer's Monte Carlo, off the page's thread. Each request first answers at its
// frequency (100,000 trials in a few tens of ms), then computes the band frequency by frequency,
// yielding between frequencies so a newer request can arrive and the stale band is dropped.
import type { ExplorerBandPoint, MonteCarloResponse, MonteCarloRunRequest } from './monte-carlo-protocol';
import { TrialScratch } from '../../shared/analysis/trial-scratch';
import { BandRun, errorResponse, runAtFrequency } from './monte-carlo-runner';

const scope = self as unknown as DedicatedWorkerGlobalScope;
let newestRunId = 0;
/** The last band computed in full: a run that changes only the histogram's frequency or limit reuses it. */
let lastBand: { key: string; points: ExplorerBandPoint[] } | null = null;
// Arrays kept between runs (allocating ~7 MB a run cost more than the run). Two sets: a band in
// progress keeps its trials while a newer request's at-frequency step runs.
const atFrequencyScratch = new TrialScratch();
const bandScratch = new TrialScratch();

function bandKey(request: MonteCarloRunRequest): string {
  return JSON.stringify([request.circuit, request.bandFrequenciesHz, request.bandTrials, request.seed]);
}

// A zero-delay yield: a message to ourselves runs after any message already queued for us
// (setTimeout(0) would be clamped to 4 ms after a few nestings).
const channel = new MessageChannel();
const waiting: (() => void)[] = [];
channel.port1.onmessage = () => waiting.shift()?.();
function yieldToMessages(): Promise<void> {
  return new Promise((resolve) => {
    waiting.push(resolve);
    channel.port2.postMessage(null);
  });
}

function send(message: MonteCarloResponse): void {
  scope.postMessage(message);
}

async function run(request: MonteCarloRunRequest): Promise<void> {
  try {
    const started = performance.now();
    const result = runAtFrequency(request, atFrequencyScratch);
    send({ type: 'at-frequency', runId: request.runId, result, computeMs: performance.now() - started });
    await yieldToMessages();
    if (request.runId !== newestRunId || request.bandFrequenciesHz.length === 0) return;
    const key = bandKey(request);
    if (lastBand?.key === key) {
      send({ type: 'band', runId: request.runId, points: lastBand.points, computeMs: 0 });
      return;
    }
    const bandStarted = performance.now();
    const band = new BandRun(request, bandScratch);
    while (!band.done) {
      band.step();
      if (band.points.length % 4 === 0 || band.done) {
        send({ type: 'band-progress', runId: request.runId, done: band.points.length, total: band.total });
        await yieldToMessages();
        if (request.runId !== newestRunId) return;
      }
    }
    lastBand = { key, points: band.points };
    send({ type: 'band', runId: request.runId, points: band.points, computeMs: performance.now() - bandStarted });
  } catch (error) {
    send(errorResponse(request.runId, error));
  }
}

// Requests that arrive together (the page posts at most one while a run is at its first step,
// but a burst can still queue) collapse to the newest one.
let queued: MonteCarloRunRequest | null = null;
scope.onmessage = (event: MessageEvent<MonteCarloRunRequest>) => {
  if (event.data?.type !== 'run' || event.data.runId < newestRunId) return;
  newestRunId = event.data.runId;
  const alreadyScheduled = queued !== null;
  queued = event.data;
  if (alreadyScheduled) return;
  void yieldToMessages().then(() => {
    const next = queued!;
    queued = null;
    if (next.runId === newestRunId) return run(next);
  });
};
