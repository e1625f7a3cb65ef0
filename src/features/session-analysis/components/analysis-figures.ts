// Figures beside the session charts: the fit's parameters with their 95 % intervals, the residuals
// ready for a small plot, the margin at the tightest frequency, and the grid the Monte Carlo band
// is computed on. Pure, so tests read them without a browser.
import type { CmrrPoint } from '../../../../shared/engine/cmrr-points';
import type { FrequencyFit } from '../../../../shared/engine/frequency-fit';
import type { PredictedPoint } from '../../../../shared/design-prediction';
import type { LimitVerdict } from '../../../../shared/schemas/analysis';
import { decimateForLogAxis } from '../../../lib/charts/decimation';
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';

export interface FitParameterRow {
  key: 'dc-cmrr' | 'corner' | 'bandwidth' | 'slope' | 'residual';
  label: string;
  value: string;
  /** "95 %: a … b" with units, or a reason it is missing. */
  detail: string | null;
}

const interval = (values: [number, number] | null, format: (value: number) => string) =>
  values ? `95 %: ${format(values[0])} … ${format(values[1])}` : null;

/** Whole counts with thousands separators: "99,998". */
const count = (value: number) => value.toLocaleString('en');

const slopeText = (dbPerDecade: number) => `${dbPerDecade < 0 ? '−' : '+'}${Math.abs(dbPerDecade).toFixed(1)} dB/decade`;

/**
 * The fit's parameters as the page lists them, each with its unit and 95 % interval: dc CMRR,
 * CMRR corner, closed-loop bandwidth, high-frequency slope, and the residual rms.
 *
 * @example fitParameterRows(fit)[0] // → { key: 'dc-cmrr', label: 'DC CMRR', value: '92.4 dB', detail: '95 %: 91.8 dB … 93.0 dB' }
 */
export function fitParameterRows(fit: FrequencyFit): FitParameterRow[] {
  const slope = fit.highFrequencySlope;
  return [
    { key: 'dc-cmrr', label: 'DC CMRR', value: formatDb(fit.cmrrDcDb), detail: interval(fit.cmrrDcDbInterval95, (value) => formatDb(value)) },
    {
      key: 'corner',
      label: 'CMRR corner',
      value: fit.cmrrCornerHz ? formatFrequencyHz(fit.cmrrCornerHz) : '—',
      detail: fit.cmrrCornerHz ? interval(fit.cmrrCornerHzInterval95, formatFrequencyHz) : 'not inside the measured range',
    },
    {
      key: 'bandwidth',
      label: 'Closed-loop bandwidth',
      value: fit.bandwidthHz ? formatFrequencyHz(fit.bandwidthHz) : '—',
      detail: fit.bandwidthHz ? interval(fit.bandwidthHzInterval95, formatFrequencyHz) : (fit.bandwidthNote ?? null),
    },
    {
      key: 'slope',
      label: 'High-frequency slope',
      value: slope ? slopeText(slope.dbPerDecade) : '—',
      detail: slope
        ? `95 %: ${slopeText(slope.interval95[0])} … ${slopeText(slope.interval95[1])}, ${formatFrequencyHz(slope.fromHz)}–${formatFrequencyHz(slope.toHz)}`
        : null,
    },
    {
      key: 'residual',
      label: 'Residual rms',
      value: formatDb(fit.residualRmsDb, { digits: 2 }),
      detail: `${count(fit.activePointCount)} points in the fit${fit.activeBoundCount > 0 ? `, ${count(fit.activeBoundCount)} of them bounds` : ''}; ${count(fit.degreesOfFreedom)} degrees of freedom`,
    },
  ];
}

/** Residuals ready for the small plot: values and bounds apart, thinned per pixel column for huge sessions. */
export interface ResidualPlotData {
  frequencyHz: number[];
  resolvedDb: (number | null)[];
  boundDb: (number | null)[];
  /** Largest |residual| of a resolved point and where. */
  largest: { frequencyHz: number; residualDb: number } | null;
}

/**
 * The fit's residuals (measured − fitted, dB) against frequency, resolved points and bounds as
 * separate series; above 4 × widthPx points, per-column first/last/min/max (decimateForLogAxis)
 * so the plot keeps its envelope. O(n) (O(n log n) when points arrive unsorted).
 */
