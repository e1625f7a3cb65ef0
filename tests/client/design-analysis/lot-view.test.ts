import { describe, expect, it } from 'vitest';
import type { LotSummary } from '../../../shared/analysis/lot-summary';
import type { SessionAnalysis } from '../../../shared/schemas/analysis';
import type { LotData, LotUnitData } from '../../../src/features/lots/api/get-lot';
import { lotReadout, prepareLotChart } from '../../../src/features/lots/components/lot-chart-data';
import { lotUnitRows, sortLotUnitRows } from '../../../src/features/lots/components/lot-units';
import { bridgeCircuit, bridgeMask } from './fixtures';

// A three-unit lot with invented readings (demo-style numbers, no source needed).
function unit(serial: string, measuredAt: string, readings: [number, number, boolean, string][]): LotUnitData {
  const points = readings.map(([frequencyHz, cmrrDb, lowerBound]) => ({ frequencyHz, cmrrDb, lowerBound, ad: 10, acm: 10 / 10 ** (cmrrDb / 20), interpolated: false, commonModeLine: 1 }));
  const analysis = {
    sessionId: `s-${serial}`,
    status: 'complete',
    message: null,
    pointCounts: { differential: points.length, commonMode: points.length },
    points,
    fit: null,
    warnings: [],
    prediction: [],
    limits: { guardBandDb: 1, overall: readings.some((reading) => reading[3] === 'fail') ? 'fail' : 'pass', verdicts: readings.map(([frequencyHz, cmrrDb, lowerBound, outcome]) => ({ frequencyHz, cmrrDb, lowerBound, limitDb: 80, marginDb: cmrrDb - 80, outcome })) },
    computedAt: '2026-10-05T09:00:00.000Z',
  } as SessionAnalysis;
  return { sessionId: `s-${serial}`, unitSerial: serial, measuredAt, status: 'open', operator: 'Ines Halvorsen', analysis };
}

const units = [
  unit('HRB204-0002', '2026-10-08T10:15:00.000Z', [[10, 78, false, 'fail'], [1000, 77.5, false, 'fail']]),
  unit('HRB204-0010', '2026-10-05T09:15:00.000Z', [[10, 95, false, 'pass'], [1000, 96, true, 'pass']]),
  unit('HRB204-0001', '2026-10-20T09:15:00.000Z', [[10, 85, false, 'pass'], [1000, 84, false, 'pass']]),
];

const summary = {
  frequencies: [{ frequencyHz: 1000, limitDb: 80, readings: [], resolvedCount: 2, boundCount: 1, missingCount: 0, meanDb: 80.75, standardDeviationDb: 4.6, minimumDb: 77.5, p05Db: null, p95Db: null, cpk: 0.05, outliers: [{ sessionId: 's-HRB204-0002', unitSerial: 'HRB204-0002', cmrrDb: 77.5, modifiedZ: -4.2, direction: 'low' }], spread: null }],
  units: [
    { sessionId: 's-HRB204-0002', unitSerial: 'HRB204-0002', outcome: 'fail', tightestMarginDb: -2.5, tightestFrequencyHz: 1000, tightestIsLowerBound: false, outlierFrequenciesHz: [1000] },
    { sessionId: 's-HRB204-0010', unitSerial: 'HRB204-0010', outcome: 'pass', tightestMarginDb: 15, tightestFrequencyHz: 10, tightestIsLowerBound: false, outlierFrequenciesHz: [] },
  ],
  counts: { pass: 1, fail: 1, indeterminate: 0, 'outside-mask': 0 },
  verdictSentence: '3 units: 1 pass, 1 fail.',
  spreadSentence: null,
} as unknown as LotSummary;

