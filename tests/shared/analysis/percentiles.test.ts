import { describe, expect, it } from 'vitest';
import { linearPercentiles, percentilesInPlace } from '../../../shared/analysis';
import { createSeededRandom } from '../../../shared/engine';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

/** Same order statistics and interpolation: rounding only. */
const ROUNDING = 1e-12;

describe('percentilesInPlace', () => {
  it.skipIf(!hasNumpy)('equals numpy.percentile with its default linear method', () => {
    const random = createSeededRandom(8);
    const percents = [0, 0.5, 5, 33.3, 50, 95, 99.5, 100];
    const samples = [1, 2, 7, 1000, 10_001].map((count) => Array.from({ length: count }, () => random.nextFloat64() * 100 - 50));
    // One python run for every sample (each start costs about a second on a loaded machine).
    const expected = runPython<number[][]>(
      'import json, sys, numpy as np\nd = json.load(sys.stdin)\nprint(json.dumps([np.percentile(v, d["p"]).tolist() for v in d["v"]]))',
      { v: samples, p: percents },
    );
    samples.forEach((values, sample) => {
      percentilesInPlace(Float64Array.from(values), percents).forEach((value, index) => expect(Math.abs(value - expected[sample][index])).toBeLessThan(ROUNDING));
    });
  });

  it('returns the single value of a one-element sample and handles infinite values', () => {
    expect(percentilesInPlace(Float64Array.of(3), [5, 95])).toEqual([3, 3]);
    // numpy gives inf for the 50th percentile of [1, inf, inf] (position 1 lies on an infinite value).
    expect(linearPercentiles([1, Infinity, Infinity], [50])).toEqual([Infinity]);
  });

  it('refuses an empty sample and a percent outside 0 … 100', () => {
    expect(() => percentilesInPlace(new Float64Array(0), [5])).toThrow(RangeError);
    expect(() => linearPercentiles([1, 2], [101])).toThrow(/0 … 100/);
  });
});
