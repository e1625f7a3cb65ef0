import { describe, expect, it } from 'vitest';
import { fitCmrrFrequencyResponse, logSpacedFrequencies, predictDifferenceAmplifier, type CmrrPoint } from '../../../shared/engine';
import { fitParameterRows, marginStatement, monteCarloBandGrid, prepareResiduals, thinPrediction, thinSessionPoints } from '../../../src/features/session-analysis/components/analysis-figures';
import { pointsFromPrediction } from '../../shared/analysis/fixtures';

function point(frequencyHz: number, cmrrDb: number, lowerBound = false): CmrrPoint {
  return { frequencyHz, ad: 10, acm: 10 / 10 ** (cmrrDb / 20), cmrrDb, lowerBound, interpolated: false, commonModeLine: 2 };
}

describe('monteCarloBandGrid', () => {
  it('spans whole decades around the measured range with the asked points per decade', () => {
    const grid = monteCarloBandGrid(12, 95_000, 10);
    // 10 Hz … 100 kHz is 4 decades: 4 × 10 steps + 1 (common practice, no source: both ends included).
    expect(grid.firstDecade).toBe(1);
    expect(grid.lastDecade).toBe(5);
    expect(grid.frequenciesHz).toHaveLength(41);
    expect(grid.frequenciesHz[0]).toBe(10);
    expect(grid.frequenciesHz[40]).toBe(100_000);
    expect(grid.frequenciesHz[10]).toBe(100);
  });

  it('keeps the same grid while a sweep grows inside the same decades, so the cached band serves it', () => {
    expect(monteCarloBandGrid(10, 2000)).toEqual(monteCarloBandGrid(15, 9000));
  });

  it('covers at least one decade for a single frequency', () => {
    const grid = monteCarloBandGrid(1000, 1000, 5);
    expect(grid.frequenciesHz[0]).toBe(1000);
    expect(grid.frequenciesHz.at(-1)).toBe(10_000);
  });

  it('refuses a range that is not positive and rising, and fewer than 2 points per decade', () => {
    expect(() => monteCarloBandGrid(0, 100)).toThrow(/monteCarloBandGrid requires/);
    expect(() => monteCarloBandGrid(100, 10)).toThrow(RangeError);
    expect(() => monteCarloBandGrid(10, 100, 1)).toThrow(RangeError);
  });
});

describe('prepareResiduals', () => {
  const fit = { residualsDb: [0.5, -0.25, 3, 0.1] } as Parameters<typeof prepareResiduals>[1];
  const points = [point(1000, 70), point(10, 90), point(100, 85, true), point(10_000, 60)];

  it('sorts by frequency and keeps resolved points and bounds apart', () => {
    const residuals = prepareResiduals(points, fit, 500);
    expect(residuals.frequencyHz).toEqual([10, 100, 1000, 10_000]);
    expect(residuals.resolvedDb).toEqual([-0.25, null, 0.5, 0.1]);
    expect(residuals.boundDb).toEqual([null, 3, null, null]);
  });

  it('leaves a gap where the fit has no value (null over JSON), rather than a zero residual', () => {
    // The smooth description has no value outside its resolved range: the server sends null there.
    const gappy = { residualsDb: [0.5, null, null, 0.1] } as unknown as Parameters<typeof prepareResiduals>[1];
    const residuals = prepareResiduals(points, gappy, 500);
    expect(residuals.resolvedDb).toEqual([null, null, 0.5, 0.1]);
    expect(residuals.boundDb).toEqual([null, null, null, null]);
  });

  it('names the largest residual of a resolved point (a bound is not an error of the fit)', () => {
    expect(prepareResiduals(points, fit, 500).largest).toEqual({ frequencyHz: 1000, residualDb: 0.5 });
  });

  it('thins a huge session per pixel column but keeps the extremes', () => {
    const many = logSpacedFrequencies(10, 1e5, 20_000).map((frequencyHz) => point(frequencyHz, 80));
    const residualsDb = many.map((_, index) => (index === 12_345 ? -4 : Math.sin(index) * 0.1));
    const residuals = prepareResiduals(many, { residualsDb } as Parameters<typeof prepareResiduals>[1], 200);
    expect(residuals.frequencyHz.length).toBeLessThanOrEqual(4 * 200 + 4);
    expect(residuals.resolvedDb).toContain(-4);
  });
});

