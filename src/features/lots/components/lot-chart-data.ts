// The lot chart on one log-frequency grid: every unit's measured CMRR (values joined by a line,
// lower bounds and failing points as markers), the predicted Monte Carlo band behind them, the
// limit mask, and the outliers the lot summary flagged. Pure, for uPlot's aligned data.
import type { LotUnitData, LotData } from '../api/get-lot';
import { limitOnGrid } from '../../../lib/charts/mask-crossings';

export interface LotUnitSeries {
  sessionId: string;
  unitSerial: string;
  /** Resolved CMRR, dB, on the grid; null where the unit has no resolved point. */
  values: (number | null)[];
  /** Lower bounds, dB, on the grid (drawn as open up-triangles, never joined). */
  bounds: (number | null)[];
  /** Grid indices of points the decision rule fails. */
  failingIndices: number[];
  outcome: string;
}

export interface LotOutlierMark {
  index: number;
  unitSerial: string;
  sessionId: string;
  cmrrDb: number;
  modifiedZ: number;
  direction: 'low' | 'high';
}

export interface LotChart {
  frequencyHz: number[];
  units: LotUnitSeries[];
  band: { p05: (number | null)[]; p50: (number | null)[]; p95: (number | null)[] } | null;
  limit: (number | null)[];
  limitGuard: (number | null)[] | null;
  outliers: LotOutlierMark[];
  yRangeDb: [number, number] | null;
}

const SAME_FREQUENCY = 1e-9;

/** Sorted unique frequencies (to 1e-9 relative) and a lookup from any of them to its index. */
function frequencyGrid(all: number[]): { grid: number[]; indexOf: (frequencyHz: number) => number } {
  const sorted = all.filter((value) => value > 0 && Number.isFinite(value)).sort((a, b) => a - b);
  const grid: number[] = [];
  for (const value of sorted) if (grid.length === 0 || value - grid[grid.length - 1] > grid[grid.length - 1] * SAME_FREQUENCY) grid.push(value);
  const indexOf = (frequencyHz: number) => {
    let low = 0;
    let high = grid.length - 1;
    while (low < high) {
      const middle = (low + high) >> 1;
      if (grid[middle] < frequencyHz * (1 - SAME_FREQUENCY)) low = middle + 1;
      else high = middle;
    }
    return Math.abs(grid[low] - frequencyHz) <= frequencyHz * SAME_FREQUENCY ? low : -1;
  };
  return { grid, indexOf };
}

function unitSeries(unit: LotUnitData, length: number, indexOf: (frequencyHz: number) => number): LotUnitSeries {
  const values = new Array<number | null>(length).fill(null);
  const bounds = new Array<number | null>(length).fill(null);
  const failingIndices: number[] = [];
  unit.analysis.points.forEach((point, pointIndex) => {
    const index = indexOf(point.frequencyHz);
    if (index < 0) return;
    if (point.lowerBound) bounds[index] = point.cmrrDb;
    else values[index] = point.cmrrDb;
    if (unit.analysis.limits?.verdicts[pointIndex]?.outcome === 'fail') failingIndices.push(index);
  });
  return { sessionId: unit.sessionId, unitSerial: unit.unitSerial, values, bounds, failingIndices, outcome: unit.analysis.limits?.overall ?? 'outside-mask' };
}

/**
 * Prepares the lot chart. Units keep their own points (no interpolation); the band sits on its
 * own frequencies (the server computes it at the units' frequencies); the limit is evaluated on
 * the whole grid inside the mask. Outliers are placed at the summary frequency with the value
 * the summary interpolated. O(total points · log).
 */
export function prepareLotChart(lot: LotData): LotChart {
  const mask = lot.revision.limitMask;
  const { grid, indexOf } = frequencyGrid([
    ...lot.units.flatMap((unit) => unit.analysis.points.map((point) => point.frequencyHz)),
    ...lot.predictedBand.map((point) => point.frequencyHz),
    ...mask.points.map((point) => point.frequencyHz),
    ...(lot.summary?.frequencies.map((entry) => entry.frequencyHz) ?? []),
  ]);
  const length = grid.length;
  const units = lot.units.map((unit) => unitSeries(unit, length, indexOf));

  let band: LotChart['band'] = null;
  if (lot.predictedBand.length > 0) {
    const empty = () => new Array<number | null>(length).fill(null);
    band = { p05: empty(), p50: empty(), p95: empty() };
    for (const point of lot.predictedBand) {
      const index = indexOf(point.frequencyHz);
      if (index < 0) continue;
      band.p05[index] = point.p05Db;
      band.p50[index] = point.p50Db;
      band.p95[index] = point.p95Db;
    }
  }

  const limits = limitOnGrid(grid, mask.points);
  const limit = Array.from(limits, (value) => (Number.isNaN(value) ? null : value));
  const limitGuard = mask.guardBandDb > 0 ? limit.map((value) => (value === null ? null : value + mask.guardBandDb)) : null;

  const outliers: LotOutlierMark[] = [];
  for (const entry of lot.summary?.frequencies ?? []) {
    const index = indexOf(entry.frequencyHz);
    if (index < 0) continue;
    for (const outlier of entry.outliers) outliers.push({ index, unitSerial: outlier.unitSerial, sessionId: outlier.sessionId, cmrrDb: outlier.cmrrDb, modifiedZ: outlier.modifiedZ, direction: outlier.direction });
  }

  let low = Infinity;
  let high = -Infinity;
  const include = (values: readonly (number | null)[]) => {
    for (const value of values) {
      if (value === null || !Number.isFinite(value)) continue;
      if (value < low) low = value;
      if (value > high) high = value;
    }
  };
  for (const unit of units) {
    include(unit.values);
    include(unit.bounds);
  }
  if (band) {
    include(band.p05);
    include(band.p95);
  }
  include(limit);
  const yRangeDb: [number, number] | null = low === Infinity ? null : [Math.floor((low - 3) / 10) * 10, Math.ceil((high + 3) / 10) * 10];
  return { frequencyHz: grid, units, band, limit, limitGuard, outliers, yRangeDb };
}

/** One line of the lot readout: a unit's value at the cursor. */
export interface LotReadoutEntry {
  unitSerial: string;
  cmrrDb: number;
  lowerBound: boolean;
  failing: boolean;
  outlier: LotOutlierMark | null;
}

/** Every unit's reading at one grid index, highest first, with the band and the limit there. */
export function lotReadout(chart: LotChart, index: number): { frequencyHz: number; entries: LotReadoutEntry[]; band: { p05: number; p50: number; p95: number } | null; limitDb: number | null } {
  const entries: LotReadoutEntry[] = [];
  for (const unit of chart.units) {
    const value = unit.values[index] ?? unit.bounds[index];
    if (value === null || value === undefined) continue;
    entries.push({
      unitSerial: unit.unitSerial,
      cmrrDb: value,
      lowerBound: unit.values[index] === null,
      failing: unit.failingIndices.includes(index),
      outlier: chart.outliers.find((mark) => mark.index === index && mark.sessionId === unit.sessionId) ?? null,
    });
  }
  entries.sort((a, b) => b.cmrrDb - a.cmrrDb);
  const band = chart.band && chart.band.p05[index] !== null && chart.band.p50[index] !== null && chart.band.p95[index] !== null ? { p05: chart.band.p05[index]!, p50: chart.band.p50[index]!, p95: chart.band.p95[index]! } : null;
  return { frequencyHz: chart.frequencyHz[index], entries, band, limitDb: chart.limit[index] };
}
