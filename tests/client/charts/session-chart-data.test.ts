import { describe, expect, it } from 'vitest';
import { fitCmrrFrequencyResponse, logSpacedFrequencies, predictDifferenceAmplifier, type CmrrPoint } from '../../../shared/engine';
import { predictDesign } from '../../../shared/design-prediction';
import { prepareSessionCharts, seriesDataIndex, toAlignedData } from '../../../src/lib/charts/session-chart-data';
import { differenceCircuit, pointsFromPrediction } from '../../shared/analysis/fixtures';

function point(frequencyHz: number, cmrrDb: number, lowerBound = false): CmrrPoint {
  return { frequencyHz, ad: 10, acm: 10 / 10 ** (cmrrDb / 20), cmrrDb, lowerBound, interpolated: false, commonModeLine: 2 };
}

const values = (chart: ReturnType<typeof prepareSessionCharts>['cmrr'], key: string) => chart.series.find((series) => series.key === key)!.values;

describe('prepareSessionCharts', () => {
  it('puts measured values and lower bounds in separate series on one ascending grid', () => {
    const charts = prepareSessionCharts({ points: [point(1000, 70), point(10, 90), point(100, 85, true)] });
    expect(charts.cmrr.frequencyHz).toEqual([10, 100, 1000]);
    expect(values(charts.cmrr, 'cmrr-measured')).toEqual([90, null, 70]);
    expect(values(charts.cmrr, 'cmrr-bound')).toEqual([null, 85, null]);
    // Acm of a bound point is an upper bound on the gain: its own series on the gain chart.
    expect(values(charts.gains, 'acm-bound')[1]).toBeCloseTo(20 - 85, 9);
  });

  it('draws a first-order fit from its model on a dense log grid merged with the measured points', () => {
    const prediction = predictDifferenceAmplifier(logSpacedFrequencies(10, 1e5, 21), { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100.05e3 }, {
      openLoopGainDb: 120,
      gainBandwidthHz: 1e7,
      cmrrDb: 120,
      cmrrCornerHz: 30,
    });
    const points = pointsFromPrediction(prediction);
    const fit = fitCmrrFrequencyResponse(points);
    const charts = prepareSessionCharts({ points, fit }, { fitGridPoints: 64 });
    const grid = charts.cmrr.frequencyHz;
    for (let index = 1; index < grid.length; index++) expect(grid[index]).toBeGreaterThan(grid[index - 1]);
    const fitted = values(charts.cmrr, 'cmrr-fit');
    expect(fitted.filter((value) => value !== null)).toHaveLength(64);
    // The model CMRR(f) = Ad0/sqrt(Acm0² + (k f)²) (DOMAIN.md) at the first grid point, 10 Hz.
    const { acm0, kPerHz } = fit.commonModeGainModel!;
    expect(fitted[0]).toBeCloseTo(20 * Math.log10(fit.differentialGainDc / Math.hypot(acm0, kPerHz * 10)), 9);
    // Every series is aligned to the grid.
    for (const series of [...charts.cmrr.series, ...charts.gains.series]) expect(series.values).toHaveLength(grid.length);
  });

  it('adds the prediction with its op-amp-sign band and the Monte Carlo band as uPlot bands', () => {
    const circuit = differenceCircuit();
    circuit.r4 = { ohms: 100.05e3, tolerance: 0.0005 };
    const charts = prepareSessionCharts({
      points: [point(100, 80), point(1000, 75)],
      prediction: predictDesign(circuit, [100, 1000, 10_000]),
      monteCarloBand: [{ frequencyHz: 100, p05Db: 78, p50Db: 86, p95Db: 100 }],
    });
    expect(charts.cmrr.bands).toEqual([
      { lowerKey: 'cmrr-predicted-low', upperKey: 'cmrr-predicted-high', role: 'op-amp-sign-band' },
      { lowerKey: 'cmrr-mc-p05', upperKey: 'cmrr-mc-p95', role: 'monte-carlo-band' },
    ]);
    expect(charts.cmrr.frequencyHz).toEqual([100, 1000, 10_000]);
    expect(values(charts.cmrr, 'cmrr-mc-p50')).toEqual([86, null, null]);
    const low = values(charts.cmrr, 'cmrr-predicted-low');
    const high = values(charts.cmrr, 'cmrr-predicted-high');
    low.forEach((value, index) => expect(value!).toBeLessThanOrEqual(high[index]!));
  });

  it('draws the limit on every grid point inside the mask, marks failing points and finds the crossing', () => {
    const mask = { points: [{ frequencyHz: 10, minimumCmrrDb: 80 }, { frequencyHz: 10_000, minimumCmrrDb: 60 }], guardBandDb: 1 };
    const charts = prepareSessionCharts({ points: [point(10, 90), point(100, 70.5), point(1000, 60), point(20_000, 50)], limitMask: mask });
    // Grid: 10, 100, 1000, 10 000 (mask corner), 20 000; limit linear in log f: 80, 73.33, 66.67, 60, none.
    expect(charts.cmrr.frequencyHz).toEqual([10, 100, 1000, 10_000, 20_000]);
    const limit = values(charts.cmrr, 'limit');
    expect(limit[1]).toBeCloseTo(80 - 20 / 3, 9);
    expect(limit[4]).toBeNull();
    expect(values(charts.cmrr, 'limit-guard')[0]).toBe(81);
    // 70.5 against 73.33 fails by more than the 1 dB guard band; 60 against 66.67 fails; 20 kHz is outside the mask.
    expect(charts.outcomes).toEqual(['pass', 'fail', 'fail', null, 'outside-mask']);
    expect(values(charts.cmrr, 'cmrr-failing')).toEqual([null, 70.5, 60, null, null]);
    expect(charts.crossings).toHaveLength(1);
    expect(charts.crossings[0].direction).toBe('falls-below');
    expect(charts.crossings[0].frequencyHz).toBeGreaterThan(10);
    expect(charts.crossings[0].frequencyHz).toBeLessThan(100);
  });

  it('decimates 100,000 points per pixel column, keeping the extremes and the worst failing point', () => {
    const count = 100_000;
    const points = Array.from({ length: count }, (_, index) => {
      const frequencyHz = 10 * 10 ** ((4 * index) / (count - 1));
      return point(frequencyHz, 80 - 10 * Math.log10(1 + (frequencyHz / 2000) ** 2) + 0.3 * Math.sin(index), index % 101 === 0);
    });
    const mask = { points: [{ frequencyHz: 10, minimumCmrrDb: 60 }, { frequencyHz: 1e5, minimumCmrrDb: 60 }] };
    const full = prepareSessionCharts({ points, limitMask: mask });
    const decimated = prepareSessionCharts({ points, limitMask: mask }, { widthPx: 1200 });
    expect(full.keptPointCount).toBe(count);
    expect(decimated.keptPointCount).toBeLessThan(count / 5);
    // The sweep falls below 60 dB above about 60 kHz; the decimated chart still shows failures there, at most 4 per column.
    const failingFull = full.outcomes.filter((outcome) => outcome === 'fail').length;
    const failingKept = decimated.outcomes.filter((outcome) => outcome === 'fail').length;
    expect(failingFull).toBeGreaterThan(1000);
    expect(failingKept).toBeGreaterThan(0);
    expect(failingKept).toBeLessThanOrEqual(4 * 1200);
    const worstFailing = (chart: typeof full.cmrr) => Math.min(...values(chart, 'cmrr-failing').filter((value): value is number => value !== null));
    expect(worstFailing(decimated.cmrr)).toBe(worstFailing(full.cmrr));
    const extremes = (chart: typeof full.cmrr) => {
      const finite = [...values(chart, 'cmrr-measured'), ...values(chart, 'cmrr-bound')].filter((value): value is number => value !== null);
      return [Math.min(...finite), Math.max(...finite)];
    };
    expect(extremes(decimated.cmrr)).toEqual(extremes(full.cmrr));
  });

  it('shapes uPlot aligned data with x first and series in order', () => {
    const charts = prepareSessionCharts({ points: [point(10, 90), point(100, 85)] });
    const data = toAlignedData(charts.cmrr);
    expect(data[0]).toEqual([10, 100]);
    expect(data[seriesDataIndex(charts.cmrr, 'cmrr-measured')]).toEqual([90, 85]);
    expect(seriesDataIndex(charts.cmrr, 'nothing')).toBe(-1);
  });

  it('suggests a y range padded and rounded to 10 dB', () => {
    expect(prepareSessionCharts({ points: [point(10, 91), point(100, 62)] }).cmrr.yRangeDb).toEqual([50, 100]);
    expect(prepareSessionCharts({ points: [] }).cmrr.yRangeDb).toBeNull();
  });
});
