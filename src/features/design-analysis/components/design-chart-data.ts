// The design view's CMRR chart on one log-frequency grid: the nominal prediction with its
// op-amp-sign band, the Monte Carlo 5–95 % band and median, the corner worst case and the limit
// mask (the session chart's preparation, with no measured points, plus the worst-case curve).
import type { PredictedPoint } from '../../../../shared/design-prediction';
import type { LimitMaskData } from '../../../../shared/schemas/designs';
import { prepareSessionCharts, type ChartSeries, type PreparedChart } from '../../../lib/charts/session-chart-data';
import type { ExplorerBandPoint } from '../../../workers/monte-carlo-protocol';

export type DesignChartSeries = Omit<ChartSeries, 'role'> & { role: ChartSeries['role'] | 'worst-case' };
export type DesignChart = Omit<PreparedChart, 'series'> & { series: DesignChartSeries[] };

/** Prepares the design chart; `band` may be null while the worker has not answered yet. O(points). */
export function prepareDesignChart(prediction: readonly PredictedPoint[], band: readonly ExplorerBandPoint[] | null, mask: Pick<LimitMaskData, 'points' | 'guardBandDb'>): DesignChart {
  const prepared = prepareSessionCharts({ points: [], prediction, monteCarloBand: band ?? undefined, limitMask: mask }).cmrr;
  const series: DesignChartSeries[] = [...prepared.series];
  if (band && band.length > 0) {
    const worstByFrequency = new Map(band.map((point) => [point.frequencyHz, point.worstCaseDb]));
    const values = prepared.frequencyHz.map((frequencyHz) => {
      const value = worstByFrequency.get(frequencyHz);
      return value === undefined || !Number.isFinite(value) ? null : value;
    });
    series.push({ key: 'cmrr-worst-case', label: 'Worst case over the tolerance corners', role: 'worst-case', values });
  }
  let yRangeDb = prepared.yRangeDb;
  const worst = series.find((entry) => entry.key === 'cmrr-worst-case');
  if (worst && yRangeDb) {
    const lowest = Math.min(...worst.values.filter((value): value is number => value !== null));
    if (lowest - 3 < yRangeDb[0]) yRangeDb = [Math.floor((lowest - 3) / 10) * 10, yRangeDb[1]];
  }
  return { frequencyHz: prepared.frequencyHz, series, bands: prepared.bands, yRangeDb };
}

/** Narrower sign bands than this are not named in the readout (below its 0.1 dB display step). */
const SIGN_BAND_SHOWN_DB = 0.05;

/** What the hover readout says at one grid index. */
export interface DesignReadout {
  frequencyHz: number;
  predictedDb: number | null;
  signBandDb: [number, number] | null;
  monteCarloDb: { p05: number; p50: number; p95: number } | null;
  worstCaseDb: number | null;
  limitDb: number | null;
  /** Monte Carlo 5th percentile − limit, dB (the margin most units clear). */
  p05MarginDb: number | null;
}

/** Reads every series of the chart at one grid index. */
export function designReadout(chart: DesignChart, index: number): DesignReadout {
  const value = (key: string) => chart.series.find((entry) => entry.key === key)?.values[index] ?? null;
  const low = value('cmrr-predicted-low');
  const high = value('cmrr-predicted-high');
  const p05 = value('cmrr-mc-p05');
  const p50 = value('cmrr-mc-p50');
  const p95 = value('cmrr-mc-p95');
  const limit = value('limit');
  return {
    frequencyHz: chart.frequencyHz[index],
    predictedDb: value('cmrr-predicted'),
    // Signs that agree to display precision (a matched nominal design) make no band worth naming.
    signBandDb: low !== null && high !== null && Math.abs(high - low) >= SIGN_BAND_SHOWN_DB ? [Math.min(low, high), Math.max(low, high)] : null,
    monteCarloDb: p05 !== null && p50 !== null && p95 !== null ? { p05, p50, p95 } : null,
    worstCaseDb: value('cmrr-worst-case'),
    limitDb: limit,
    p05MarginDb: p05 !== null && limit !== null ? p05 - limit : null,
  };
}