export function prepareResiduals(points: readonly CmrrPoint[], fit: FrequencyFit, widthPx: number): ResidualPlotData {
  const count = Math.min(points.length, fit.residualsDb.length);
  const order = Array.from({ length: count }, (_, index) => index);
  let sorted = true;
  for (let index = 1; index < count; index++) if (points[index].frequencyHz < points[index - 1].frequencyHz) sorted = false;
  if (!sorted) order.sort((a, b) => points[a].frequencyHz - points[b].frequencyHz);
  const frequencyHz = new Float64Array(count);
  const residual = new Float64Array(count);
  let largest: ResidualPlotData['largest'] = null;
  for (let at = 0; at < count; at++) {
    const index = order[at];
    frequencyHz[at] = points[index].frequencyHz;
    // No residual (null over JSON) where the fit has no value: NaN here, dropped below.
    residual[at] = fit.residualsDb[index] ?? Number.NaN;
    if (!points[index].lowerBound && Number.isFinite(residual[at]) && (!largest || Math.abs(residual[at]) > Math.abs(largest.residualDb))) {
      largest = { frequencyHz: frequencyHz[at], residualDb: residual[at] };
    }
  }
  const kept = count > 4 * widthPx ? decimateForLogAxis(frequencyHz, [residual], widthPx) : Uint32Array.from(order.keys());
  const out: ResidualPlotData = { frequencyHz: [], resolvedDb: [], boundDb: [], largest };
  for (const at of kept) {
    const bound = points[order[at]].lowerBound;
    const value = Number.isFinite(residual[at]) ? residual[at] : null;
    out.frequencyHz.push(frequencyHz[at]);
    out.resolvedDb.push(bound ? null : value);
    out.boundDb.push(bound ? value : null);
  }
  return out;
}

/**
 * The margin to the limit at the tightest frequency in words, with units: "+3.2 dB above the
 * 80.0 dB limit at 20 kHz (measured 83.2 dB; the design predicts 85.0 dB there)".
 */
export function marginStatement(tightest: LimitVerdict | null, predictedAtTightestDb: number | null): string | null {
  if (!tightest || tightest.marginDb === null || tightest.limitDb === null) return null;
  const side = tightest.marginDb >= 0 ? 'above' : 'below';
  const measured = `${tightest.lowerBound ? 'at least ' : ''}${formatDb(tightest.cmrrDb)}`;
  const predicted = predictedAtTightestDb === null ? '' : `; the design predicts ${formatDb(predictedAtTightestDb)} there`;
  return `${formatDb(tightest.marginDb, { signed: true })} ${side} the ${formatDb(tightest.limitDb)} limit at ${formatFrequencyHz(tightest.frequencyHz)} (measured ${measured}${predicted})`;
}

/**
 * Frequencies for the Monte Carlo band: `perDecade` points per decade, log-spaced, over whole
 * decades around the measured range, so one computation serves a session while its sweep grows
 * and every session of the revision measured over the same decades (the cache key is the decades).
 *
 * @throws RangeError for a range that is not positive and rising, or fewer than 2 points per decade
 * @example monteCarloBandGrid(12, 95_000, 10) // → 41 frequencies from 10 Hz to 100 kHz
 */
export function monteCarloBandGrid(minimumHz: number, maximumHz: number, perDecade = 10): { firstDecade: number; lastDecade: number; frequenciesHz: number[] } {
  if (!(minimumHz > 0) || !(maximumHz >= minimumHz) || !Number.isFinite(maximumHz) || !Number.isInteger(perDecade) || perDecade < 2) {
    throw new RangeError(`monteCarloBandGrid requires 0 < minimum ≤ maximum and at least 2 points per decade, got ${minimumHz}, ${maximumHz}, ${perDecade}`);
  }
  const firstDecade = Math.floor(Math.log10(minimumHz) + 1e-12);
  const lastDecade = Math.max(firstDecade + 1, Math.ceil(Math.log10(maximumHz) - 1e-12));
  const steps = (lastDecade - firstDecade) * perDecade;
  const frequenciesHz = Array.from({ length: steps + 1 }, (_, step) => Number((10 ** (firstDecade + step / perDecade)).toPrecision(12)));
  return { firstDecade, lastDecade, frequenciesHz };
}

/**
 * The design's prediction thinned for drawing: the server predicts at every measured frequency
 * (100,000 points for a long sweep), far more than a chart has pixel columns. Above 4 × widthPx
 * points, keeps per pixel column of the log axis the first, last, lowest and highest point of the
 * nominal curve and of both op-amp-sign edges (decimateForLogAxis), so the drawn curve and band
 * are unchanged. Sorted by frequency; points at 0 Hz or below dropped. O(n) (O(n log n) unsorted);
 * O(kept) when `alignedKeep` gives the measured points' thinning and the prediction lines up with them.
 */
