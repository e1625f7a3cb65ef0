import { describe, expect, it } from 'vitest';
import { EngineInputError } from '../../../shared/engine/errors';
import { lotStatistics, lotStatisticsByFrequency } from '../../../shared/engine/lot-statistics';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

/** Sums of a few dozen values in double precision. */
const ROUNDING = 1e-12;

describe('lotStatistics', () => {
  it('gives Cpk = (mean − LSL)/(3s) for a lot with mean 16 and s = 2 against LSL 8', () => {
    // NIST/SEMATECH e-Handbook §6.1.6 definition; values 14, 14, 16, 18, 18 have mean 16 and sample s = 2
    // (squared deviations 4 + 4 + 0 + 4 + 4 = 16 over n − 1 = 4), so Cpk = 8/6 (handbook worked numbers, from memory).
    const result = lotStatistics([14, 14, 16, 18, 18], 8);
    expect(result.meanDb).toBe(16);
    expect(result.standardDeviationDb).toBe(2);
    expect(result.minimumDb).toBe(14);
    expect(Math.abs((result.cpk ?? NaN) - 4 / 3)).toBeLessThan(ROUNDING);
  });

  it.skipIf(!hasNumpy)('agrees with numpy’s mean, std(ddof=1) and the handbook Cpk on a lot of CMRR values', () => {
    const values = [96.2, 94.8, 97.5, 93.1, 95.9, 98.4, 92.7, 95.0, 96.8, 94.4, 97.1, 93.9];
    const expected = runPython<{ mean: number; std: number; min: number; cpk: number }>(
      `
import json, sys, numpy as np
v = np.array(json.load(sys.stdin))
s = v.std(ddof=1)
print(json.dumps({'mean': v.mean(), 'std': s, 'min': v.min(), 'cpk': (v.mean() - 90) / (3 * s)}))
`,
      values,
    );
    const result = lotStatistics(values, 90);
    expect(Math.abs(result.meanDb - expected.mean)).toBeLessThan(ROUNDING * 100);
    expect(Math.abs((result.standardDeviationDb ?? NaN) - expected.std)).toBeLessThan(ROUNDING * 100);
    expect(result.minimumDb).toBe(expected.min);
    expect(Math.abs((result.cpk ?? NaN) - expected.cpk)).toBeLessThan(ROUNDING * 100);
  });

  it('leaves the spread and Cpk undefined for one unit or no spread, and Cpk out without a limit', () => {
    expect(lotStatistics([80], 70)).toMatchObject({ count: 1, standardDeviationDb: null, cpk: null });
    expect(lotStatistics([80, 80], 70).cpk).toBeNull();
    expect(lotStatistics([80, 82]).cpk).toBeUndefined();
  });

  it('gives a negative Cpk when the mean is below the limit', () => {
    expect(lotStatistics([60, 62], 70).cpk).toBeLessThan(0);
  });

  it('names the unit with a non-finite value and rejects an empty lot', () => {
    expect(() => lotStatistics([])).toThrowError(EngineInputError);
    expect(() => lotStatistics([80, Number.NaN])).toThrowError(/row 2/);
    expect(() => lotStatistics([80], Infinity)).toThrowError(/field "lowerLimitDb"/);
  });
});

describe('lotStatisticsByFrequency', () => {
  it('summarises each frequency and takes its limit from the mask', () => {
    const mask = {
      points: [
        { frequencyHz: 100, minimumCmrrDb: 80 },
        { frequencyHz: 10_000, minimumCmrrDb: 60 },
      ],
    };
    const rows = lotStatisticsByFrequency(
      [100, 1000, 100_000],
      [
        [90, 80, 50],
        [92, 84, 52],
      ],
      mask,
    );
    expect(rows[0]).toMatchObject({ frequencyHz: 100, meanDb: 91, lowerLimitDb: 80 });
    expect(rows[1].lowerLimitDb).toBeCloseTo(70, 12);
    expect(rows[2].lowerLimitDb).toBeUndefined();
    expect(rows[2].cpk).toBeUndefined();
  });

  it('names the unit whose row has the wrong length', () => {
    expect(() => lotStatisticsByFrequency([100, 200], [[1, 2], [3]])).toThrowError(/row 2/);
    expect(() => lotStatisticsByFrequency([100], [])).toThrowError(/at least one unit/);
  });
});
