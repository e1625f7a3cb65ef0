// Computes a design's Monte Carlo CMRR band off the page's main thread (issue 5: the session view
// must not stall while thousands of trials are solved).
import { monteCarloCmrrBand } from '../../../../shared/analysis/prediction-band';
import type { Circuit } from '../../../../shared/schemas/designs';

export interface MonteCarloBandRequest {
  id: number;
  circuit: Circuit;
  frequenciesHz: number[];
  trials: number;
  seed: number;
}

export type MonteCarloBandReply =
  | { id: number; points: { frequencyHz: number; p05Db: number; p50Db: number; p95Db: number }[] }
  | { id: number; error: string };

self.onmessage = (event: MessageEvent<MonteCarloBandRequest>) => {
  const { id, circuit, frequenciesHz, trials, seed } = event.data;
  let reply: MonteCarloBandReply;
  try {
    reply = { id, points: monteCarloCmrrBand(circuit, frequenciesHz, { trials, seed }).points };
  } catch (error) {
    reply = { id, error: error instanceof Error ? error.message : String(error) };
  }
  self.postMessage(reply);
};
