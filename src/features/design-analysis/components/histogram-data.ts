// The Monte Carlo histogram at one frequency as two bar series, split at the limit, for uPlot.
import type { CmrrHistogram } from '../../../../shared/analysis/prediction-band';

export interface HistogramBars {
  /** Bin centres, dB. */
  centresDb: number[];
  /** Counts of bins whose centre is at or above the limit (all bins without a limit); null elsewhere. */
  passingCounts: (number | null)[];
  /** Counts of bins whose centre is below the limit; null elsewhere. */
  failingCounts: (number | null)[];
  /** x range to show, dB: the histogram's edges widened to include the worst case. */
  rangeDb: [number, number];
  stepDb: number;
}

/**
 * Splits a histogram at the limit for drawing (the displayed yield is counted from the trials
 * themselves, not from these bins: a bin straddling the limit is drawn on the side of its centre).
 */
export function histogramBars(histogram: CmrrHistogram, limitDb: number | null, worstCaseDb: number | null): HistogramBars {
  const edges = histogram.edgesDb;
  const stepDb = edges.length > 1 ? edges[1] - edges[0] : 1;
  const centresDb = histogram.counts.map((_, index) => (edges[index] + edges[index + 1]) / 2);
  const failing = (centre: number) => limitDb !== null && centre < limitDb;
  let low = edges[0];
  let high = edges[edges.length - 1];
  if (worstCaseDb !== null && Number.isFinite(worstCaseDb)) low = Math.min(low, worstCaseDb - stepDb);
  if (limitDb !== null) {
    low = Math.min(low, limitDb - stepDb);
    high = Math.max(high, limitDb + stepDb);
  }
  return {
    centresDb,
    passingCounts: histogram.counts.map((count, index) => (failing(centresDb[index]) ? null : count)),
    failingCounts: histogram.counts.map((count, index) => (failing(centresDb[index]) ? count : null)),
    rangeDb: [low, high],
    stepDb,
  };
}
