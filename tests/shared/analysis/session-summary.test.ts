import { describe, expect, it } from 'vitest';
import { EngineInputError, fitCmrrFrequencyResponse, limitMaskVerdicts, logSpacedFrequencies, predictDifferenceAmplifier } from '../../../shared/engine';
import type { SessionAnalysis } from '../../../shared/schemas/analysis';
import { compareSessionsAt, summariseSession } from '../../../shared/analysis';
import { differenceCircuit, point, pointsFromPrediction } from './fixtures';

const MASK = { points: [{ frequencyHz: 10, minimumCmrrDb: 80 }, { frequencyHz: 20_000, minimumCmrrDb: 60 }] };

/** An analysis of `points` judged as the server judges them (server/analysis/session-analysis.ts). */
function analysisOf(points: ReturnType<typeof point>[], guardBandDb = 0): SessionAnalysis {
  const check = limitMaskVerdicts(points, MASK, guardBandDb);
  return {
    sessionId: 'session-1',
    status: 'complete',
    message: null,
    pointCounts: { differential: points.length, commonMode: points.length },
    points,
    fit: null,
    warnings: [],
    prediction: [],
    limits: {
      guardBandDb,
      overall: check.overall,
      verdicts: check.verdicts,
    },
    computedAt: '2025-01-01T00:00:00.000Z',
  };
}

describe('summariseSession', () => {
  it('states a pass with the margin at the tightest frequency', () => {
    // Limits by the engine's mask rule: 80 dB at 10 Hz, 60 dB at 20 kHz; margins 10, 8.5 and 3.2 dB.
    const summary = summariseSession(analysisOf([point(10, 90), point(1000, 74.5), point(20_000, 63.2)]), null);
    expect(summary.outcome).toBe('pass');
    expect(summary.sentence).toBe('passes with 3.2 dB margin at 20 kHz');
    expect(summary.tightest?.frequencyHz).toBe(20_000);
  });

  it('states a failure by the worst failing point and counts the failures', () => {
    const summary = summariseSession(analysisOf([point(10, 78.9), point(1000, 74.5), point(20_000, 59.5)]), null);
    expect(summary.sentence).toBe('fails by 1.1 dB at 10 Hz (2 of 3 points below the limit)');
  });

  it('says when the guard band straddles the limit', () => {
    const summary = summariseSession(analysisOf([point(10, 90), point(1000, 74.5), point(20_000, 60.3)], 0.5), null);
    expect(summary.outcome).toBe('indeterminate');
    expect(summary.sentence).toBe('indeterminate: the ±0.5 dB guard band straddles the limit at 20 kHz (margin +0.3 dB)');
  });

  it('says when a floor-limited point hides whether the unit passes', () => {
    const summary = summariseSession(analysisOf([point(10, 90), point(20_000, 58, true)]), null);
    expect(summary.sentence).toBe('indeterminate: at 20 kHz the reading is floor-limited, a lower bound 2.0 dB below the limit, so the noise floor hides whether it passes');
  });

  it('says "at least" when the tightest passing point is a lower bound', () => {
    const summary = summariseSession(analysisOf([point(10, 90), point(20_000, 62, true)]), null);
    expect(summary.sentence).toBe('passes with at least 2.0 dB margin at 20 kHz (a floor-limited point)');
  });

  it('has no verdict without a mask or without data', () => {
    expect(summariseSession({ ...analysisOf([point(10, 90)]), limits: null }, null).outcome).toBe('no-limit');
    const empty = { ...analysisOf([]), status: 'incomplete' as const, message: 'the common-mode sweep is missing', points: [] };
    expect(summariseSession(empty, null).sentence).toBe('No verdict yet: the common-mode sweep is missing.');
    // The server's own message is a sentence; after the colon it reads as a clause.
    const fromServer = { ...empty, message: 'Needs a common-mode sweep of at least 2 frequencies before CMRR can be computed' };
    expect(summariseSession(fromServer, null).sentence).toBe('No verdict yet: needs a common-mode sweep of at least 2 frequencies before CMRR can be computed.');
  });

  it('adds the diagnosis against the design when there is a fit and a circuit', () => {
    const points = pointsFromPrediction(
      predictDifferenceAmplifier(logSpacedFrequencies(10, 100e3, 31), { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100.05e3 }, {
        openLoopGainDb: 120,
        gainBandwidthHz: 1e7,
        cmrrDb: 120,
        cmrrCornerHz: 30,
      }),
    );
    const analysis = { ...analysisOf(points), fit: fitCmrrFrequencyResponse(points) };
    expect(summariseSession(analysis, differenceCircuit()).diagnosis?.ratio?.verdict).toBe('within-rating');
  });
});

describe('compareSessionsAt', () => {
  const reference = { sessionId: 'a', label: 'HRB204-0007', points: [point(100, 90), point(10_000, 70)] };

  it('interpolates each session on log f and gives the difference from the first', () => {
    const other = { sessionId: 'b', label: 'HRB204-0008', points: [point(100, 86), point(10_000, 66)] };
    const comparison = compareSessionsAt([reference, other], 1000);
    // Halfway in log f: 80 and 76 dB, so −4 dB (linear in log10 f, DOMAIN.md).
    expect(comparison.sessions[0].cmrrDb).toBeCloseTo(80, 12);
    expect(comparison.sessions[1].differenceFromFirstDb).toBeCloseTo(-4, 12);
    expect(comparison.sentence).toBe('At 1 kHz, against HRB204-0007 (80.0 dB): HRB204-0008 4.0 dB below.');
  });

  it('reads a lower bound as "at least" in the direction it allows', () => {
    const bounded = { sessionId: 'b', label: 'HRB204-0009', points: [point(100, 95, true), point(10_000, 75, true)] };
    const comparison = compareSessionsAt([reference, bounded], 1000);
    expect(comparison.sessions[1].differenceKind).toBe('at-least');
    expect(comparison.sentence).toMatch(/HRB204-0009 at least 5\.0 dB above/);
  });

  it('does not extrapolate beyond a session’s points', () => {
    const short = { sessionId: 'c', label: 'HRB204-0010', points: [point(100, 90), point(500, 85)] };
    const comparison = compareSessionsAt([reference, short], 1000);
    expect(comparison.sessions[1].cmrrDb).toBeNull();
    expect(comparison.sessions[1].differenceKind).toBe('unknown');
  });

  it('refuses no sessions and a non-positive frequency', () => {
    expect(() => compareSessionsAt([], 100)).toThrow(EngineInputError);
    expect(() => compareSessionsAt([reference], 0)).toThrow(/above 0 Hz/);
  });
});
