import { useQuery } from '@tanstack/react-query';
import type { MonteCarloBandPoint } from '../../../../shared/analysis/prediction-band';
import type { Circuit } from '../../../../shared/schemas/designs';
import { monteCarloBandGrid } from '../components/analysis-figures';
import type { MonteCarloBandReply, MonteCarloBandRequest } from '../workers/monte-carlo-band.worker';

/** Trials of the session view's band: 10,000 puts the 5th and 95th percentiles within about 0.1 dB (common practice, no source). */
export const SESSION_BAND_TRIALS = 10_000;
const SESSION_BAND_SEED = 1;

let worker: Worker | null = null;
let nextRequestId = 1;
const pending = new Map<number, { resolve: (points: MonteCarloBandPoint[]) => void; reject: (error: Error) => void }>();

function bandWorker(): Worker {
  if (worker) return worker;
  worker = new Worker(new URL('../workers/monte-carlo-band.worker.ts', import.meta.url), { type: 'module' });
  worker.onmessage = (event: MessageEvent<MonteCarloBandReply>) => {
    const waiting = pending.get(event.data.id);
    if (!waiting) return;
    pending.delete(event.data.id);
    if ('error' in event.data) waiting.reject(new Error(event.data.error));
    else waiting.resolve(event.data.points);
  };
  worker.onerror = (event) => {
    for (const waiting of pending.values()) waiting.reject(new Error(`The Monte Carlo worker failed: ${event.message}`));
    pending.clear();
    worker?.terminate();
    worker = null;
  };
  return worker;
}

/** The band of a circuit at some frequencies, computed in the shared worker. */
export function computeMonteCarloBand(circuit: Circuit, frequenciesHz: number[]): Promise<MonteCarloBandPoint[]> {
  const id = nextRequestId++;
  const request: MonteCarloBandRequest = { id, circuit, frequenciesHz, trials: SESSION_BAND_TRIALS, seed: SESSION_BAND_SEED };
  return new Promise((resolve, reject) => {
    pending.set(id, { resolve, reject });
    bandWorker().postMessage(request);
  });
}

/**
 * The design revision's Monte Carlo 5–95 % band over whole decades around the measured range, from
 * a Web Worker. Cached per revision and decade span (revisions never change once stored), so a
 * live refit or reopening another unit of the same revision does not recompute it.
 */
export function useMonteCarloBand(revisionId: string, circuit: Circuit | null, rangeHz: [number, number] | null) {
  const grid = rangeHz ? monteCarloBandGrid(rangeHz[0], rangeHz[1]) : null;
  return useQuery({
    queryKey: ['session-analysis', 'monte-carlo-band', revisionId, grid?.firstDecade ?? null, grid?.lastDecade ?? null, SESSION_BAND_TRIALS],
    queryFn: () => computeMonteCarloBand(circuit as Circuit, grid!.frequenciesHz),
    enabled: circuit !== null && grid !== null,
    staleTime: Infinity,
    gcTime: 60 * 60 * 1000,
    retry: false,
  });
}
