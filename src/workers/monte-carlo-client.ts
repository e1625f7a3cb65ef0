// The page's side of the Monte Carlo worker: at most one request waits at its first step at a
// time; newer requests replace the one waiting to be sent, and answers to superseded runs are
// dropped. Independent of React and of the Worker class (any object with postMessage/onmessage),
// so the protocol can be tested in Node with a stand-in worker.
import type { MonteCarloAtFrequencyResult } from '../../shared/analysis/prediction-band';
import type { ExplorerBandPoint, MonteCarloResponse, MonteCarloRunRequest } from './monte-carlo-protocol';

/** What the client needs of a worker. */
export interface WorkerLike {
  postMessage(message: MonteCarloRunRequest): void;
  onmessage: ((event: MessageEvent<MonteCarloResponse>) => void) | null;
  terminate(): void;
}

export type MonteCarloRunInput = Omit<MonteCarloRunRequest, 'type' | 'runId'>;

/** What the page shows: the newest answers and whether newer ones are on their way. */
export interface MonteCarloView {
  atFrequency: { runId: number; result: MonteCarloAtFrequencyResult; roundTripMs: number; computeMs: number } | null;
  band: { runId: number; points: ExplorerBandPoint[] } | null;
  /** True from a request until its at-frequency answer (or error) arrives. */
  pending: boolean;
  /** Band progress of the newest run, 0 … 1; 1 when its band has arrived. */
  bandProgress: number;
  error: { runId: number; message: string; field: string | null } | null;
}

/** Name of the performance measure around each round trip (post → at-frequency answer); the explorer bench reads it. */
export const ROUND_TRIP_MEASURE = 'rejectra:monte-carlo-round-trip';

export const emptyMonteCarloView: MonteCarloView = { atFrequency: null, band: null, pending: false, bandProgress: 0, error: null };

export class MonteCarloClient {
  private nextRunId = 1;
  /** Sent and not yet answered at its frequency. */
  private inFlight: { runId: number; postedAt: number } | null = null;
  /** Waiting to be sent; replaced by newer requests. */
  private waiting: MonteCarloRunInput | null = null;
  /** Newest run sent: only its band counts. */
  private newestSent = 0;
  private view: MonteCarloView = emptyMonteCarloView;

  constructor(
    private readonly worker: WorkerLike,
    private readonly onChange: (view: MonteCarloView) => void,
    private readonly now: () => number = () => performance.now(),
    private readonly measure: (startMs: number, endMs: number, computeMs: number) => void = measureRoundTrip,
  ) {
    worker.onmessage = (event) => this.receive(event.data);
  }

  /** Asks for a run; sent at once unless another is still at its first step (then it waits, replacing any older waiting one). */
  request(input: MonteCarloRunInput): void {
    this.waiting = input;
    this.update({ pending: true });
    if (!this.inFlight) this.sendWaiting();
  }

  dispose(): void {
    this.worker.onmessage = null;
    this.worker.terminate();
  }

  private sendWaiting(): void {
    const input = this.waiting;
    if (!input) return;
    this.waiting = null;
    const runId = this.nextRunId++;
    this.inFlight = { runId, postedAt: this.now() };
    this.newestSent = runId;
    this.worker.postMessage({ type: 'run', runId, ...input });
  }

  private receive(message: MonteCarloResponse): void {
    if (message.type === 'at-frequency' || message.type === 'error') {
      const answered = this.inFlight && this.inFlight.runId === message.runId ? this.inFlight : null;
      if (answered) {
        this.inFlight = null;
        const receivedAt = this.now();
        if (message.type === 'at-frequency') {
          this.measure(answered.postedAt, receivedAt, message.computeMs);
          this.update({
            atFrequency: { runId: message.runId, result: message.result, roundTripMs: receivedAt - answered.postedAt, computeMs: message.computeMs },
            error: null,
            pending: this.waiting !== null,
            bandProgress: 0,
          });
        } else {
          this.update({ error: { runId: message.runId, message: message.message, field: message.field }, pending: this.waiting !== null });
        }
        this.sendWaiting();
      } else if (message.type === 'error' && message.runId === this.newestSent) {
        this.update({ error: { runId: message.runId, message: message.message, field: message.field } });
      }
      return;
    }
    // Band answers count only for the newest run sent; older ones were superseded.
    if (message.runId !== this.newestSent) return;
    if (message.type === 'band-progress') this.update({ bandProgress: message.done / Math.max(1, message.total) });
    else this.update({ band: { runId: message.runId, points: message.points }, bandProgress: 1 });
  }

  private update(changes: Partial<MonteCarloView>): void {
    this.view = { ...this.view, ...changes };
    this.onChange(this.view);
  }
}

/** The measure's `detail.computeMs` is the worker's own computing time within the round trip. */
function measureRoundTrip(startMs: number, endMs: number, computeMs: number): void {
  try {
    performance.measure(ROUND_TRIP_MEASURE, { start: startMs, end: endMs, detail: { computeMs } });
  } catch {
    // A browser without User Timing Level 3 simply records nothing.
  }
}