const lot: LotData = {
  design: { id: 'd1', name: 'LC-Bridge front-end board HRB-204' },
  revision: { id: 'r1', revision: 1, label: 'rev C', circuit: bridgeCircuit(), limitMask: bridgeMask },
  units,
  predictedBand: [
    { frequencyHz: 10, p05Db: 74, p50Db: 82, p95Db: 100 },
    { frequencyHz: 1000, p05Db: 74, p50Db: 82, p95Db: 100 },
  ],
  summary,
};

describe('prepareLotChart', () => {
  const chart = prepareLotChart(lot);

  it('puts every unit, the band and the mask on one ascending grid', () => {
    expect(chart.frequencyHz).toEqual([10, 1000, 20_000]); // unit and band frequencies plus the mask corners
    expect(chart.units.map((series) => series.unitSerial)).toEqual(['HRB204-0002', 'HRB204-0010', 'HRB204-0001']);
    expect(chart.band?.p05).toEqual([74, 74, null]);
    expect(chart.limit).toEqual([80, 80, 70]); // the mask corners themselves
    expect(chart.limitGuard).toEqual([81, 81, 71]); // + the 1 dB guard band
  });

  it('keeps lower bounds apart from values and records failing points', () => {
    const bounded = chart.units[1];
    expect(bounded.values).toEqual([95, null, null]);
    expect(bounded.bounds).toEqual([null, 96, null]);
    expect(chart.units[0].failingIndices).toEqual([0, 1]);
  });

  it('places the summary’s outliers on the grid and pads the y range to whole 10 dB', () => {
    expect(chart.outliers).toEqual([{ index: 1, unitSerial: 'HRB204-0002', sessionId: 's-HRB204-0002', cmrrDb: 77.5, modifiedZ: -4.2, direction: 'low' }]);
    expect(chart.yRangeDb).toEqual([60, 110]); // 70 − 3 → 60, 100 + 3 → 110
  });

  it('reads every unit at a frequency, highest first, with bounds, failures and outliers flagged', () => {
    const readout = lotReadout(chart, 1);
    expect(readout.frequencyHz).toBe(1000);
    expect(readout.entries.map((entry) => [entry.unitSerial, entry.cmrrDb, entry.lowerBound, entry.failing, entry.outlier?.modifiedZ ?? null])).toEqual([
      ['HRB204-0010', 96, true, false, null],
      ['HRB204-0001', 84, false, false, null],
      ['HRB204-0002', 77.5, false, true, -4.2],
    ]);
    expect(readout.band).toEqual({ p05: 74, p50: 82, p95: 100 });
    expect(readout.limitDb).toBe(80);
  });
});

describe('lotUnitRows and sortLotUnitRows', () => {
  const rows = lotUnitRows(lot);

  it('joins each unit with its verdict and says why a unit has none', () => {
    expect(rows.map((row) => [row.unitSerial, row.outcome, row.tightestMarginDb])).toEqual([
      ['HRB204-0002', 'fail', -2.5],
      ['HRB204-0010', 'pass', 15],
      ['HRB204-0001', 'none', null],
    ]);
    expect(rows[2].note).toBe('No complete analysis yet');
  });

  it('sorts by unit serial numerically, by verdict worst first, and by margin with missing margins last', () => {
    expect(sortLotUnitRows(rows, 'unit', 'asc').map((row) => row.unitSerial)).toEqual(['HRB204-0001', 'HRB204-0002', 'HRB204-0010']);
    expect(sortLotUnitRows(rows, 'verdict', 'asc').map((row) => row.outcome)).toEqual(['fail', 'pass', 'none']);
    expect(sortLotUnitRows(rows, 'margin', 'desc').map((row) => row.tightestMarginDb)).toEqual([15, -2.5, null]);
    expect(sortLotUnitRows(rows, 'margin', 'asc').map((row) => row.tightestMarginDb)).toEqual([-2.5, 15, null]);
    expect(sortLotUnitRows(rows, 'measured', 'desc').map((row) => row.unitSerial)).toEqual(['HRB204-0001', 'HRB204-0002', 'HRB204-0010']);
  });
});
