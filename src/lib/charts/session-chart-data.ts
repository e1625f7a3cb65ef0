// Data preparation for the session view's charts (uPlot, logarithmic frequency axis): every
// series on one merged, ascending frequency grid, null where a series has no value, so uPlot's
// aligned-data mode can draw them together and a cursor reads every series at once.
import { decideAgainstLimit, type LimitOutcome } from '../../../shared/engine/limit-mask';
import type { CmrrPoint } from '../../../shared/engine/cmrr-points';
import type { FrequencyFit } from '../../../shared/engine/frequency-fit';
import type { LimitMaskPoint } from '../../../shared/engine/limit-mask';
import type { PredictedPoint } from '../../../shared/design-prediction';
import type { MonteCarloBandPoint } from '../../../shared/analysis/prediction-band';
import { decimateForLogAxis } from './decimation';
import { logFrequencyGrid } from './log-frequency-axis';
import { limitOnGrid, maskCrossings, type MaskCrossing } from './mask-crossings';

/** What a series shows; docs/CHARTS.md gives each role its colour, line and marker. */
export type SeriesRole =
  | 'measured-value'
  | 'measured-bound'
  | 'measured-failing'
  | 'fit'
  | 'prediction'
  | 'prediction-band-edge'
  | 'monte-carlo-median'
  | 'monte-carlo-band-edge'
  | 'limit'
  | 'limit-guard';

/** One y series aligned to the chart's frequencies. */
export interface ChartSeries {
  key: string;
  label: string;
  role: SeriesRole;
  /** dB values aligned to `frequencyHz`; null where the series has no value. */
  values: (number | null)[];
}

/** A filled region between two series (uPlot's `bands` option). */
export interface ChartBand {
  lowerKey: string;
  upperKey: string;
  role: 'op-amp-sign-band' | 'monte-carlo-band';
}

/** A chart ready for uPlot: x ascending, every series the same length. */
export interface PreparedChart {
  frequencyHz: number[];
  series: ChartSeries[];
  bands: ChartBand[];
  /** Suggested y range, dB, padded and rounded to 10 dB; null when nothing is finite. */
  yRangeDb: [number, number] | null;
}

/** Inputs: what the session analysis and the design view already hold. */
export interface SessionChartInput {
  points: readonly CmrrPoint[];
  fit?: FrequencyFit | null;
  prediction?: readonly PredictedPoint[];
  monteCarloBand?: readonly MonteCarloBandPoint[];
  limitMask?: { points: readonly LimitMaskPoint[]; guardBandDb?: number } | null;
}

/** Options of {@link prepareSessionCharts}. */
export interface SessionChartOptions {
  /** Plot width in pixels; with it, sessions of more than `decimateAbovePoints` points are decimated per pixel column. */
  widthPx?: number;
  /** Default 4 × widthPx (below that, decimation saves nothing worth having). */
  decimateAbovePoints?: number;
  /** Points of the dense grid the first-order fit is drawn on (default 256). */
  fitGridPoints?: number;
}

/** Result of {@link prepareSessionCharts}. */
export interface SessionCharts {
  /** CMRR chart: measured values and bounds, failing points, fit, prediction with its sign band, Monte Carlo band, limit. */
  cmrr: PreparedChart;
  /** Gain chart: Ad and Acm measured (Acm's floor-limited points as upper bounds), fitted and predicted. */
  gains: PreparedChart;
  /** Pass/fail of each measured point, aligned to the shared frequencies (null where no measured point). */
  outcomes: (LimitOutcome | null)[];
  /** Where the measured curve crosses the mask (bound points included as drawn). */
  crossings: MaskCrossing[];
  totalPointCount: number;
  keptPointCount: number;
}

const toDb = (ratio: number) => 20 * Math.log10(ratio);

/** A sorted source of x values and the merged index each lands on. */
interface Source {
  frequencyHz: Float64Array;
  mergedIndex: Int32Array;
}

