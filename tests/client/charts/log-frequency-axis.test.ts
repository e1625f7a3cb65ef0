import { describe, expect, it } from 'vitest';
import { formatDb, formatFrequencyHz, logFrequencyGrid, logFrequencyTicks } from '../../../src/lib/charts/log-frequency-axis';

describe('formatFrequencyHz', () => {
  it('writes frequencies with SI prefixes and at most 3 significant digits', () => {
    // Common practice for frequency axes, no source.
    expect([10, 100, 1000, 20_000, 1.5e6, 0.5, 1234.5].map(formatFrequencyHz)).toEqual(['10 Hz', '100 Hz', '1 kHz', '20 kHz', '1.5 MHz', '500 mHz', '1.23 kHz']);
  });
});

describe('formatDb', () => {
  it('writes dB with the unit, a true minus sign, "≥" for lower bounds and a dash for missing values', () => {
    expect(formatDb(80)).toBe('80.0 dB');
    expect(formatDb(-3.24)).toBe('−3.2 dB');
    expect(formatDb(3.2, { signed: true })).toBe('+3.2 dB');
    expect(formatDb(-0.04)).toBe('0.0 dB');
    expect(formatDb(92.346, { digits: 2, lowerBound: true })).toBe('≥ 92.35 dB');
    expect(formatDb(null)).toBe('—');
    expect(formatDb(Infinity)).toBe('∞ dB');
  });
});

describe('logFrequencyTicks', () => {
  it('labels decades and the 2 and 5 of each decade over a short range (1-2-5)', () => {
    const labelled = logFrequencyTicks(10, 1000).filter((tick) => tick.label !== '');
    expect(labelled.map((tick) => tick.label)).toEqual(['10 Hz', '20 Hz', '50 Hz', '100 Hz', '200 Hz', '500 Hz', '1 kHz']);
    expect(labelled.map((tick) => tick.kind)).toEqual(['decade', 'labelled', 'labelled', 'decade', 'labelled', 'labelled', 'decade']);
  });

  it('keeps minor ticks unlabelled and inside the range', () => {
    const ticks = logFrequencyTicks(15, 300);
    expect(ticks[0].valueHz).toBe(20);
    expect(ticks[ticks.length - 1].valueHz).toBe(300);
    expect(ticks.filter((tick) => tick.kind === 'minor').every((tick) => tick.label === '')).toBe(true);
  });

  it('labels only decades over more than four decades so labels do not collide', () => {
    const labelled = logFrequencyTicks(1, 1e6).filter((tick) => tick.label !== '');
    expect(labelled.map((tick) => tick.label)).toEqual(['1 Hz', '10 Hz', '100 Hz', '1 kHz', '10 kHz', '100 kHz', '1 MHz']);
  });

  it('refuses a range that is not positive and rising', () => {
    expect(() => logFrequencyTicks(0, 10)).toThrow(RangeError);
    expect(() => logFrequencyTicks(100, 10)).toThrow(/minimum < maximum/);
  });
});

describe('logFrequencyGrid', () => {
  it('spaces points evenly in log f with exact ends', () => {
    const grid = logFrequencyGrid(10, 1000, 3);
    expect(grid[0]).toBe(10);
    expect(grid[1]).toBeCloseTo(100, 10);
    expect(grid[2]).toBe(1000);
  });

  it('refuses fewer than 2 points', () => {
    expect(() => logFrequencyGrid(10, 1000, 1)).toThrow(RangeError);
  });
});
