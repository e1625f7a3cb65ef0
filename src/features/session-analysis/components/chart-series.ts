// The session charts keep one fixed list of series for their whole life, so live refits and a
// Monte Carlo band arriving later go in through uPlot's setData instead of a new chart. Pure.
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';
import type { ChartSeries, PreparedChart, SeriesRole } from '../../../lib/charts/session-chart-data';

export interface FixedSeries {
  key: string;
  role: SeriesRole;
  /** Label used while the prepared chart has no such series (yet). */
  label: string;
  /** Which toggle shows or hides it. */
  group: TraceGroup;
}

export type TraceGroup = 'measured' | 'bounds' | 'failing' | 'fit' | 'prediction' | 'monte-carlo' | 'limit';

export const traceGroupLabels: Record<TraceGroup, string> = {
  measured: 'Measured values',
  bounds: 'Floor-limited bounds',
  failing: 'Points below the limit',
  fit: 'Fitted curve',
  prediction: 'Design prediction (op-amp sign band)',
  'monte-carlo': 'Monte Carlo 5–95 %',
  limit: 'Limit mask',
};

// Order is drawing order: bands and their edges first, then the limit, prediction, fit, measured on top (docs/CHARTS.md).
export const cmrrSeries: readonly FixedSeries[] = [
  { key: 'cmrr-mc-p05', role: 'monte-carlo-band-edge', label: 'Monte Carlo 5th percentile', group: 'monte-carlo' },
  { key: 'cmrr-mc-p95', role: 'monte-carlo-band-edge', label: 'Monte Carlo 95th percentile', group: 'monte-carlo' },
  { key: 'cmrr-mc-p50', role: 'monte-carlo-median', label: 'Monte Carlo median', group: 'monte-carlo' },
  { key: 'cmrr-predicted-low', role: 'prediction-band-edge', label: 'Prediction, pessimistic op-amp sign', group: 'prediction' },
  { key: 'cmrr-predicted-high', role: 'prediction-band-edge', label: 'Prediction, optimistic op-amp sign', group: 'prediction' },
  { key: 'limit', role: 'limit', label: 'Limit (minimum CMRR)', group: 'limit' },
  { key: 'limit-guard', role: 'limit-guard', label: 'Limit + guard band', group: 'limit' },
  { key: 'cmrr-predicted', role: 'prediction', label: 'Predicted CMRR (nominal design)', group: 'prediction' },
  { key: 'cmrr-fit', role: 'fit', label: 'Fitted CMRR', group: 'fit' },
  { key: 'cmrr-measured', role: 'measured-value', label: 'Measured CMRR', group: 'measured' },
  { key: 'cmrr-bound', role: 'measured-bound', label: 'Measured CMRR, lower bound', group: 'bounds' },
  { key: 'cmrr-failing', role: 'measured-failing', label: 'Below the limit', group: 'failing' },
];

export const gainSeries: readonly FixedSeries[] = [
  { key: 'ad-predicted', role: 'prediction', label: 'Predicted |Ad|', group: 'prediction' },
  { key: 'acm-predicted', role: 'prediction', label: 'Predicted |Acm|', group: 'prediction' },
  { key: 'ad-fit', role: 'fit', label: 'Fitted |Ad|', group: 'fit' },
  { key: 'acm-fit', role: 'fit', label: 'Fitted |Acm|', group: 'fit' },
  { key: 'ad-measured', role: 'measured-value', label: 'Measured |Ad|', group: 'measured' },
  { key: 'acm-measured', role: 'measured-value', label: 'Measured |Acm|', group: 'measured' },
  { key: 'acm-bound', role: 'measured-bound', label: 'Measured |Acm|, upper bound', group: 'bounds' },
];

/** uPlot band pairs of the CMRR chart, as keys (the chart turns them into data indices). */
export const cmrrBands = [
  { lowerKey: 'cmrr-mc-p05', upperKey: 'cmrr-mc-p95', role: 'monte-carlo-band' },
  { lowerKey: 'cmrr-predicted-low', upperKey: 'cmrr-predicted-high', role: 'op-amp-sign-band' },
] as const;

/** A chart laid onto a fixed series list: data in that order (all-null where the chart lacks a series) and the labels to show. */
export interface FixedChartData {
  data: [number[], ...(number | null)[][]];
  labels: string[];
  /** Whether the prepared chart holds each fixed series (with at least one value). */
  present: boolean[];
}

/**
 * Lays a prepared chart onto a fixed series list. O(series · points) only for missing series
 * (an all-null column); present series are passed through without copying.
 *
 * @example alignToFixedSeries(prepared.cmrr, cmrrSeries).data.length // → cmrrSeries.length + 1
 */
export function alignToFixedSeries(chart: PreparedChart, fixed: readonly FixedSeries[]): FixedChartData {
  const byKey = new Map<string, ChartSeries>(chart.series.map((series) => [series.key, series]));
  let empty: null[] | null = null;
  const columns: (number | null)[][] = [];
  const labels: string[] = [];
  const present: boolean[] = [];
  for (const entry of fixed) {
    const series = byKey.get(entry.key);
    if (series) {
      columns.push(series.values);
      labels.push(series.label);
      present.push(series.values.some((value) => value !== null));
    } else {
      empty ??= new Array<null>(chart.frequencyHz.length).fill(null);
      columns.push(empty);
      labels.push(entry.label);
      present.push(false);
    }
  }
  return { data: [chart.frequencyHz, ...columns], labels, present };
}

