import { describe, expect, it } from 'vitest';
import type { CmrrPoint } from '../../../shared/engine';
import { prepareComparisonChart } from '../../../src/features/compare/components/compare-chart-data';
import { MAX_COMPARED_SESSIONS, parseFrequencyHz, parseSessionIds, serialiseFrequencyHz, serialiseSessionIds } from '../../../src/features/compare/components/compare-state';
import { sessionStyle } from '../../../src/features/compare/components/compare-styles';

function point(frequencyHz: number, cmrrDb: number, lowerBound = false): CmrrPoint {
  return { frequencyHz, ad: 10, acm: 10 / 10 ** (cmrrDb / 20), cmrrDb, lowerBound, interpolated: false, commonModeLine: 2 };
}

describe('parseSessionIds', () => {
  it('reads the address list in order, dropping blanks and repeats', () => {
    expect(parseSessionIds(' a, b,,a ,c')).toEqual(['a', 'b', 'c']);
    expect(parseSessionIds('')).toEqual([]);
  });

  it('keeps at most the number one chart shows clearly', () => {
    const ids = Array.from({ length: 12 }, (_, index) => `s${index}`);
    expect(parseSessionIds(serialiseSessionIds(ids))).toHaveLength(MAX_COMPARED_SESSIONS);
  });
});

describe('parseFrequencyHz', () => {
  it('reads plain hertz, SI prefixes and exponents', () => {
    expect(parseFrequencyHz('1000')).toBe(1000);
    expect(parseFrequencyHz('1 kHz')).toBe(1000);
    expect(parseFrequencyHz('2.5k')).toBe(2500);
    expect(parseFrequencyHz('1e4')).toBe(10_000);
    expect(parseFrequencyHz('50 Hz')).toBe(50);
    expect(parseFrequencyHz('0,5 kHz')).toBe(500);
  });

  it('refuses what is not a positive frequency', () => {
    for (const text of ['', 'abc', '0', '-5', '1 GHz', '10 dB']) expect(parseFrequencyHz(text), text).toBeNull();
  });

  it('round-trips through the address with 6 significant digits', () => {
    expect(serialiseFrequencyHz(1234.56789)).toBe('1234.57');
    expect(parseFrequencyHz(serialiseFrequencyHz(20_000))).toBe(20_000);
  });
});

describe('prepareComparisonChart', () => {
  it('merges the sessions onto one ascending grid, values and bounds apart per session', () => {
    const chart = prepareComparisonChart(
      [
        { sessionId: 'a', label: 'A', points: [point(1000, 70), point(10, 90)] },
        { sessionId: 'b', label: 'B', points: [point(10, 95, true), point(100, 88)] },
      ],
      800,
    );
    expect(chart.frequencyHz).toEqual([10, 100, 1000]);
    expect(chart.sessions[0].valuesDb).toEqual([90, null, 70]);
    expect(chart.sessions[1].valuesDb).toEqual([null, 88, null]);
    expect(chart.sessions[1].boundsDb).toEqual([95, null, null]);
    // Range padded by 3 dB and rounded out to 10 dB, as the session charts do (docs/CHARTS.md).
    expect(chart.yRangeDb).toEqual([60, 100]);
  });

  it('thins a huge session per pixel column', () => {
    const many = Array.from({ length: 10_000 }, (_, index) => point(10 * 10 ** (index / 2500), 80 - index / 1000));
    const chart = prepareComparisonChart([{ sessionId: 'a', label: 'A', points: many }], 100);
    expect(chart.frequencyHz.length).toBeLessThanOrEqual(4 * 100 + 4);
  });

  it('gives an empty chart for sessions without points', () => {
    expect(prepareComparisonChart([{ sessionId: 'a', label: 'A', points: [] }], 100)).toMatchObject({ frequencyHz: [], yRangeDb: null });
  });
});

describe('sessionStyle', () => {
  it('gives the first eight sessions distinct colours and no two neighbours the same marker', () => {
    const styles = Array.from({ length: MAX_COMPARED_SESSIONS }, (_, index) => sessionStyle(index));
    expect(new Set(styles.map((style) => style.colour)).size).toBe(MAX_COMPARED_SESSIONS);
    for (let index = 1; index < styles.length; index++) expect(styles[index].marker).not.toBe(styles[index - 1].marker);
    // Upward open triangles mean a lower bound; no session uses them for its values.
    expect(styles.some((style) => style.marker === 'triangle-up')).toBe(false);
  });
});