export function thinPrediction(prediction: readonly PredictedPoint[], widthPx: number, alignedKeep?: { points: readonly CmrrPoint[]; keptIndices: Uint32Array | null }): PredictedPoint[] {
  // The server predicts at the measured frequencies: where the prediction lines up with the points,
  // the points' own thinning serves it too (a smooth curve needs no extremes of its own).
  if (alignedKeep?.keptIndices && prediction.length === alignedKeep.points.length) {
    const picked: PredictedPoint[] = [];
    let aligned = true;
    for (const index of alignedKeep.keptIndices) {
      const point = prediction[index];
      if (point.frequencyHz !== alignedKeep.points[index].frequencyHz) {
        aligned = false;
        break;
      }
      if (point.frequencyHz > 0) picked.push(point);
    }
    if (aligned) return picked;
  }
  const usable: PredictedPoint[] = [];
  let sorted = true;
  for (const point of prediction) {
    if (!(point.frequencyHz > 0)) continue;
    if (usable.length > 0 && point.frequencyHz < usable[usable.length - 1].frequencyHz) sorted = false;
    usable.push(point);
  }
  if (!sorted) usable.sort((a, b) => a.frequencyHz - b.frequencyHz);
  if (usable.length <= 4 * widthPx) return usable;
  // Plain loops into typed arrays: Float64Array.from with a callback is several times slower on 100,000 points in V8.
  const count = usable.length;
  const frequencyHz = new Float64Array(count);
  const curves = [new Float64Array(count), new Float64Array(count), new Float64Array(count), new Float64Array(count), new Float64Array(count)];
  for (let index = 0; index < count; index++) {
    const point = usable[index];
    frequencyHz[index] = point.frequencyHz;
    curves[0][index] = point.cmrrDb ?? Number.NaN;
    curves[1][index] = point.cmrrBandLowDb ?? Number.NaN;
    curves[2][index] = point.cmrrBandHighDb ?? Number.NaN;
    curves[3][index] = point.adDb;
    curves[4][index] = point.acmDb ?? Number.NaN;
  }
  const kept = decimateForLogAxis(frequencyHz, curves, widthPx);
  const out = new Array<PredictedPoint>(kept.length);
  for (let index = 0; index < kept.length; index++) out[index] = usable[kept[index]];
  return out;
}

/**
 * A long session's CMRR points thinned for drawing, with the fit's per-point values picked to
 * match (the smooth description is drawn from them). Above 4 × widthPx points, keeps per pixel
 * column of the log axis the first and last point and the lowest and highest of: resolved CMRR,
 * floor-limited CMRR, |Ad| and |Acm| (decimateForLogAxis). The lowest resolved point of a column is
 * its worst margin wherever the limit is flat across the column, so a column with a failing point
 * keeps one. Done once per analysis, so a limit mask or Monte Carlo band arriving later does not
 * walk all the points again. `keptIndices` (null when nothing was thinned) are indices into
 * `points`, rising in frequency. O(n) (n log n when unsorted).
 */
export function thinSessionPoints(
  points: readonly CmrrPoint[],
  fit: FrequencyFit | null,
  widthPx: number,
): { points: CmrrPoint[]; fit: FrequencyFit | null; keptIndices: Uint32Array | null } {
  const count = points.length;
  if (count <= 4 * widthPx) return { points: points as CmrrPoint[], fit, keptIndices: null };
  const order = new Uint32Array(count);
  let sorted = true;
  for (let index = 0; index < count; index++) {
    order[index] = index;
    if (index > 0 && points[index].frequencyHz < points[index - 1].frequencyHz) sorted = false;
  }
  if (!sorted) order.sort((a, b) => points[a].frequencyHz - points[b].frequencyHz);
  const frequencyHz = new Float64Array(count);
  const resolved = new Float64Array(count);
  const bounds = new Float64Array(count);
  const adDb = new Float64Array(count);
  const acmDb = new Float64Array(count);
  for (let at = 0; at < count; at++) {
    const point = points[order[at]];
    frequencyHz[at] = point.frequencyHz;
    resolved[at] = point.lowerBound ? Number.NaN : point.cmrrDb;
    bounds[at] = point.lowerBound ? point.cmrrDb : Number.NaN;
    adDb[at] = point.ad;
    acmDb[at] = point.acm;
  }
  // Magnitudes rather than dB: the extremes are the same points, and no logarithms are needed.
  const kept = decimateForLogAxis(frequencyHz, [resolved, bounds, adDb, acmDb], widthPx);
  const keptIndices = new Uint32Array(kept.length);
  const thinned = new Array<CmrrPoint>(kept.length);
  for (let index = 0; index < kept.length; index++) {
    keptIndices[index] = order[kept[index]];
    thinned[index] = points[keptIndices[index]];
  }
  if (!fit) return { points: thinned, fit, keptIndices };
  const pick = (values: number[]) => (values.length === count ? Array.from(keptIndices, (index) => values[index]) : values);
  return { points: thinned, fit: { ...fit, fittedCmrrDb: pick(fit.fittedCmrrDb), residualsDb: pick(fit.residualsDb) }, keptIndices };
}
