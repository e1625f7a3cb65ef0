// The session view's verdict line and tightest margin, and the compare view's difference readout.
import type { SessionAnalysis, LimitVerdict } from '../schemas/analysis';
import type { Circuit } from '../schemas/designs';
import { EngineInputError, type LimitOutcome } from '../engine';
import { diagnoseAgainstDesign, type DesignDiagnosis } from './diagnosis';
import { interpolateCmrrAtFrequency, interpolateLevelOnLogFrequency } from './log-interpolation';

/** Result of {@link summariseSession}. */
export interface SessionSummary {
  /** The sweep's verdict; `no-limit` without a mask, `no-data` when the analysis is not complete. */
  outcome: LimitOutcome | 'no-limit' | 'no-data';
  /** The point that decides the verdict (see summariseSession); null without judged points. */
  tightest: LimitVerdict | null;
  /** One line: "passes with 3.2 dB margin at 20 kHz", "fails by 1.1 dB at 10 Hz", … */
  sentence: string;
  /** The design's predicted CMRR at the tightest frequency (interpolated on log-f), dB. */
  predictedAtTightestDb: number | null;
  /** Diagnosis against the design, when there is a fit and a circuit. */
  diagnosis: DesignDiagnosis | null;
}

function formatHz(frequencyHz: number): string {
  if (frequencyHz >= 1e6) return `${Number((frequencyHz / 1e6).toPrecision(3))} MHz`;
  if (frequencyHz >= 1e3) return `${Number((frequencyHz / 1e3).toPrecision(3))} kHz`;
  return `${Number(frequencyHz.toPrecision(3))} Hz`;
}

const decibels = (value: number) => `${Math.abs(value).toFixed(1)} dB`;

function lowestMargin(verdicts: readonly LimitVerdict[], outcome?: LimitOutcome): LimitVerdict | null {
  let found: LimitVerdict | null = null;
  for (const verdict of verdicts) {
    if (verdict.marginDb === null || (outcome && verdict.outcome !== outcome)) continue;
    if (found === null || (verdict.marginDb as number) < (found.marginDb as number)) found = verdict;
  }
  return found;
}

/**
 * The session's verdict in one line and the point that decides it, from its analysis (the
 * server's SessionAnalysis, judged against the revision's mask with its guard band, ILAC-G8):
 *
 * - fail: the failing point with the most negative margin — "fails by 1.1 dB at 10 Hz (3 of 25
 *   points below the limit)";
 * - indeterminate: the undecided point with the lowest margin — either the guard band straddles
 *   the limit there ("indeterminate: the ±0.5 dB guard band straddles the limit at 1 kHz (margin
 *   +0.3 dB)") or a lower bound sits below the limit ("… at 1 kHz the reading is floor-limited,
 *   a lower bound 2.0 dB below the limit");
 * - pass: the lowest margin over all judged points — "passes with 3.2 dB margin at 20 kHz" (with
 *   "at least" when that point is a lower bound);
 * - no point inside the mask, no mask, or an incomplete analysis: says so.
 *
 * With a circuit and a fit, the diagnosis against the design is added (diagnoseAgainstDesign).
 * O(points).
 *
 * @param analysis the session's analysis
 * @param circuit the design revision's circuit, or null when the session has none
 * @throws EngineInputError only through diagnoseAgainstDesign (an unusable circuit)
 * @example summariseSession(analysis, circuit).sentence // → "passes with 3.2 dB margin at 20 kHz"
 */
/** A message written as a sentence, continued after a colon: lower-case start, no closing full stop. */
function asClause(message: string): string {
  const trimmed = message.trim().replace(/\.$/, '');
  return /^[A-Z][a-z]/.test(trimmed) ? trimmed.charAt(0).toLowerCase() + trimmed.slice(1) : trimmed;
}

export function summariseSession(analysis: SessionAnalysis, circuit: Circuit | null): SessionSummary {
  const diagnosis = circuit && analysis.fit ? diagnoseAgainstDesign(analysis.fit, analysis.points, circuit) : null;
  const predictedAt = (frequencyHz: number): number | null => {
    const usable = analysis.prediction.filter((point) => point.cmrrDb !== null && point.frequencyHz > 0).sort((a, b) => a.frequencyHz - b.frequencyHz);
    return interpolateLevelOnLogFrequency(
      usable.map((point) => point.frequencyHz),
      usable.map((point) => point.cmrrDb as number),
      frequencyHz,
    );
  };
  if (analysis.status !== 'complete' && analysis.points.length === 0) {
    return { outcome: 'no-data', tightest: null, sentence: `No verdict yet: ${asClause(analysis.message ?? 'the analysis is not complete')}.`, predictedAtTightestDb: null, diagnosis };
  }
  if (!analysis.limits) {
    return { outcome: 'no-limit', tightest: null, sentence: 'No verdict: the design revision has no limit mask.', predictedAtTightestDb: null, diagnosis };
  }
  const { verdicts, overall, guardBandDb } = analysis.limits;
  let tightest: LimitVerdict | null = null;
  let sentence: string;
  if (overall === 'fail') {
    tightest = lowestMargin(verdicts, 'fail');
    const failing = verdicts.filter((verdict) => verdict.outcome === 'fail').length;
    const judged = verdicts.filter((verdict) => verdict.outcome !== 'outside-mask').length;
    sentence = tightest
      ? `fails by ${decibels(tightest.marginDb as number)} at ${formatHz(tightest.frequencyHz)} (${failing} of ${judged} points below the limit)`
      : 'fails';
  } else if (overall === 'indeterminate') {
    tightest = lowestMargin(verdicts, 'indeterminate');
    if (!tightest) sentence = 'indeterminate';
    else if (tightest.lowerBound && (tightest.marginDb as number) < 0) {
      sentence = `indeterminate: at ${formatHz(tightest.frequencyHz)} the reading is floor-limited, a lower bound ${decibels(tightest.marginDb as number)} below the limit, so the noise floor hides whether it passes`;
    } else {
      const margin = tightest.marginDb as number;
      sentence = `indeterminate: the ±${guardBandDb.toFixed(1)} dB guard band straddles the limit at ${formatHz(tightest.frequencyHz)} (margin ${margin >= 0 ? '+' : '−'}${decibels(margin)})`;
    }
  } else if (overall === 'pass') {
    tightest = lowestMargin(verdicts);
    sentence = tightest
      ? `passes with ${tightest.lowerBound ? 'at least ' : ''}${decibels(tightest.marginDb as number)} margin at ${formatHz(tightest.frequencyHz)}${tightest.lowerBound ? ' (a floor-limited point)' : ''}`
      : 'passes';
  } else {
    sentence = 'no verdict: no measured point lies inside the limit mask\'s frequency span';
  }
  return {
    outcome: overall,
    tightest,
    sentence,
    predictedAtTightestDb: tightest ? predictedAt(tightest.frequencyHz) : null,
    diagnosis,
  };
}

