import { describe, expect, it } from 'vitest';
import { EngineInputError } from '../../../shared/engine';
import { binomialUpperTail, summariseLot, type LotUnit } from '../../../shared/analysis';
import { hasNumpy, runPython } from '../../helpers/reference-tools';
import { point } from './fixtures';

/** Same arithmetic as numpy up to summation order. */
const ROUNDING_DB = 1e-9;
const MASK = { points: [{ frequencyHz: 100, minimumCmrrDb: 80 }, { frequencyHz: 10_000, minimumCmrrDb: 60 }], guardBandDb: 0 };
// Flat-ish lot at 100 Hz; each unit measured at 50, 100, 1000, 10000 Hz (values invented for the test).
const AT_100_HZ = [86.1, 88.4, 84.9, 90.2, 87.3, 85.6, 89.0, 86.8, 70.2, 88.1];

function lot(values100Hz: readonly number[]): LotUnit[] {
  return values100Hz.map((value, index) => ({
    sessionId: `s${index + 1}`,
    unitSerial: `HRB204-${String(index + 1).padStart(4, '0')}`,
    points: [point(50, value + 1), point(100, value), point(1000, value - 8), point(10_000, value - 20)],
  }));
}

describe('summariseLot', () => {
  it.skipIf(!hasNumpy)('gives numpy’s mean, sample σ and linear 5/95 % percentiles, and the handbook Cpk', () => {
    const summary = summariseLot(lot(AT_100_HZ), MASK);
    const at100 = summary.frequencies.find((entry) => entry.frequencyHz === 100)!;
    const expected = runPython<{ mean: number; sd: number; p: number[] }>(
      'import json, sys, numpy as np\nv = np.array(json.load(sys.stdin))\nprint(json.dumps({"mean": float(v.mean()), "sd": float(v.std(ddof=1)), "p": np.percentile(v, [5, 95]).tolist()}))',
      AT_100_HZ,
    );
    expect(Math.abs(at100.meanDb! - expected.mean)).toBeLessThan(ROUNDING_DB);
    expect(Math.abs(at100.standardDeviationDb! - expected.sd)).toBeLessThan(ROUNDING_DB);
    expect(Math.abs(at100.p05Db! - expected.p[0])).toBeLessThan(ROUNDING_DB);
    expect(Math.abs(at100.p95Db! - expected.p[1])).toBeLessThan(ROUNDING_DB);
    // NIST/SEMATECH e-Handbook §6.1.6: Cpk against a lower limit alone = (mean − LSL)/(3s).
    expect(Math.abs(at100.cpk! - (expected.mean - 80) / (3 * expected.sd))).toBeLessThan(ROUNDING_DB);
  });

  it('interpolates each unit on log f between its points at a mask corner it was not measured at', () => {
    const units: LotUnit[] = [{ sessionId: 'a', unitSerial: 'HRB204-0001', points: [point(10, 90), point(1000, 70)] }];
    const summary = summariseLot(units, { points: [{ frequencyHz: 100, minimumCmrrDb: 60 }] });
    // Halfway in log f between 90 and 70 dB: 80 dB (linear in log10 f, DOMAIN.md).
    expect(summary.frequencies[0].readings[0].cmrrDb).toBeCloseTo(80, 12);
  });

  it('flags the low unit by the modified z-score (Iglewicz and Hoaglin, |M| > 3.5)', () => {
    const summary = summariseLot(lot(AT_100_HZ), MASK);
    const at100 = summary.frequencies.find((entry) => entry.frequencyHz === 100)!;
    expect(at100.outliers.map((outlier) => outlier.unitSerial)).toEqual(['HRB204-0009']);
    expect(at100.outliers[0].direction).toBe('low');
    // By hand: median 87.05, absolute deviations' median (MAD) 1.4, so M = 0.6745·(70.2 − 87.05)/1.4 ≈ −8.12.
    expect(at100.outliers[0].modifiedZ).toBeCloseTo((0.6745 * (70.2 - 87.05)) / 1.4, 9);
    expect(summary.units[8].outlierFrequenciesHz).toContain(100);
  });

  it('leaves lower bounds out of the statistics but counts and judges them', () => {
    const units = lot([86, 88, 84]);
    units.push({ sessionId: 's4', unitSerial: 'HRB204-0004', points: [point(50, 101, true), point(100, 100, true), point(10_000, 75, true)] });
    const summary = summariseLot(units, MASK);
    const at100 = summary.frequencies.find((entry) => entry.frequencyHz === 100)!;
    expect(at100.boundCount).toBe(1);
    expect(at100.resolvedCount).toBe(3);
    expect(at100.meanDb).toBeCloseTo(86, 12);
    expect(summary.units[3].outcome).toBe('pass');
    expect(summary.units[3].tightestIsLowerBound).toBe(true);
  });

  it('counts a unit not measured across a frequency as missing, never extrapolated', () => {
    const units = lot([86, 88]);
    units.push({ sessionId: 's3', unitSerial: 'HRB204-0003', points: [point(50, 85), point(500, 80)] });
    const at10k = summariseLot(units, MASK).frequencies.find((entry) => entry.frequencyHz === 10_000)!;
    expect(at10k.missingCount).toBe(1);
    expect(at10k.readings[2].cmrrDb).toBeNull();
  });

  it('gives each unit the engine’s mask verdict and its tightest margin', () => {
    const summary = summariseLot(lot(AT_100_HZ), MASK);
    // Unit 9 reads 70.2 dB at 100 Hz against an 80 dB limit: fails by 9.8 dB.
    expect(summary.units[8].outcome).toBe('fail');
    expect(summary.units[8].tightestMarginDb).toBeCloseTo(-9.8, 9);
    expect(summary.counts).toEqual({ pass: 9, fail: 1, indeterminate: 0, 'outside-mask': 0 });
    expect(summary.verdictSentence).toBe('10 units: 9 pass, 1 fail.');
  });

  it('finds the parts as matched as predicted when the units sit inside the predicted band', () => {
    const band = [
      { frequencyHz: 100, p05Db: 83, p50Db: 87.5, p95Db: 95 },
      { frequencyHz: 10_000, p05Db: 63, p50Db: 67.5, p95Db: 75 },
    ];
    const summary = summariseLot(lot(AT_100_HZ.slice(0, 8)), MASK, band);
    const spread = summary.frequencies.find((entry) => entry.frequencyHz === 100)!.spread!;
    expect(spread.assessment).toBe('as-predicted');
    expect(spread.predictedSpreadDb).toBe(12);
    expect(summary.spreadSentence).toMatch(/^As matched as we think\. At 100 Hz the measured 5–95 % spread is/);
  });

  it('finds the parts less matched than predicted when too many units fall below the 5th percentile', () => {
    const band = [{ frequencyHz: 10, p05Db: 88, p50Db: 92, p95Db: 100 }, { frequencyHz: 100_000, p05Db: 88, p50Db: 92, p95Db: 100 }];
    const summary = summariseLot(lot(AT_100_HZ), MASK, band);
    const spread = summary.frequencies.find((entry) => entry.frequencyHz === 100)!.spread!;
    // By hand: 6 of 10 below 88 dB; P(X ≥ 6 | n = 10, p = 0.05) ≈ 2.8e-6, far below 5 %.
    expect(spread.belowBandCount).toBe(6);
    expect(spread.assessment).toBe('less-matched');
    expect(summary.spreadSentence).toMatch(/^Not as matched as we think/);
  });

  it('refuses an empty lot, a bad mask and a negative guard band', () => {
    expect(() => summariseLot([], MASK)).toThrow(EngineInputError);
    expect(() => summariseLot(lot([80]), { points: [] })).toThrow(/at least one point/);
    expect(() => summariseLot(lot([80]), { ...MASK, guardBandDb: -1 })).toThrow(/guard band/);
    expect(() => summariseLot(lot([80]), MASK, undefined, { frequenciesHz: [0] })).toThrow(/entry 1/);
  });
});

describe('binomialUpperTail', () => {
  it.skipIf(!hasNumpy)('equals scipy.stats.binom.sf(k − 1, n, p)', () => {
    const cases = [[0, 10, 0.05], [1, 10, 0.05], [3, 20, 0.05], [7, 10, 0.05], [11, 10, 0.05]];
    const expected = runPython<number[]>(
      'import json, sys\nfrom scipy.stats import binom\nprint(json.dumps([float(binom.sf(k - 1, n, p)) for k, n, p in json.load(sys.stdin)]))',
      cases,
    );
    cases.forEach(([k, n, p], index) => expect(Math.abs(binomialUpperTail(k, n, p) - expected[index])).toBeLessThan(1e-12));
  });
});
