import { describe, expect, it } from 'vitest';
import { sessionChartPointBudget, sessionChartWidthPx } from '../../../src/lib/charts/session-chart-width';

// An estimate made before layout, taken from the layout's columns: a 264 px navigation column from
// 1024 px, 64 px of margins, and the 24 rem (384 px) side column with its 24 px gap from 1280 px.
// The browser journey (tests/browser/session-analysis.test.ts) checks it is never narrower than the
// plot Chromium actually lays out, which is what keeps the thinning pixel-exact.
describe('sessionChartWidthPx', () => {
  it('takes the navigation, the margins and the side column off a wide screen', () => {
    expect(sessionChartWidthPx(1440)).toBe(1440 - 264 - 64 - 384 - 24);
  });

  it('keeps the side column below the charts on a laptop screen (under 1280 px)', () => {
    expect(sessionChartWidthPx(1200)).toBe(1200 - 264 - 64);
  });

  it('never plans for less than 480 px or more than 1600 px', () => {
    expect(sessionChartWidthPx(320)).toBe(480);
    expect(sessionChartWidthPx(5000)).toBe(1408 + 264 - 264 - 64 - 384 - 24);
    expect(sessionChartWidthPx(5000)).toBeLessThanOrEqual(1600);
  });
});

describe('sessionChartPointBudget', () => {
  it('allows first, last, lowest and highest point per pixel column', () => {
    expect(sessionChartPointBudget(704)).toBe(2816);
    expect(sessionChartPointBudget(480.4)).toBe(1920);
  });
});