describe('marginStatement', () => {
  it('says the margin with its sign, the limit, the frequency and the predicted value', () => {
    const text = marginStatement({ frequencyHz: 20_000, cmrrDb: 83.2, lowerBound: false, limitDb: 80, marginDb: 3.2, outcome: 'pass' }, 85);
    expect(text).toBe('+3.2 dB above the 80.0 dB limit at 20 kHz (measured 83.2 dB; the design predicts 85.0 dB there)');
  });

  it('marks a floor-limited reading as "at least" and a failing one as below', () => {
    expect(marginStatement({ frequencyHz: 10, cmrrDb: 92, lowerBound: true, limitDb: 80, marginDb: 12, outcome: 'pass' }, null)).toBe(
      '+12.0 dB above the 80.0 dB limit at 10 Hz (measured at least 92.0 dB)',
    );
    expect(marginStatement({ frequencyHz: 10, cmrrDb: 78.9, lowerBound: false, limitDb: 80, marginDb: -1.1, outcome: 'fail' }, null)).toMatch(/^−1.1 dB below/);
  });

  it('says nothing without a judged point', () => {
    expect(marginStatement(null, null)).toBeNull();
    expect(marginStatement({ frequencyHz: 10, cmrrDb: 90, lowerBound: false, limitDb: null, marginDb: null, outcome: 'outside-mask' }, null)).toBeNull();
  });
});

describe('fitParameterRows', () => {
  // A 0.05 % mismatched gain-10 stage with op-amp data (invented for the test), fitted from its own prediction.
  const predictedFit = () =>
    fitCmrrFrequencyResponse(
      pointsFromPrediction(
        predictDifferenceAmplifier(logSpacedFrequencies(10, 1e5, 25), { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100.05e3 }, {
          openLoopGainDb: 120,
          gainBandwidthHz: 1e7,
          cmrrDb: 110,
          cmrrCornerHz: 2000,
        }),
      ),
    );

  it('lists dc CMRR, corner, bandwidth, slope and residual with units and 95 % intervals', () => {
    const rows = fitParameterRows(predictedFit());
    expect(rows.map((row) => row.key)).toEqual(['dc-cmrr', 'corner', 'bandwidth', 'slope', 'residual']);
    expect(rows[0].value).toMatch(/^\d+\.\d dB$/);
    expect(rows[0].detail).toMatch(/^95 %: \d+\.\d dB … \d+\.\d dB$/);
    expect(rows[1].value).toMatch(/ (Hz|kHz)$/);
    expect(rows[3].value).toMatch(/dB\/decade$/);
  });

  it('writes the counts of a long sweep with thousands separators', () => {
    const fit = { ...predictedFit(), activePointCount: 100_000, activeBoundCount: 1_250, degreesOfFreedom: 99_998 };
    expect(fitParameterRows(fit)[4].detail).toBe('100,000 points in the fit, 1,250 of them bounds; 99,998 degrees of freedom');
  });
});

describe('thinSessionPoints and thinPrediction', () => {
  const frequencies = logSpacedFrequencies(10, 1e5, 20_000);
  const points = frequencies.map((frequencyHz, index) => point(frequencyHz, index === 7_777 ? 40 : 80, index % 1000 === 0));
  const fit = { fittedCmrrDb: points.map((_, index) => index), residualsDb: points.map((_, index) => -index) } as unknown as Parameters<typeof thinSessionPoints>[1];

  it('keeps a few points per pixel column, the worst resolved one among them, with the fit values that belong to them', () => {
    const thinned = thinSessionPoints(points, fit, 200);
    expect(thinned.points.length).toBeLessThanOrEqual(200 * 10);
    expect(thinned.points.some((kept) => kept.cmrrDb === 40)).toBe(true);
    const at = thinned.keptIndices!;
    thinned.points.forEach((kept, index) => {
      expect(kept).toBe(points[at[index]]);
      expect(thinned.fit!.fittedCmrrDb[index]).toBe(at[index]);
      expect(thinned.fit!.residualsDb[index]).toBe(-at[index]);
    });
  });

  it('leaves a short session as it is', () => {
    const few = points.slice(0, 50);
    expect(thinSessionPoints(few, null, 200)).toEqual({ points: few, fit: null, keptIndices: null });
  });

  it('thins a prediction aligned with the points by the points\' own choice, and an unaligned one by its own extremes', () => {
    const prediction = frequencies.map((frequencyHz) => ({ frequencyHz, adDb: 20, acmDb: -60, cmrrDb: 80 - Math.log10(frequencyHz), cmrrBandLowDb: 79, cmrrBandHighDb: 81 }));
    const thinned = thinSessionPoints(points, null, 200);
    const aligned = thinPrediction(prediction, 200, { points, keptIndices: thinned.keptIndices });
    expect(aligned.map((entry) => entry.frequencyHz)).toEqual(thinned.points.map((entry) => entry.frequencyHz));
    const own = thinPrediction(prediction, 200);
    expect(own.length).toBeLessThanOrEqual(200 * 12);
    expect(own[0].frequencyHz).toBe(10);
    expect(own.at(-1)!.frequencyHz).toBe(1e5);
  });
});
