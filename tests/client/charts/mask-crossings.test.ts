import { describe, expect, it } from 'vitest';
import { evaluateLimitMask } from '../../../shared/engine/limit-mask';
import { limitOnGrid, maskCrossings } from '../../../src/lib/charts/mask-crossings';

const MASK = [
  { frequencyHz: 10, minimumCmrrDb: 90 },
  { frequencyHz: 1000, minimumCmrrDb: 70 },
  { frequencyHz: 100_000, minimumCmrrDb: 70 },
];

describe('limitOnGrid', () => {
  it('agrees with the engine’s evaluateLimitMask at every grid point and is NaN outside the mask', () => {
    const grid = [5, 10, 31.6, 100, 999, 1000, 5000, 100_000, 200_000];
    const limits = limitOnGrid(grid, MASK);
    grid.forEach((frequencyHz, index) => {
      const expected = evaluateLimitMask({ points: MASK }, frequencyHz);
      if (expected === null) expect(Number.isNaN(limits[index])).toBe(true);
      else expect(limits[index]).toBeCloseTo(expected, 12);
    });
  });
});

describe('maskCrossings', () => {
  it('finds where a falling curve crosses a flat limit, interpolated on log f', () => {
    // CMRR 80 dB at 1 kHz and 60 dB at 100 kHz (straight on the log axis) crosses 70 dB halfway: 10 kHz.
    const crossings = maskCrossings([1000, 100_000], [80, 60], MASK);
    expect(crossings).toHaveLength(1);
    expect(crossings[0].direction).toBe('falls-below');
    expect(crossings[0].frequencyHz).toBeCloseTo(10_000, 6);
  });

  it('finds a curve rising back above the limit, and none outside the mask', () => {
    const crossings = maskCrossings([1, 2, 100, 1000, 10_000], [0, 100, 85, 65, 75], MASK);
    expect(crossings.map((crossing) => crossing.direction)).toEqual(['falls-below', 'rises-above']);
  });

  it('counts a point exactly on the limit as above', () => {
    expect(maskCrossings([1000, 10_000], [70, 71], MASK)).toEqual([]);
  });
});
