import { describe, expect, it } from 'vitest';
import { EngineInputError } from '../../../shared/engine/errors';
import { checkAgainstLimitMask, decideAgainstLimit, evaluateLimitMask, limitMaskVerdicts, type LimitMask } from '../../../shared/engine/limit-mask';

/** Interpolation in log-f involves one logarithm ratio: a few ulps. */
const INTERPOLATION_TOLERANCE_DB = 1e-12;

const mask: LimitMask = {
  points: [
    { frequencyHz: 10, minimumCmrrDb: 90 },
    { frequencyHz: 1000, minimumCmrrDb: 70 },
    { frequencyHz: 100_000, minimumCmrrDb: 40 },
  ],
};

describe('evaluateLimitMask', () => {
  it('interpolates linearly in log-frequency between corners', () => {
    // Common practice for limit lines on a log-f axis, no source: 100 Hz is half-way (in decades) from 10 Hz to 1 kHz.
    expect(Math.abs((evaluateLimitMask(mask, 100) ?? NaN) - 80)).toBeLessThan(INTERPOLATION_TOLERANCE_DB);
    // 10 kHz is half-way from 1 kHz to 100 kHz: (70 + 40)/2.
    expect(Math.abs((evaluateLimitMask(mask, 10_000) ?? NaN) - 55)).toBeLessThan(INTERPOLATION_TOLERANCE_DB);
    // A quarter of the way in decades: 10^(0.5) · 10 Hz → 90 − 0.25·20.
    expect(Math.abs((evaluateLimitMask(mask, 10 * Math.sqrt(10)) ?? NaN) - 85)).toBeLessThan(INTERPOLATION_TOLERANCE_DB);
  });

  it('is exact at the corners and applies nowhere outside its span', () => {
    expect(evaluateLimitMask(mask, 10)).toBe(90);
    expect(evaluateLimitMask(mask, 1000)).toBe(70);
    expect(evaluateLimitMask(mask, 100_000)).toBe(40);
    expect(evaluateLimitMask(mask, 9.99)).toBeNull();
    expect(evaluateLimitMask(mask, 100_001)).toBeNull();
  });

  it('rejects a mask whose frequencies do not increase, naming the point', () => {
    const repeated = { points: [mask.points[0], { frequencyHz: 10, minimumCmrrDb: 80 }] };
    expect(() => evaluateLimitMask(repeated, 10)).toThrowError(EngineInputError);
    expect(() => evaluateLimitMask(repeated, 10)).toThrowError(/row 2, field "frequencyHz": .*increase strictly/);
    const falling = { points: [mask.points[1], mask.points[0]] };
    expect(() => evaluateLimitMask(falling, 10)).toThrowError(/point 2/);
  });

  it('rejects an empty mask, a zero frequency, a NaN limit and a bad query frequency', () => {
    expect(() => evaluateLimitMask({ points: [] }, 10)).toThrowError(/at least one point/);
    expect(() => evaluateLimitMask({ points: [{ frequencyHz: 0, minimumCmrrDb: 60 }] }, 10)).toThrowError(/row 1/);
    expect(() => evaluateLimitMask({ points: [{ frequencyHz: 10, minimumCmrrDb: Number.NaN }] }, 10)).toThrowError(/minimumCmrrDb/);
    expect(() => evaluateLimitMask(mask, -1)).toThrowError(/field "frequencyHz"/);
  });
});

describe('decideAgainstLimit', () => {
  it('uses simple acceptance without a guard band: at or above the limit passes', () => {
    // ILAC-G8:2019 simple acceptance (w = 0), from memory.
    expect(decideAgainstLimit(80, 80)).toBe('pass');
    expect(decideAgainstLimit(79.99, 80)).toBe('fail');
  });

  it('accepts only when value − guard band ≥ limit, rejects when value + guard band < limit, and is indeterminate between', () => {
    // ILAC-G8:2019 guarded acceptance with guard band w, from memory.
    expect(decideAgainstLimit(81, 80, 1)).toBe('pass');
    expect(decideAgainstLimit(80.5, 80, 1)).toBe('indeterminate');
    expect(decideAgainstLimit(79.5, 80, 1)).toBe('indeterminate');
    expect(decideAgainstLimit(79, 80, 1)).toBe('indeterminate');
    expect(decideAgainstLimit(78.9, 80, 1)).toBe('fail');
  });

  it('passes a lower bound at or above the limit and never fails one', () => {
    // A lower bound says the true CMRR is at least this (DOMAIN.md), so it cannot show a failure.
    expect(decideAgainstLimit(80, 80, 0, true)).toBe('pass');
    expect(decideAgainstLimit(60, 80, 0, true)).toBe('indeterminate');
    expect(decideAgainstLimit(80.5, 80, 1, true)).toBe('indeterminate');
  });

  it('rejects a negative guard band and a NaN value', () => {
    expect(() => decideAgainstLimit(80, 70, -1)).toThrowError(/field "guardBandDb"/);
    expect(() => decideAgainstLimit(Number.NaN, 70)).toThrowError(/field "cmrrDb"/);
  });
});

