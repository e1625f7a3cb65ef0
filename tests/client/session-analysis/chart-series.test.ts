import { describe, expect, it } from 'vitest';
import type { CmrrPoint } from '../../../shared/engine';
import { prepareSessionCharts } from '../../../src/lib/charts/session-chart-data';
import { alignToFixedSeries, cmrrSeries, gainSeries, readoutAt, seriesValueAt } from '../../../src/features/session-analysis/components/chart-series';
import { seriesStyle } from '../../../src/features/session-analysis/components/chart-styles';

// Interpolated values agree to 9 decimals (dB): a handful of logs and one multiply, far below display rounding.
const ARITHMETIC_DIGITS = 9;

function point(frequencyHz: number, cmrrDb: number, lowerBound = false): CmrrPoint {
  return { frequencyHz, ad: 10, acm: 10 / 10 ** (cmrrDb / 20), cmrrDb, lowerBound, interpolated: false, commonModeLine: 2 };
}

const mask = { points: [{ frequencyHz: 10, minimumCmrrDb: 80 }, { frequencyHz: 1000, minimumCmrrDb: 60 }] };

describe('alignToFixedSeries', () => {
  it('keeps one column per fixed series, all-null where the prepared chart has none, so uPlot never needs new series', () => {
    const prepared = prepareSessionCharts({ points: [point(10, 90), point(100, 85, true), point(1000, 70)] });
    const aligned = alignToFixedSeries(prepared.cmrr, cmrrSeries);
    expect(aligned.data).toHaveLength(cmrrSeries.length + 1);
    for (const column of aligned.data) expect(column).toHaveLength(prepared.cmrr.frequencyHz.length);
    const measuredAt = cmrrSeries.findIndex((entry) => entry.key === 'cmrr-measured');
    const limitAt = cmrrSeries.findIndex((entry) => entry.key === 'limit');
    expect(aligned.data[measuredAt + 1]).toEqual([90, null, 70]);
    expect(aligned.present[measuredAt]).toBe(true);
    expect(aligned.data[limitAt + 1]).toEqual([null, null, null]);
    expect(aligned.present[limitAt]).toBe(false);
  });

  it('covers every series the preparation can produce for both charts', () => {
    const prepared = prepareSessionCharts({
      points: [point(10, 90), point(100, 85, true), point(1000, 55)],
      prediction: [10, 100, 1000].map((frequencyHz) => ({ frequencyHz, adDb: 20, acmDb: -70, cmrrDb: 90, cmrrBandLowDb: 88, cmrrBandHighDb: 92 })),
      monteCarloBand: [10, 1000].map((frequencyHz) => ({ frequencyHz, p05Db: 70, p50Db: 80, p95Db: 90 })),
      limitMask: { ...mask, guardBandDb: 1 },
    });
    const fixedKeys = new Set([...cmrrSeries, ...gainSeries].map((entry) => entry.key));
    for (const series of [...prepared.cmrr.series, ...prepared.gains.series]) expect(fixedKeys.has(series.key), series.key).toBe(true);
  });
});

describe('seriesValueAt', () => {
  const frequencyHz = [10, 100, 1000];
  it('interpolates a curve linearly in log f between its neighbours, as the chart draws it', () => {
    // Halfway in log f between 10 Hz (80 dB) and 1 kHz (60 dB) is 100 Hz: 70 dB.
    expect(seriesValueAt(frequencyHz, [80, null, 60], 'limit', 1)!.valueDb).toBeCloseTo(70, ARITHMETIC_DIGITS);
  });

  it('reads a measured series at its nearest point and says where that point is', () => {
    expect(seriesValueAt([10, 20, 1000], [90, null, 70], 'measured-value', 1)).toEqual({ valueDb: 90, atFrequencyHz: 10 });
  });

  it('gives nothing outside a curve and nothing for a measured point too far away', () => {
    expect(seriesValueAt(frequencyHz, [null, 80, 60], 'prediction', 0)).toBeNull();
    expect(seriesValueAt(frequencyHz, [90, null, null], 'measured-value', 2, 1)).toBeNull();
    expect(seriesValueAt(frequencyHz, [90, null, null], 'measured-value', 5)).toBeNull();
  });
});

describe('readoutAt', () => {
  it('writes every visible series with its unit: bounds with ≥, the limit with the margin to the measured value', () => {
    const prepared = prepareSessionCharts({ points: [point(10, 90), point(100, 85, true), point(1000, 65)], limitMask: mask });
    const aligned = alignToFixedSeries(prepared.cmrr, cmrrSeries);
    const at1k = readoutAt(cmrrSeries, aligned, 2, () => true)!;
    expect(at1k.frequency).toBe('1 kHz');
    const text = (key: string) => at1k.rows.find((row) => row.key === key)?.text;
    expect(text('cmrr-measured')).toBe('65.0 dB');
    // Limit 60 dB at 1 kHz (the mask's corner); 65 − 60 = +5.0 dB.
    expect(text('limit')).toBe('60.0 dB — margin +5.0 dB');
    const at100 = readoutAt(cmrrSeries, aligned, 1, () => true)!;
    expect(at100.rows.find((row) => row.key === 'cmrr-bound')?.text).toBe('≥ 85.0 dB');
  });

  it('leaves out hidden groups', () => {
    const prepared = prepareSessionCharts({ points: [point(10, 90), point(1000, 65)], limitMask: mask });
    const aligned = alignToFixedSeries(prepared.cmrr, cmrrSeries);
    const rows = readoutAt(cmrrSeries, aligned, 0, (group) => group !== 'limit')!.rows;
    expect(rows.map((row) => row.key)).toEqual(['cmrr-measured']);
  });

  it('names the Monte Carlo band once, from its 5th to its 95th percentile', () => {
    const prepared = prepareSessionCharts({ points: [point(10, 90)], monteCarloBand: [{ frequencyHz: 10, p05Db: 70, p50Db: 80, p95Db: 90 }] });
    const aligned = alignToFixedSeries(prepared.cmrr, cmrrSeries);
    const rows = readoutAt(cmrrSeries, aligned, 0, () => true)!.rows;
    expect(rows.find((row) => row.key === 'cmrr-mc-band')?.text).toBe('70.0 dB to 90.0 dB');
    expect(rows.some((row) => row.key === 'cmrr-mc-p95')).toBe(false);
  });
});

describe('seriesStyle', () => {
  it('draws bounds as open markers without a line and |Ad| with squares (docs/CHARTS.md)', () => {
    expect(seriesStyle('cmrr-bound', 'measured-bound')).toMatchObject({ lineWidth: 0, marker: { shape: 'triangle-up', filled: false } });
    expect(seriesStyle('acm-bound', 'measured-bound').marker?.shape).toBe('triangle-down');
    expect(seriesStyle('ad-measured', 'measured-value').marker?.shape).toBe('square');
    expect(seriesStyle('limit', 'limit').dash).toEqual([8, 3, 2, 3]);
  });
});
