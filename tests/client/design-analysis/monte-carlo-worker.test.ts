import { describe, expect, it } from 'vitest';
import { monteCarloAtFrequency, monteCarloCmrrBand, worstCaseCmrrAtFrequency } from '../../../shared/analysis/prediction-band';
import { MonteCarloClient, type MonteCarloView, type WorkerLike } from '../../../src/workers/monte-carlo-client';
import type { MonteCarloResponse, MonteCarloRunRequest } from '../../../src/workers/monte-carlo-protocol';
import { BandRun, errorResponse, runAtFrequency } from '../../../src/workers/monte-carlo-runner';
import { EngineInputError } from '../../../shared/engine/errors';
import { bridgeCircuit, currentSenseCircuit } from './fixtures';

function request(overrides: Partial<MonteCarloRunRequest> = {}): MonteCarloRunRequest {
  return { type: 'run', runId: 1, circuit: bridgeCircuit(), frequencyHz: 1000, limitDb: 80, trials: 2000, bandTrials: 1000, seed: 7, histogramBins: 20, bandFrequenciesHz: [10, 1000, 20_000], ...overrides };
}

describe('runAtFrequency and BandRun', () => {
  it('answer exactly what the shared analysis answers for the same trials and seed', () => {
    const wanted = request();
    expect(runAtFrequency(wanted)).toEqual(monteCarloAtFrequency(wanted.circuit, 1000, { trials: 2000, seed: 7, histogramBins: 20, limitDb: 80 }));
    for (const circuit of [bridgeCircuit(), currentSenseCircuit()]) {
      const band = new BandRun({ ...wanted, circuit });
      while (!band.done) band.step();
      const reference = monteCarloCmrrBand(circuit, [10, 1000, 20_000], { trials: 1000, seed: 7 }).points;
      expect(band.points.map(({ worstCaseDb: _worst, ...point }) => point)).toEqual(reference);
      expect(band.points.map((point) => point.worstCaseDb)).toEqual([10, 1000, 20_000].map((frequencyHz) => worstCaseCmrrAtFrequency(circuit, frequencyHz)));
    }
  });

  it('leaves out the yield when the frequency is outside the mask', () => {
    expect(runAtFrequency(request({ limitDb: null })).yieldFraction).toBeUndefined();
  });

  it('turns an engine refusal into an error message naming the field', () => {
    const refusal = new EngineInputError('monteCarloAtFrequency requires a non-negative integer seed, got -1', { field: 'seed' });
    expect(errorResponse(3, refusal)).toEqual({ type: 'error', runId: 3, message: 'field "seed": monteCarloAtFrequency requires a non-negative integer seed, got -1', field: 'seed' });
    expect(errorResponse(4, new Error('boom'))).toEqual({ type: 'error', runId: 4, message: 'The Monte Carlo worker failed: boom', field: null });
  });
});

/** A worker stand-in: records what is posted; the test answers by hand. */
class FakeWorker implements WorkerLike {
  posted: MonteCarloRunRequest[] = [];
  terminated = false;
  onmessage: ((event: MessageEvent<MonteCarloResponse>) => void) | null = null;
  postMessage(message: MonteCarloRunRequest): void {
    this.posted.push(message);
  }
  terminate(): void {
    this.terminated = true;
  }
  answer(message: MonteCarloResponse): void {
    this.onmessage?.({ data: message } as MessageEvent<MonteCarloResponse>);
  }
}

function setUp() {
  const worker = new FakeWorker();
  const views: MonteCarloView[] = [];
  let clock = 0;
  const measured: [number, number, number][] = [];
  const client = new MonteCarloClient(worker, (view) => views.push(view), () => clock, (start, end, compute) => measured.push([start, end, compute]));
  return { worker, views, client, measured, tick: (ms: number) => (clock += ms) };
}

const { type: _type, runId: _runId, ...input } = request();
const atFrequency = (runId: number): MonteCarloResponse => ({ type: 'at-frequency', runId, result: runAtFrequency(request()), computeMs: 1 });

describe('MonteCarloClient', () => {
  it('sends a request at once, shows it pending, and measures the round trip to its answer', () => {
    const { worker, views, client, measured, tick } = setUp();
    client.request(input);
    expect(worker.posted.map((posted) => posted.runId)).toEqual([1]);
    expect(views.at(-1)?.pending).toBe(true);
    tick(12);
    worker.answer(atFrequency(1));
    expect(views.at(-1)).toMatchObject({ pending: false, bandProgress: 0, error: null });
    expect(views.at(-1)?.atFrequency?.roundTripMs).toBe(12);
    expect(measured).toEqual([[0, 12, 1]]); // the worker said it computed for 1 ms
  });

  it('keeps only the newest of the requests made while one is running, and sends it when the first answers', () => {
    const { worker, views, client } = setUp();
    client.request(input);
    client.request({ ...input, frequencyHz: 10 });
    client.request({ ...input, frequencyHz: 20_000 });
    expect(worker.posted).toHaveLength(1);
    worker.answer(atFrequency(1));
    expect(views.at(-1)?.pending).toBe(true); // the newest is now on its way
    expect(worker.posted.map((posted) => [posted.runId, posted.frequencyHz])).toEqual([
      [1, 1000],
      [2, 20_000],
    ]);
  });

  it('drops band answers of superseded runs and takes the newest run’s band and progress', () => {
    const { worker, views, client } = setUp();
    client.request(input);
    worker.answer(atFrequency(1));
    client.request({ ...input, frequencyHz: 10 });
    worker.answer({ type: 'band-progress', runId: 1, done: 2, total: 3 });
    worker.answer({ type: 'band', runId: 1, points: [], computeMs: 1 });
    expect(views.at(-1)?.band).toBeNull();
    worker.answer(atFrequency(2));
    worker.answer({ type: 'band-progress', runId: 2, done: 1, total: 4 });
    expect(views.at(-1)?.bandProgress).toBe(0.25);
    const points = [{ frequencyHz: 10, p05Db: 70, p50Db: 80, p95Db: 90, worstCaseDb: 65 }];
    worker.answer({ type: 'band', runId: 2, points, computeMs: 1 });
    expect(views.at(-1)?.band).toEqual({ runId: 2, points });
    expect(views.at(-1)?.bandProgress).toBe(1);
  });

  it('reports an error of the running request and moves on to the waiting one', () => {
    const { worker, views, client } = setUp();
    client.request(input);
    client.request({ ...input, frequencyHz: 10 });
    worker.answer({ type: 'error', runId: 1, message: 'bad seed', field: 'seed' });
    expect(views.at(-1)?.error).toEqual({ runId: 1, message: 'bad seed', field: 'seed' });
    expect(worker.posted).toHaveLength(2);
    worker.answer(atFrequency(2));
    expect(views.at(-1)?.error).toBeNull();
  });

  it('ends the worker when disposed', () => {
    const { worker, client } = setUp();
    client.dispose();
    expect(worker.terminated).toBe(true);
    expect(worker.onmessage).toBeNull();
  });
});
