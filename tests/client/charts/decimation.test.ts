import { describe, expect, it } from 'vitest';
import { decimateForLogAxis } from '../../../src/lib/charts/decimation';

function sweep(count: number) {
  const frequencyHz = new Float64Array(count);
  const values = new Float64Array(count);
  for (let index = 0; index < count; index++) {
    frequencyHz[index] = 10 * 10 ** ((4 * index) / (count - 1));
    values[index] = 80 + 5 * Math.sin(index * 0.7);
  }
  return { frequencyHz, values };
}

describe('decimateForLogAxis', () => {
  it('keeps at most first, last, lowest and highest per pixel column', () => {
    const { frequencyHz, values } = sweep(100_000);
    const kept = decimateForLogAxis(frequencyHz, [values], 1000);
    expect(kept.length).toBeLessThanOrEqual(4 * 1000);
    expect(kept[0]).toBe(0);
    expect(kept[kept.length - 1]).toBe(99_999);
    for (let index = 1; index < kept.length; index++) expect(kept[index]).toBeGreaterThan(kept[index - 1]);
  });

  it('keeps each column’s extremes, so the drawn envelope is unchanged', () => {
    const { frequencyHz, values } = sweep(20_000);
    values[12_345] = 20; // a deep notch in one point
    const kept = decimateForLogAxis(frequencyHz, [values], 300);
    expect(Array.from(kept)).toContain(12_345);
    const keptValues = Array.from(kept, (index) => values[index]);
    expect(Math.min(...keptValues)).toBe(Math.min(...values));
    expect(Math.max(...keptValues)).toBe(Math.max(...values));
  });

  it('keeps every point flagged to keep (failing points)', () => {
    const { frequencyHz, values } = sweep(10_000);
    const keep = new Uint8Array(10_000);
    keep[5000] = 1;
    keep[5001] = 1;
    keep[5002] = 1;
    const kept = Array.from(decimateForLogAxis(frequencyHz, [values], 100, keep));
    expect(kept).toEqual(expect.arrayContaining([5000, 5001, 5002]));
  });

  it('ignores NaN gaps when looking for extremes', () => {
    const frequencyHz = Float64Array.of(10, 11, 12, 13);
    const values = Float64Array.of(Number.NaN, 5, Number.NaN, 7);
    expect(Array.from(decimateForLogAxis(frequencyHz, [values], 1))).toEqual([0, 1, 3]);
  });

  it('refuses a width below one pixel and series of the wrong length', () => {
    expect(() => decimateForLogAxis([1, 2], [[1, 2]], 0)).toThrow(RangeError);
    expect(() => decimateForLogAxis([1, 2], [[1]], 10)).toThrow(/1 values for 2 frequencies/);
  });
});