function ascendingOrder(frequencyHz: ArrayLike<number>): Uint32Array {
  const order = new Uint32Array(frequencyHz.length);
  let sorted = true;
  for (let index = 0; index < order.length; index++) {
    order[index] = index;
    if (index > 0 && frequencyHz[index] < frequencyHz[index - 1]) sorted = false;
  }
  // Sweeps arrive sorted (O(n) check); only unsorted input pays for a sort.
  if (!sorted) order.sort((a, b) => frequencyHz[a] - frequencyHz[b]);
  return order;
}

/** k-way merge of sorted sources into one ascending grid; equal frequencies (to 1e-12) share an index. O(total · k). */
function mergeSources(sources: Source[]): number[] {
  const merged: number[] = [];
  const cursors = new Int32Array(sources.length);
  for (;;) {
    let smallest = Infinity;
    for (let s = 0; s < sources.length; s++) {
      if (cursors[s] < sources[s].frequencyHz.length && sources[s].frequencyHz[cursors[s]] < smallest) smallest = sources[s].frequencyHz[cursors[s]];
    }
    if (smallest === Infinity) return merged;
    merged.push(smallest);
    const index = merged.length - 1;
    const tolerance = smallest * 1e-12;
    for (let s = 0; s < sources.length; s++) {
      const source = sources[s];
      while (cursors[s] < source.frequencyHz.length && source.frequencyHz[cursors[s]] - smallest <= tolerance) {
        source.mergedIndex[cursors[s]] = index;
        cursors[s]++;
      }
    }
  }
}

function makeSource(frequencyHz: ArrayLike<number>): Source {
  return { frequencyHz: Float64Array.from(frequencyHz), mergedIndex: new Int32Array(frequencyHz.length) };
}

function scatter(length: number, source: Source, values: ArrayLike<number | null>): (number | null)[] {
  const out = new Array<number | null>(length);
  for (let index = 0; index < length; index++) out[index] = null;
  for (let index = 0; index < source.mergedIndex.length; index++) {
    const value = values[index];
    if (value !== null && Number.isFinite(value)) out[source.mergedIndex[index]] = value;
  }
  return out;
}

function yRange(series: readonly ChartSeries[]): [number, number] | null {
  let low = Infinity;
  let high = -Infinity;
  for (const { values } of series) {
    for (const value of values) {
      if (value === null) continue;
      if (value < low) low = value;
      if (value > high) high = value;
    }
  }
  if (low === Infinity) return null;
  return [Math.floor((low - 3) / 10) * 10, Math.ceil((high + 3) / 10) * 10];
}

/**
 * Prepares both session charts (issue 5 "Session view"). Measured CMRR values and lower bounds
 * are separate series (so bounds draw with their own marker); failing points get a third series
 * (for a ring marker) besides the per-point `outcomes` (engine decideAgainstLimit with the mask's
 * guard band, ILAC-G8). A first-order fit is drawn from its model on a dense log grid,
 * `CMRR(f) = Ad0/sqrt(Acm0² + (k·f)²)`, `|Ad(f)| = Ad0/sqrt(1 + (f/fp)²)`,
 * `|Acm(f)| = sqrt(Acm0² + (k·f)²)/sqrt(1 + (f/fp)²)` (DOMAIN.md); a smooth fit by its fitted
 * values at the measured points. The limit is evaluated on the whole merged grid inside its span
 * (linear in log f, hence exact as straight segments on the log axis) so hover readouts show it.
 *
 * With `widthPx`, sessions above `decimateAbovePoints` keep per pixel column the first, last,
 * lowest and highest point of CMRR, Ad, Acm and of the failing points (so every column with a
 * failure still shows its worst one; decimateForLogAxis).
 * Cost O(n) for n measured points (O(n log n) only if they arrive unsorted), typed arrays inside.
 *
 * @example prepareSessionCharts({ points }).cmrr.series.map((s) => s.key) // → ['cmrr-measured', 'cmrr-bound']
 */