describe('checkAgainstLimitMask', () => {
  it('judges each point at the mask’s limit for its frequency and gives one verdict', () => {
    const result = checkAgainstLimitMask(
      [
        { frequencyHz: 5, cmrrDb: 95 },
        { frequencyHz: 100, cmrrDb: 85 },
        { frequencyHz: 10_000, cmrrDb: 55.5 },
        { frequencyHz: 50_000, cmrrDb: 60, lowerBound: true },
      ],
      mask,
      1,
    );
    expect(result.decisions.map((decision) => decision.outcome)).toEqual(['outside-mask', 'pass', 'indeterminate', 'pass']);
    expect(result.decisions[1].marginDb).toBeCloseTo(5, 12);
    expect(result.decisions[0].limitDb).toBeNull();
    expect(result.overall).toBe('indeterminate');
    expect(result.counts).toEqual({ pass: 2, fail: 0, indeterminate: 1, 'outside-mask': 1 });
  });

  it('fails the sweep when any point fails', () => {
    const result = checkAgainstLimitMask(
      [
        { frequencyHz: 100, cmrrDb: 85 },
        { frequencyHz: 1000, cmrrDb: 60 },
      ],
      mask,
    );
    expect(result.overall).toBe('fail');
  });

  it('names the bad point and the mask problem', () => {
    expect(() => checkAgainstLimitMask([{ frequencyHz: 100, cmrrDb: 80 }, { frequencyHz: 0, cmrrDb: 80 }], mask)).toThrowError(/row 2/);
    expect(() => checkAgainstLimitMask([{ frequencyHz: 100, cmrrDb: Number.NaN }], mask)).toThrowError(/field "cmrrDb"/);
    expect(() => checkAgainstLimitMask([], { points: [mask.points[2], mask.points[0]] })).toThrowError(/increase strictly/);
    expect(() => checkAgainstLimitMask([], mask, Number.NaN)).toThrowError(/guard band/);
  });
});

describe('limitMaskVerdicts', () => {
  // Points on both sides of the mask, at a corner, between corners, a lower bound above and below
  // its limit, a point with no lowerBound field and one carrying other fields (as CMRR points do).
  // Invented inputs; the expected verdicts are checkAgainstLimitMask's, which the tests above pin.
  const points = [
    { frequencyHz: 5, cmrrDb: 95 },
    { frequencyHz: 10, cmrrDb: 90.5, lowerBound: false },
    { frequencyHz: 100, cmrrDb: 85, lowerBound: false, ad: 10, acm: 5.6e-4, commonModeLine: 7 },
    { frequencyHz: 1000, cmrrDb: 60, lowerBound: true },
    { frequencyHz: 10_000, cmrrDb: 55.5 },
    { frequencyHz: 50_000, cmrrDb: 60, lowerBound: true },
    { frequencyHz: 100_000, cmrrDb: 30 },
    { frequencyHz: 200_000, cmrrDb: 20 },
  ];

  it('gives checkAgainstLimitMask’s decisions, reduced to the judged fields', () => {
    for (const guardBandDb of [0, 1, 6]) {
      const check = checkAgainstLimitMask(points, mask, guardBandDb);
      const lean = limitMaskVerdicts(points, mask, guardBandDb);
      expect(lean.verdicts).toEqual(
        check.decisions.map((decision) => ({
          frequencyHz: decision.frequencyHz,
          cmrrDb: decision.cmrrDb,
          lowerBound: decision.lowerBound ?? false,
          limitDb: decision.limitDb,
          marginDb: decision.marginDb,
          outcome: decision.outcome,
        })),
      );
      expect(lean.overall).toBe(check.overall);
      expect(lean.counts).toEqual(check.counts);
    }
  });

  it('keeps no other field of a point and always says whether it is a lower bound', () => {
    const { verdicts } = limitMaskVerdicts(points, mask, 1);
    expect(Object.keys(verdicts[2])).toEqual(['frequencyHz', 'cmrrDb', 'lowerBound', 'limitDb', 'marginDb', 'outcome']);
    expect(verdicts[0].lowerBound).toBe(false);
  });

  it('refuses what checkAgainstLimitMask refuses, with its message when given its name', () => {
    const badInputs: [typeof points, LimitMask, number][] = [
      [[{ frequencyHz: 100, cmrrDb: 80 }, { frequencyHz: 0, cmrrDb: 80 }], mask, 0],
      [[{ frequencyHz: 100, cmrrDb: Number.NaN }], mask, 0],
      [[], { points: [mask.points[2], mask.points[0]] }, 0],
      [[], { points: [] }, 0],
      [[], mask, Number.NaN],
      [[], mask, -1],
    ];
    for (const [badPoints, badMask, guardBandDb] of badInputs) {
      let expected: unknown;
      try {
        checkAgainstLimitMask(badPoints, badMask, guardBandDb);
      } catch (error) {
        expected = error;
      }
      expect(expected).toBeInstanceOf(EngineInputError);
      const message = (expected as EngineInputError).message;
      expect(() => limitMaskVerdicts(badPoints, badMask, guardBandDb, 'checkAgainstLimitMask')).toThrowError(message);
      expect(() => limitMaskVerdicts(badPoints, badMask, guardBandDb)).toThrowError(message.replaceAll('checkAgainstLimitMask', 'limitMaskVerdicts'));
    }
  });
});