/** A measured role reads the nearest point; a curve is interpolated between its neighbours. */
const measuredRoles = new Set<SeriesRole>(['measured-value', 'measured-bound', 'measured-failing']);

function neighbours(values: readonly (number | null)[], index: number): { below: number; above: number } {
  let below = index;
  while (below >= 0 && values[below] === null) below--;
  let above = index;
  while (above < values.length && values[above] === null) above++;
  return { below, above: above < values.length ? above : -1 };
}

/**
 * A series' value at a merged-grid index: its own value there; else for curves (fit, prediction,
 * bands, limit) the straight line in log f between the neighbouring values (how the curve is drawn);
 * for measured points the nearest one within `nearestWithinIndices` grid steps, with its frequency.
 * Null when there is none. O(distance to the neighbours).
 */
export function seriesValueAt(
  frequencyHz: readonly number[],
  values: readonly (number | null)[],
  role: SeriesRole,
  index: number,
  nearestWithinIndices = 8,
): { valueDb: number; atFrequencyHz: number } | null {
  if (index < 0 || index >= values.length) return null;
  const own = values[index];
  if (own !== null) return { valueDb: own, atFrequencyHz: frequencyHz[index] };
  const { below, above } = neighbours(values, index);
  if (measuredRoles.has(role)) {
    const candidates = [below, above].filter((at) => at >= 0 && Math.abs(at - index) <= nearestWithinIndices);
    if (candidates.length === 0) return null;
    const target = Math.log(frequencyHz[index]);
    const nearest = candidates.reduce((best, at) => (Math.abs(Math.log(frequencyHz[at]) - target) < Math.abs(Math.log(frequencyHz[best]) - target) ? at : best));
    return { valueDb: values[nearest] as number, atFrequencyHz: frequencyHz[nearest] };
  }
  if (below < 0 || above < 0) return null;
  const low = values[below] as number;
  const high = values[above] as number;
  const weight = Math.log(frequencyHz[index] / frequencyHz[below]) / Math.log(frequencyHz[above] / frequencyHz[below]);
  return { valueDb: low + weight * (high - low), atFrequencyHz: frequencyHz[index] };
}

export interface ReadoutRow {
  key: string;
  label: string;
  text: string;
  role: SeriesRole;
}

/**
 * The hover readout of a chart at a grid index (docs/CHARTS.md "Hover readout"): the frequency,
 * then each visible series with its unit — "Measured CMRR 72.4 dB", "≥ 92.0 dB" for a bound,
 * "70.0 dB — margin +2.4 dB" for the limit against the measured value, the prediction with the
 * span between the op-amp signs.
 */
export function readoutAt(
  fixed: readonly FixedSeries[],
  chart: FixedChartData,
  index: number,
  visible: (group: TraceGroup) => boolean,
): { frequency: string; rows: ReadoutRow[] } | null {
  const frequencyHz = chart.data[0];
  if (index < 0 || index >= frequencyHz.length) return null;
  const valueOf = (key: string) => {
    const at = fixed.findIndex((entry) => entry.key === key);
    return at < 0 || !chart.present[at] ? null : seriesValueAt(frequencyHz, chart.data[at + 1], fixed[at].role, index);
  };
  const measured = valueOf('cmrr-measured') ?? valueOf('cmrr-bound');
  const rows: ReadoutRow[] = [];
  fixed.forEach((entry, at) => {
    if (!chart.present[at] || !visible(entry.group)) return;
    // Band edges are named with the curve they belong to.
    if (entry.key === 'cmrr-predicted-low' || entry.key === 'cmrr-predicted-high' || entry.key === 'cmrr-mc-p95' || entry.key === 'cmrr-failing') return;
    const value = seriesValueAt(frequencyHz, chart.data[at + 1], entry.role, index);
    if (!value) return;
    const elsewhere = Math.abs(value.atFrequencyHz / frequencyHz[index] - 1) > 1e-9 ? ` at ${formatFrequencyHz(value.atFrequencyHz)}` : '';
    let text: string;
    if (entry.role === 'measured-bound') {
      text = `${entry.key === 'acm-bound' ? '≤ ' : '≥ '}${formatDb(value.valueDb)}${elsewhere}`;
    } else if (entry.key === 'limit' && measured) {
      text = `${formatDb(value.valueDb)} — margin ${formatDb(measured.valueDb - value.valueDb, { signed: true })}`;
    } else if (entry.key === 'cmrr-predicted') {
      const low = valueOf('cmrr-predicted-low');
      const high = valueOf('cmrr-predicted-high');
      text = formatDb(value.valueDb) + (low && high ? ` (${formatDb(low.valueDb)} to ${formatDb(high.valueDb)} between the op-amp signs)` : '');
    } else if (entry.key === 'cmrr-mc-p05') {
      const high = valueOf('cmrr-mc-p95');
      rows.push({ key: 'cmrr-mc-band', label: 'Monte Carlo 5–95 %', text: `${formatDb(value.valueDb)} to ${formatDb(high?.valueDb)}`, role: entry.role });
      return;
    } else {
      text = `${formatDb(value.valueDb)}${elsewhere}`;
    }
    if (entry.key === 'cmrr-measured' || entry.key === 'cmrr-bound') {
      const failing = valueOf('cmrr-failing');
      if (failing && Math.abs(failing.atFrequencyHz - value.atFrequencyHz) === 0) text += ' — below the limit';
    }
    rows.push({ key: entry.key, label: chart.labels[at], text, role: entry.role });
  });
  return { frequency: formatFrequencyHz(frequencyHz[index]), rows };
}
