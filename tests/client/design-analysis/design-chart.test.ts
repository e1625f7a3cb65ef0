import { describe, expect, it } from 'vitest';
import { predictDesign } from '../../../shared/design-prediction';
import { designReadout, prepareDesignChart } from '../../../src/features/design-analysis/components/design-chart-data';
import { histogramBars } from '../../../src/features/design-analysis/components/histogram-data';
import { bridgeCircuit, bridgeMask } from './fixtures';

const frequencies = [10, 1000, 20_000];
// Invented band values (the chart only places them; the worker's numbers are tested against the analysis).
const band = [
  { frequencyHz: 10, p05Db: 74, p50Db: 82, p95Db: 95, worstCaseDb: 68.6 },
  { frequencyHz: 1000, p05Db: 74, p50Db: 82, p95Db: 95, worstCaseDb: 68.5 },
  { frequencyHz: 20_000, p05Db: 70, p50Db: 76, p95Db: 85, worstCaseDb: 66 },
];

describe('prepareDesignChart', () => {
  // R4 0.1 % high: with a nominal mismatch the two op-amp signs give different CMRR, hence a sign band
  // (a matched nominal design gives the same magnitude for both signs, and no band).
  const prediction = predictDesign({ ...bridgeCircuit(), r4: { ohms: 49_949.9, tolerance: 0.001 } }, frequencies);

  it('draws the prediction, its sign band, the Monte Carlo band, the limit and the worst case on one grid', () => {
    const chart = prepareDesignChart(prediction, band, bridgeMask);
    expect(chart.frequencyHz).toEqual(frequencies);
    expect(chart.series.map((series) => series.key)).toEqual(['cmrr-predicted', 'cmrr-predicted-low', 'cmrr-predicted-high', 'cmrr-mc-p05', 'cmrr-mc-p50', 'cmrr-mc-p95', 'limit', 'limit-guard', 'cmrr-worst-case']);
    expect(chart.bands.map((entry) => entry.role)).toEqual(['op-amp-sign-band', 'monte-carlo-band']);
    expect(chart.series.at(-1)?.values).toEqual([68.6, 68.5, 66]);
    expect(chart.yRangeDb?.[0]).toBe(60); // lowest curve 66 dB − 3 → 60
  });

  it('shows the prediction alone while the band is on its way', () => {
    const chart = prepareDesignChart(prediction, null, bridgeMask);
    expect(chart.series.some((series) => series.key.startsWith('cmrr-mc') || series.key === 'cmrr-worst-case')).toBe(false);
  });

  it('reads every curve at a frequency with the 5th percentile’s margin over the limit', () => {
    const readout = designReadout(prepareDesignChart(prediction, band, bridgeMask), 2);
    expect(readout.frequencyHz).toBe(20_000);
    expect(readout.monteCarloDb).toEqual({ p05: 70, p50: 76, p95: 85 });
    expect(readout.worstCaseDb).toBe(66);
    expect(readout.limitDb).toBe(70); // the mask corner at 20 kHz
    expect(readout.p05MarginDb).toBe(0);
    expect(readout.predictedDb).toBeCloseTo(prediction[2].cmrrDb!, 12);
    expect(readout.signBandDb?.[0]).toBeLessThanOrEqual(readout.signBandDb![1]);
  });
});

describe('histogramBars', () => {
  const histogram = { edgesDb: [70, 72, 74, 76], counts: [5, 10, 20], belowCount: 1, aboveCount: 2 };

  it('splits bins at the limit by their centre and widens the range to the worst case and the limit', () => {
    const bars = histogramBars(histogram, 72.5, 66);
    expect(bars.centresDb).toEqual([71, 73, 75]);
    expect(bars.failingCounts).toEqual([5, null, null]);
    expect(bars.passingCounts).toEqual([null, 10, 20]);
    expect(bars.rangeDb).toEqual([64, 76]); // worst case 66 − one 2 dB step; the top edge stays
  });

  it('counts every bin as passing without a limit', () => {
    expect(histogramBars(histogram, null, null).passingCounts).toEqual([5, 10, 20]);
  });
});
