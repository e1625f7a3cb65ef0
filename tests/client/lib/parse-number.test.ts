import { describe, expect, it } from 'vitest';
import { numberToField, parseEngineeringNumber } from '../../../src/lib/parse-number';

describe('parseEngineeringNumber', () => {
  it('reads SI suffixes as schematics write them (common practice, no source)', () => {
    expect(parseEngineeringNumber('4.99k')).toBeCloseTo(4990, 9);
    expect(parseEngineeringNumber('1M')).toBe(1e6);
    expect(parseEngineeringNumber('100m')).toBeCloseTo(0.1, 12);
    expect(parseEngineeringNumber('2.2u')).toBeCloseTo(2.2e-6, 18);
    expect(parseEngineeringNumber('10 k')).toBe(10_000);
  });

  it('reads plain decimals, exponents and a decimal comma', () => {
    expect(parseEngineeringNumber(' 2.2e3 ')).toBe(2200);
    expect(parseEngineeringNumber('0,5')).toBe(0.5);
    expect(parseEngineeringNumber('-12')).toBe(-12);
  });

  it('returns null for blank or unreadable text', () => {
    expect(parseEngineeringNumber('')).toBeNull();
    expect(parseEngineeringNumber('   ')).toBeNull();
    expect(parseEngineeringNumber('ten')).toBeNull();
    expect(parseEngineeringNumber('1.2.3')).toBeNull();
    expect(parseEngineeringNumber('5x')).toBeNull();
    expect(parseEngineeringNumber('1e999')).toBeNull();
  });
});

describe('numberToField', () => {
  it('writes numbers back without float noise and blanks missing ones', () => {
    expect(numberToField(0.1 * 3)).toBe('0.3');
    expect(numberToField(4990)).toBe('4990');
    expect(numberToField(null)).toBe('');
    expect(numberToField(Number.NaN)).toBe('');
  });
});