export function prepareSessionCharts(input: SessionChartInput, options: SessionChartOptions = {}): SessionCharts {
  const totalPointCount = input.points.length;
  const measuredFrequencies = new Float64Array(totalPointCount);
  for (let index = 0; index < totalPointCount; index++) measuredFrequencies[index] = input.points[index].frequencyHz;
  const order = ascendingOrder(measuredFrequencies);
  const frequencyHz = new Float64Array(totalPointCount);
  const cmrrDb = new Float64Array(totalPointCount);
  const adDb = new Float64Array(totalPointCount);
  const acmDb = new Float64Array(totalPointCount);
  const isBound = new Uint8Array(totalPointCount);
  for (let index = 0; index < totalPointCount; index++) {
    const point = input.points[order[index]];
    frequencyHz[index] = point.frequencyHz;
    cmrrDb[index] = point.cmrrDb;
    adDb[index] = toDb(point.ad);
    acmDb[index] = toDb(point.acm);
    isBound[index] = point.lowerBound ? 1 : 0;
  }
  const mask = input.limitMask?.points ?? [];
  const guardBandDb = input.limitMask?.guardBandDb ?? 0;
  const measuredLimits = limitOnGrid(frequencyHz, mask);
  const measuredOutcomes = new Array<LimitOutcome>(totalPointCount);
  const failing = new Uint8Array(totalPointCount);
  for (let index = 0; index < totalPointCount; index++) {
    const limit = measuredLimits[index];
    measuredOutcomes[index] = Number.isNaN(limit) ? 'outside-mask' : decideAgainstLimit(cmrrDb[index], limit, guardBandDb, isBound[index] === 1);
    if (measuredOutcomes[index] === 'fail') failing[index] = 1;
  }

  const widthPx = options.widthPx;
  const threshold = options.decimateAbovePoints ?? (widthPx ? 4 * widthPx : Infinity);
  let kept: Uint32Array;
  if (widthPx && totalPointCount > threshold) {
    // Failing points as a fourth series (NaN elsewhere): every pixel column with a failure keeps its
    // worst one, without keeping all of a sweep that fails everywhere.
    const failingCmrr = new Float64Array(totalPointCount);
    for (let index = 0; index < totalPointCount; index++) failingCmrr[index] = failing[index] ? cmrrDb[index] : Number.NaN;
    kept = decimateForLogAxis(frequencyHz, [cmrrDb, adDb, acmDb, failingCmrr], widthPx);
  }
  else {
    kept = new Uint32Array(totalPointCount);
    for (let index = 0; index < totalPointCount; index++) kept[index] = index;
  }
  const pick = <T extends Float64Array | Uint8Array>(values: T): T => {
    const out = new (values.constructor as { new (length: number): T })(kept.length);
    for (let index = 0; index < kept.length; index++) out[index] = values[kept[index]];
    return out;
  };
  const keptFrequencies = pick(frequencyHz);
  const keptCmrr = pick(cmrrDb);
  const keptAd = pick(adDb);
  const keptAcm = pick(acmDb);
  const keptBound = pick(isBound);
  const keptOutcomes = new Array<LimitOutcome>(kept.length);
  for (let index = 0; index < kept.length; index++) keptOutcomes[index] = measuredOutcomes[kept[index]];

  const measured = makeSource(keptFrequencies);
  const sources: Source[] = [measured];
  const fit = input.fit ?? null;
  let fitGrid: Source | null = null;
  if (fit && fit.model === 'first-order' && fit.commonModeGainModel && totalPointCount > 0) {
    fitGrid = makeSource(logFrequencyGrid(frequencyHz[0], frequencyHz[totalPointCount - 1], Math.max(2, options.fitGridPoints ?? 256)));
    sources.push(fitGrid);
  }
  const prediction = input.prediction ? [...input.prediction].filter((point) => point.frequencyHz > 0).sort((a, b) => a.frequencyHz - b.frequencyHz) : [];
  const predictionSource = prediction.length > 0 ? makeSource(prediction.map((point) => point.frequencyHz)) : null;
  if (predictionSource) sources.push(predictionSource);
  const band = input.monteCarloBand ? [...input.monteCarloBand].filter((point) => point.frequencyHz > 0).sort((a, b) => a.frequencyHz - b.frequencyHz) : [];
  const bandSource = band.length > 0 ? makeSource(band.map((point) => point.frequencyHz)) : null;
  if (bandSource) sources.push(bandSource);
  const maskSource = mask.length > 0 ? makeSource(mask.map((point) => point.frequencyHz)) : null;
  if (maskSource) sources.push(maskSource);

  const grid = mergeSources(sources);
  const length = grid.length;
  const cmrrSeries: ChartSeries[] = [];
  const gainSeries: ChartSeries[] = [];
  const bands: ChartBand[] = [];

  // Plain loops rather than Array.from(…, callback): several times faster on 100,000 points in V8.
  const valueOrNull = (values: Float64Array, bound: boolean) => {
    const out = new Array<number | null>(values.length);
    for (let index = 0; index < values.length; index++) out[index] = (keptBound[index] === 1) === bound ? values[index] : null;
    return out;
  };
  if (kept.length > 0) {
    cmrrSeries.push({ key: 'cmrr-measured', label: 'Measured CMRR', role: 'measured-value', values: scatter(length, measured, valueOrNull(keptCmrr, false)) });
    cmrrSeries.push({ key: 'cmrr-bound', label: 'Measured CMRR, lower bound (at the noise floor)', role: 'measured-bound', values: scatter(length, measured, valueOrNull(keptCmrr, true)) });
    if (failing.some((flag) => flag === 1)) {
      const failingValues = new Array<number | null>(kept.length);
      for (let index = 0; index < kept.length; index++) failingValues[index] = keptOutcomes[index] === 'fail' ? keptCmrr[index] : null;
      cmrrSeries.push({ key: 'cmrr-failing', label: 'Below the limit', role: 'measured-failing', values: scatter(length, measured, failingValues) });
    }
    gainSeries.push({ key: 'ad-measured', label: 'Measured |Ad|', role: 'measured-value', values: scatter(length, measured, keptAd) });
    gainSeries.push({ key: 'acm-measured', label: 'Measured |Acm|', role: 'measured-value', values: scatter(length, measured, valueOrNull(keptAcm, false)) });
    gainSeries.push({ key: 'acm-bound', label: 'Measured |Acm|, upper bound (at the noise floor)', role: 'measured-bound', values: scatter(length, measured, valueOrNull(keptAcm, true)) });
  }

  if (fit && fitGrid && fit.commonModeGainModel) {
    const { acm0, kPerHz } = fit.commonModeGainModel;
    const ad0 = fit.differentialGainDc;
    const bandwidthHz = fit.bandwidthHz;
    const cmrrFit = new Float64Array(fitGrid.frequencyHz.length);
    const adFit = new Float64Array(cmrrFit.length);
    const acmFit = new Float64Array(cmrrFit.length);
    for (let index = 0; index < cmrrFit.length; index++) {
      const f = fitGrid.frequencyHz[index];
      const commonSquared = acm0 * acm0 + kPerHz * f * (kPerHz * f);
      const rolloff = bandwidthHz ? 1 + (f / bandwidthHz) ** 2 : 1;
      cmrrFit[index] = 20 * Math.log10(ad0) - 10 * Math.log10(commonSquared);
      adFit[index] = 20 * Math.log10(ad0) - 10 * Math.log10(rolloff);
      acmFit[index] = 10 * Math.log10(commonSquared / rolloff);
    }
    cmrrSeries.push({ key: 'cmrr-fit', label: 'Fitted CMRR (first-order model)', role: 'fit', values: scatter(length, fitGrid, cmrrFit) });
    gainSeries.push({ key: 'ad-fit', label: 'Fitted |Ad|', role: 'fit', values: scatter(length, fitGrid, adFit) });
    gainSeries.push({ key: 'acm-fit', label: 'Fitted |Acm|', role: 'fit', values: scatter(length, fitGrid, acmFit) });
  } else if (fit && fit.model === 'smooth' && fit.fittedCmrrDb.length === totalPointCount) {
    const smooth = Array.from(kept, (index) => fit.fittedCmrrDb[order[index]]);
    cmrrSeries.push({ key: 'cmrr-fit', label: `Smooth description (degree ${fit.smoothDegree ?? '?'} in log f)`, role: 'fit', values: scatter(length, measured, smooth) });
  }

  if (predictionSource) {
    cmrrSeries.push({ key: 'cmrr-predicted', label: 'Predicted CMRR (nominal design)', role: 'prediction', values: scatter(length, predictionSource, prediction.map((point) => point.cmrrDb)) });
    const low = prediction.map((point) => point.cmrrBandLowDb);
    const high = prediction.map((point) => point.cmrrBandHighDb);
    if (prediction.some((point, index) => low[index] !== high[index] && point.cmrrBandLowDb !== null)) {
      cmrrSeries.push({ key: 'cmrr-predicted-low', label: 'Prediction, pessimistic op-amp sign', role: 'prediction-band-edge', values: scatter(length, predictionSource, low) });
      cmrrSeries.push({ key: 'cmrr-predicted-high', label: 'Prediction, optimistic op-amp sign', role: 'prediction-band-edge', values: scatter(length, predictionSource, high) });
      bands.push({ lowerKey: 'cmrr-predicted-low', upperKey: 'cmrr-predicted-high', role: 'op-amp-sign-band' });
    }
    gainSeries.push({ key: 'ad-predicted', label: 'Predicted |Ad|', role: 'prediction', values: scatter(length, predictionSource, prediction.map((point) => point.adDb)) });
    gainSeries.push({ key: 'acm-predicted', label: 'Predicted |Acm|', role: 'prediction', values: scatter(length, predictionSource, prediction.map((point) => point.acmDb)) });
  }

  if (bandSource) {
    cmrrSeries.push({ key: 'cmrr-mc-p05', label: 'Monte Carlo 5th percentile', role: 'monte-carlo-band-edge', values: scatter(length, bandSource, band.map((point) => point.p05Db)) });
    cmrrSeries.push({ key: 'cmrr-mc-p50', label: 'Monte Carlo median', role: 'monte-carlo-median', values: scatter(length, bandSource, band.map((point) => point.p50Db)) });
    cmrrSeries.push({ key: 'cmrr-mc-p95', label: 'Monte Carlo 95th percentile', role: 'monte-carlo-band-edge', values: scatter(length, bandSource, band.map((point) => point.p95Db)) });
    bands.push({ lowerKey: 'cmrr-mc-p05', upperKey: 'cmrr-mc-p95', role: 'monte-carlo-band' });
  }

  if (maskSource) {
    const limits = limitOnGrid(grid, mask);
    const limitValues = new Array<number | null>(length);
    const guardValues = new Array<number | null>(length);
    for (let index = 0; index < length; index++) {
      const value = limits[index];
      limitValues[index] = Number.isNaN(value) ? null : value;
      guardValues[index] = Number.isNaN(value) ? null : value + guardBandDb;
    }
    cmrrSeries.push({ key: 'limit', label: 'Limit (minimum CMRR)', role: 'limit', values: limitValues });
    if (guardBandDb > 0) {
      cmrrSeries.push({ key: 'limit-guard', label: `Limit + guard band (${guardBandDb} dB)`, role: 'limit-guard', values: guardValues });
    }
  }

  const outcomes = new Array<LimitOutcome | null>(length);
  for (let index = 0; index < length; index++) outcomes[index] = null;
  for (let index = 0; index < kept.length; index++) outcomes[measured.mergedIndex[index]] = keptOutcomes[index];
  const crossings = mask.length > 0 ? maskCrossings(keptFrequencies, keptCmrr, mask) : [];
  return {
    cmrr: { frequencyHz: grid, series: cmrrSeries, bands, yRangeDb: yRange(cmrrSeries) },
    gains: { frequencyHz: grid, series: gainSeries, bands: [], yRangeDb: yRange(gainSeries) },
    outcomes,
    crossings,
    totalPointCount,
    keptPointCount: kept.length,
  };
}

/**
 * uPlot's aligned data `[x, y1, y2, …]` in the order of `chart.series` (the caller builds the
 * matching `series` options from the same list, so indices agree: series i is data[i + 1]).
 */
export function toAlignedData(chart: PreparedChart): [number[], ...(number | null)[][]] {
  return [chart.frequencyHz, ...chart.series.map((series) => series.values)];
}

/** Index of a series in uPlot's terms (data index: 1-based, 0 is x), or −1. */
export function seriesDataIndex(chart: PreparedChart, key: string): number {
  const index = chart.series.findIndex((series) => series.key === key);
  return index < 0 ? -1 : index + 1;
}
