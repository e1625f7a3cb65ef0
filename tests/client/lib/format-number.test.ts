import { describe, expect, it } from 'vitest';
import { formatDb, formatHz, formatOhms, formatPercent, formatRatio, formatVolts, formatWithPrefix } from '../../../src/lib/format-number';

// Expected strings are SI prefixes with three significant figures (common practice, no source).
describe('formatWithPrefix', () => {
  it('picks the prefix that keeps the figure between 1 and 1000', () => {
    expect(formatHz(1500)).toBe('1.50 kHz');
    expect(formatHz(100_000)).toBe('100 kHz');
    expect(formatHz(10)).toBe('10.0 Hz');
    expect(formatVolts(0.000316)).toBe('316 µV');
    expect(formatVolts(0.0125)).toBe('12.5 mV');
    expect(formatOhms(4990)).toBe('4.99 kΩ');
    expect(formatHz(8e6)).toBe('8.00 MHz');
  });

  it('steps up a prefix when rounding reaches 1000', () => {
    expect(formatHz(999.7)).toBe('1.00 kHz');
    expect(formatVolts(0.99996)).toBe('1.00 V');
  });

  it('keeps the sign of negative values', () => {
    expect(formatVolts(-0.0025)).toBe('-2.50 mV');
  });

  it('writes zero without a prefix and non-finite values as a dash', () => {
    expect(formatWithPrefix(0, 'V')).toBe('0 V');
    expect(formatWithPrefix(Number.NaN, 'V')).toBe('—');
    expect(formatWithPrefix(Infinity, 'Hz')).toBe('—');
  });
});

describe('formatDb', () => {
  it('shows one decimal and the unit, and a dash for missing values', () => {
    expect(formatDb(92.44)).toBe('92.4 dB');
    expect(formatDb(-3.01)).toBe('-3.0 dB');
    expect(formatDb(null)).toBe('—');
    expect(formatDb(undefined)).toBe('—');
  });
});

describe('formatPercent and formatRatio', () => {
  it('turns a tolerance fraction into a percentage without float noise', () => {
    expect(formatPercent(0.001)).toBe('0.1 %');
    expect(formatPercent(0.0001)).toBe('0.01 %');
  });

  it('shows a ratio with four significant figures', () => {
    expect(formatRatio(10.00123)).toBe('10.00');
    expect(formatRatio(Number.NaN)).toBe('—');
  });
});