/** One session in a comparison. */
export interface SessionToCompare {
  sessionId: string;
  /** Shown in the sentence (unit serial, revision …); defaults to the session id. */
  label?: string;
  points: SessionAnalysis['points'];
}

/** One session's reading at the comparison frequency. */
export interface ComparedSession {
  sessionId: string;
  label: string;
  /** Measured CMRR interpolated on log-f, dB; null when the session was not measured across the frequency. */
  cmrrDb: number | null;
  lowerBound: boolean;
  /** This session minus the first (reference) one, dB; null when either is missing. */
  differenceFromFirstDb: number | null;
  /**
   * How to read the difference: `value` (both resolved), `at-least` (only this one is a lower
   * bound: the true difference is at least the number), `at-most` (only the reference is a bound),
   * `unknown` (both bounds, or a reading missing).
   */
  differenceKind: 'value' | 'at-least' | 'at-most' | 'unknown';
}

/** Result of {@link compareSessionsAt}. */
export interface SessionComparison {
  frequencyHz: number;
  sessions: ComparedSession[];
  sentence: string;
}

/**
 * The compare view's difference readout: every session's CMRR at one frequency (interpolated
 * linearly in dB against log10(f) between its neighbouring points, never extrapolated; lower
 * bounds carried through) and its difference from the first session, with the direction a bound
 * allows. O(sessions · points).
 *
 * @param sessions the sessions, the first being the reference
 * @param frequencyHz where to compare, Hz (> 0)
 * @throws EngineInputError for no sessions or a frequency that is not finite and positive
 * @example compareSessionsAt([a, b], 1000).sessions[1].differenceFromFirstDb // → −4.2
 */
export function compareSessionsAt(sessions: readonly (SessionToCompare | SessionAnalysis)[], frequencyHz: number): SessionComparison {
  if (sessions.length === 0) throw new EngineInputError('compareSessionsAt requires at least one session', { field: 'sessions' });
  if (!Number.isFinite(frequencyHz) || frequencyHz <= 0) {
    throw new EngineInputError(`compareSessionsAt requires a finite frequency above 0 Hz, got ${frequencyHz}`, { field: 'frequencyHz' });
  }
  const readings = sessions.map((session) => {
    const value = interpolateCmrrAtFrequency(session.points, frequencyHz);
    const label = 'label' in session && session.label ? session.label : session.sessionId;
    return { sessionId: session.sessionId, label, cmrrDb: value?.cmrrDb ?? null, lowerBound: value?.lowerBound ?? false };
  });
  const reference = readings[0];
  const compared = readings.map((reading, index): ComparedSession => {
    if (index === 0) return { ...reading, differenceFromFirstDb: reference.cmrrDb === null ? null : 0, differenceKind: reference.cmrrDb === null ? 'unknown' : 'value' };
    if (reading.cmrrDb === null || reference.cmrrDb === null) return { ...reading, differenceFromFirstDb: null, differenceKind: 'unknown' };
    const differenceFromFirstDb = reading.cmrrDb - reference.cmrrDb;
    const differenceKind = reading.lowerBound && reference.lowerBound ? 'unknown' : reading.lowerBound ? 'at-least' : reference.lowerBound ? 'at-most' : 'value';
    return { ...reading, differenceFromFirstDb, differenceKind };
  });
  const where = formatHz(frequencyHz);
  const phrases = compared.slice(1).map((session) => {
    if (session.differenceFromFirstDb === null) return `${session.label}: not measured across ${where}`;
    if (session.differenceKind === 'unknown') return `${session.label}: both floor-limited, difference unknown`;
    const difference = session.differenceFromFirstDb;
    const direction = difference >= 0 ? 'above' : 'below';
    // A bound on this session raises the floor of the difference; a bound on the reference lowers its ceiling.
    const raisesFloor = session.differenceKind === 'at-least';
    const qualifier =
      session.differenceKind === 'value' ? '' : (raisesFloor ? difference >= 0 : difference < 0) ? 'at least ' : 'at most ';
    return `${session.label} ${qualifier}${decibels(difference)} ${direction}`;
  });
  const sentence =
    reference.cmrrDb === null
      ? `${reference.label} was not measured across ${where}: no reference for the difference.`
      : `At ${where}, against ${reference.label} (${reference.lowerBound ? '≥ ' : ''}${reference.cmrrDb.toFixed(1)} dB): ${phrases.length > 0 ? phrases.join('; ') : 'no other session'}.`;
  return { frequencyHz, sessions: compared, sentence };
}
