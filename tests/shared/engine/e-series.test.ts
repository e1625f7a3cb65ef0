import { describe, expect, it } from 'vitest';
import { eSeriesDecade, eSeriesValues, nearestESeriesValue, nearestResistorPairs, type ESeriesName } from '../../../shared/engine/e-series';
import { EngineInputError } from '../../../shared/engine/errors';
import { approximateWorstCaseCmrrDb, worstCaseCmrrDb } from '../../../shared/engine/resistor-tolerance';

describe('eSeriesDecade', () => {
  it('has 24, 96 and 192 ascending values from 1.0', () => {
    for (const [series, size] of [
      ['E24', 24],
      ['E96', 96],
      ['E192', 192],
    ] as [ESeriesName, number][]) {
      const values = eSeriesDecade(series);
      expect(values).toHaveLength(size);
      expect(values[0]).toBe(1);
      values.slice(1).forEach((value, index) => expect(value).toBeGreaterThan(values[index]));
    }
  });

  it('lists E24 with its historical values', () => {
    // IEC 60063 E24, from memory.
    expect(eSeriesDecade('E24')).toEqual([
      1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
    ]);
  });

  it('keeps E24’s irregular values where the rounded geometric series would differ', () => {
    // IEC 60063, from memory: 10^(i/24) rounded to two digits gives 2.6, 2.9, 3.2, 3.5, 3.8, 4.2, 4.6 and 8.3 instead.
    const e24 = eSeriesDecade('E24');
    const differing = e24.filter((value, index) => Math.round(10 ** (index / 24) * 10) / 10 !== value);
    expect(differing).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
  });

  it('spot-checks E96 and E192 values', () => {
    // IEC 60063, from memory.
    const e96 = eSeriesDecade('E96');
    for (const value of [1.0, 1.02, 1.05, 1.24, 2.49, 3.01, 4.99, 7.5, 9.09, 9.76]) expect(e96).toContain(value);
    const e192 = eSeriesDecade('E192');
    for (const value of [1.01, 1.04, 2.03, 4.02, 9.2, 9.88]) expect(e192).toContain(value);
    expect(e192).not.toContain(9.19);
  });

  it('follows 10^(i/N) rounded to three digits, except E192’s 9.20 where the formula gives 9.19', () => {
    // Construction of the E96/E192 series, IEC 60063 (from memory).
    for (const [series, size] of [
      ['E96', 96],
      ['E192', 192],
    ] as [ESeriesName, number][]) {
      const differing = eSeriesDecade(series).filter((value, index) => Math.round(10 ** (index / size) * 100) / 100 !== value);
      expect(differing).toEqual(series === 'E192' ? [9.2] : []);
    }
  });

  it('makes E96 every other E192 value', () => {
    // IEC 60063 construction (from memory).
    const e192 = eSeriesDecade('E192');
    expect(eSeriesDecade('E96')).toEqual(e192.filter((_, index) => index % 2 === 0));
  });

  it('names the field for an unknown series', () => {
    expect(() => eSeriesDecade('E48' as ESeriesName)).toThrowError(EngineInputError);
    expect(() => eSeriesDecade('E48' as ESeriesName)).toThrowError(/field "series"/);
  });
});

describe('eSeriesValues', () => {
  it('lists the values in a range as exact decimals', () => {
    expect(eSeriesValues('E24', 1000, 1500)).toEqual([1000, 1100, 1200, 1300, 1500]);
    expect(eSeriesValues('E96', 10, 11)).toEqual([10, 10.2, 10.5, 10.7, 11]);
    expect(eSeriesValues('E24', 0.1, 0.13)).toEqual([0.1, 0.11, 0.12, 0.13]);
  });

  it('rejects non-positive and reversed ranges', () => {
    expect(() => eSeriesValues('E24', 0, 10)).toThrowError(/field "minimumOhms"/);
    expect(() => eSeriesValues('E24', 100, 10)).toThrowError(/field "maximumOhms"/);
  });
});

describe('nearestESeriesValue', () => {
  it('picks the nearest value by ratio, across a decade boundary', () => {
    expect(nearestESeriesValue('E96', 4700)).toBe(4750);
    expect(nearestESeriesValue('E24', 4700)).toBe(4700);
    expect(nearestESeriesValue('E24', 9700)).toBe(10000);
    expect(nearestESeriesValue('E192', 919)).toBe(920);
  });

  it('rejects a non-positive resistance', () => {
    expect(() => nearestESeriesValue('E24', -5)).toThrowError(/field "resistanceOhms"/);
  });
});

describe('nearestResistorPairs', () => {
  it('finds exact decade ratios first, smallest R1 first', () => {
    const [best] = nearestResistorPairs(10, 'E96', { count: 1 });
    expect(best).toEqual({ r1Ohms: 1000, r2Ohms: 10000, gain: 10, gainErrorFraction: 0 });
  });

  it('ranks pairs by gain error and gives each pair’s CMRR at a tolerance', () => {
    // Gain 4.7 from E24: 1.0 kΩ → 4.7 kΩ is exact (IEC 60063 E24 values, from memory).
    const pairs = nearestResistorPairs(4.7, 'E24', { count: 4, toleranceFraction: 0.001 });
    expect(pairs[0]).toMatchObject({ r1Ohms: 1000, r2Ohms: 4700, gainErrorFraction: 0 });
    pairs.slice(1).forEach((pair, index) => {
      expect(Math.abs(pair.gainErrorFraction)).toBeGreaterThanOrEqual(Math.abs(pairs[index].gainErrorFraction));
    });
    for (const pair of pairs) {
      expect(pair.gain).toBe(pair.r2Ohms / pair.r1Ohms);
      expect(pair.worstCaseCmrrDb).toBe(worstCaseCmrrDb(pair.gain, 0.001));
      expect(pair.approximationCmrrDb).toBe(approximateWorstCaseCmrrDb(pair.gain, 0.001));
    }
  });

  it('comes closer to an awkward gain with a finer series', () => {
    const target = 7.31;
    const error = (series: ESeriesName) => Math.abs(nearestResistorPairs(target, series, { count: 1 })[0].gainErrorFraction);
    expect(error('E192')).toBeLessThanOrEqual(error('E96'));
    expect(error('E96')).toBeLessThanOrEqual(error('E24'));
  });

  it('names the field for a bad gain, count or tolerance', () => {
    expect(() => nearestResistorPairs(0, 'E24')).toThrowError(/field "gain"/);
    expect(() => nearestResistorPairs(2, 'E24', { count: 0 })).toThrowError(/field "count"/);
    expect(() => nearestResistorPairs(2, 'E24', { toleranceFraction: 0.7 })).toThrowError(/field "toleranceFraction"/);
    expect(() => nearestResistorPairs(2, 'E12' as ESeriesName)).toThrowError(/field "series"/);
  });
});
