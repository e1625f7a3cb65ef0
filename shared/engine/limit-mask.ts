// Limit masks (a minimum CMRR over frequency) and the pass/fail decision for
// each measured point, with an optional guard band following the decision
// rules of ILAC-G8 ("Guidelines on decision rules and statements of
// conformity").
import { EngineInputError } from './errors';

/** One corner of a mask: the minimum CMRR required at a frequency. */
export interface LimitMaskPoint {
  frequencyHz: number;
  minimumCmrrDb: number;
}

/** A mask: corners in strictly increasing frequency, joined by straight lines on a log-frequency axis. */
export interface LimitMask {
  points: readonly LimitMaskPoint[];
}

/** A measured (or predicted) CMRR point to judge. */
export interface CmrrPointToJudge {
  frequencyHz: number;
  cmrrDb: number;
  /** True when cmrrDb is only a lower bound (output at the noise floor): the true CMRR is at least this. */
  lowerBound?: boolean;
}

/**
 * The decision for one point:
 * - `pass`: the value minus the guard band is at or above the limit;
 * - `fail`: the value plus the guard band is below the limit;
 * - `indeterminate`: the guard band straddles the limit (or a lower bound sits below it: it
 *   cannot show a failure);
 * - `outside-mask`: the frequency lies outside the mask's span, where it sets no limit.
 */
export type LimitOutcome = 'pass' | 'fail' | 'indeterminate' | 'outside-mask';

/** A judged point. */
export interface LimitDecision extends CmrrPointToJudge {
  /** The mask's limit at this frequency, dB (null outside the mask). */
  limitDb: number | null;
  /** cmrrDb − limitDb, dB (null outside the mask). */
  marginDb: number | null;
  outcome: LimitOutcome;
}

/** All points judged, and one verdict for the whole sweep. */
export interface LimitCheckResult {
  decisions: LimitDecision[];
  /** `fail` if any point fails, else `indeterminate` if any is, else `pass`; `outside-mask` if no point lies in the mask. */
  overall: LimitOutcome;
  /** Counts per outcome. */
  counts: Record<LimitOutcome, number>;
}

/**
 * Checks a mask: at least one point, finite values, positive and strictly
 * increasing frequencies. O(n).
 * @throws EngineInputError naming the entry (row = 1-based point number, field "frequencyHz" or "minimumCmrrDb")
 */
export function validateLimitMask(mask: LimitMask, functionName = 'validateLimitMask'): void {
  if (!mask.points || mask.points.length === 0) {
    throw new EngineInputError(`${functionName} requires a mask with at least one point`, { field: 'mask' });
  }
  mask.points.forEach((point, index) => {
    const row = index + 1;
    if (!Number.isFinite(point.frequencyHz) || point.frequencyHz <= 0) {
      throw new EngineInputError(`${functionName}: mask point ${row} needs a finite frequency above 0 Hz, got ${point.frequencyHz}`, {
        row,
        field: 'frequencyHz',
      });
    }
    if (!Number.isFinite(point.minimumCmrrDb)) {
      throw new EngineInputError(`${functionName}: mask point ${row} needs a finite minimum CMRR in dB, got ${point.minimumCmrrDb}`, {
        row,
        field: 'minimumCmrrDb',
      });
    }
    if (index > 0 && point.frequencyHz <= mask.points[index - 1].frequencyHz) {
      throw new EngineInputError(
        `${functionName}: mask frequencies must increase strictly, but point ${row} (${point.frequencyHz} Hz) does not follow point ${index} (${mask.points[index - 1].frequencyHz} Hz)`,
        { row, field: 'frequencyHz' },
      );
    }
  });
}

function limitAt(points: readonly LimitMaskPoint[], frequencyHz: number): number | null {
  const first = points[0];
  const last = points[points.length - 1];
  if (frequencyHz < first.frequencyHz || frequencyHz > last.frequencyHz) return null;
  let upper = 1;
  while (upper < points.length && points[upper].frequencyHz < frequencyHz) upper++;
  if (upper >= points.length || points[upper].frequencyHz === frequencyHz) {
    return points[Math.min(upper, points.length - 1)].minimumCmrrDb;
  }
  const below = points[upper - 1];
  const above = points[upper];
  const fraction = Math.log(frequencyHz / below.frequencyHz) / Math.log(above.frequencyHz / below.frequencyHz);
  return below.minimumCmrrDb + fraction * (above.minimumCmrrDb - below.minimumCmrrDb);
}

/**
 * The mask's minimum CMRR at a frequency: linear interpolation in log10(f)
 * between its corners, exact at a corner (common practice for limit lines on a
 * log-frequency axis, no source). A one-point mask applies at its frequency
 * only. O(n).
 *
 * @param mask corners, Hz and dB
 * @param frequencyHz frequency, Hz (> 0)
 * @returns the limit, dB, or null outside the mask's span
 * @throws EngineInputError for a bad mask or frequency
 * @example evaluateLimitMask({ points: [{ frequencyHz: 10, minimumCmrrDb: 90 }, { frequencyHz: 1000, minimumCmrrDb: 70 }] }, 100) // → 80
 */
export function evaluateLimitMask(mask: LimitMask, frequencyHz: number): number | null {
  validateLimitMask(mask, 'evaluateLimitMask');
  if (!Number.isFinite(frequencyHz) || frequencyHz <= 0) {
    throw new EngineInputError(`evaluateLimitMask requires a finite frequency above 0 Hz, got ${frequencyHz}`, { field: 'frequencyHz' });
  }
  return limitAt(mask.points, frequencyHz);
}

/**
 * The decision rule for one value against a lower limit, with guard band w ≥ 0
 * (ILAC-G8:2019, guarded acceptance: accept only when value − w ≥ limit; a value
 * with value + w < limit is rejected; in between the band straddles the limit
 * and the result is indeterminate). With w = 0 this is simple acceptance. A
 * lower bound (true value ≥ the number) passes under the same test but can
 * never fail: below the limit it is indeterminate. O(1).
 *
 * @param valueDb measured CMRR, dB
 * @param limitDb minimum CMRR, dB
 * @param guardBandDb w, dB (≥ 0; often the expanded uncertainty U)
 * @param lowerBound true when valueDb is only a lower bound
 * @throws EngineInputError for a NaN value or limit or a negative guard band
 * @example decideAgainstLimit(80.5, 80, 1) // → 'indeterminate'
 */
export function decideAgainstLimit(valueDb: number, limitDb: number, guardBandDb = 0, lowerBound = false): Exclude<LimitOutcome, 'outside-mask'> {
  if (Number.isNaN(valueDb)) throw new EngineInputError('decideAgainstLimit requires a CMRR value, got NaN', { field: 'cmrrDb' });
  if (!Number.isFinite(limitDb)) throw new EngineInputError(`decideAgainstLimit requires a finite limit, got ${limitDb}`, { field: 'limitDb' });
  if (!Number.isFinite(guardBandDb) || guardBandDb < 0) {
    throw new EngineInputError(`decideAgainstLimit requires a finite guard band of at least 0 dB, got ${guardBandDb}`, {
      field: 'guardBandDb',
    });
  }
  if (valueDb - guardBandDb >= limitDb) return 'pass';
  if (lowerBound) return 'indeterminate';
  if (valueDb + guardBandDb < limitDb) return 'fail';
  return 'indeterminate';
}

/** A judged point reduced to what a stored analysis keeps (see {@link limitMaskVerdicts}). */
export interface LimitVerdict {
  frequencyHz: number;
  cmrrDb: number;
  /** The point's lowerBound flag, false when it had none. */
  lowerBound: boolean;
  limitDb: number | null;
  marginDb: number | null;
  outcome: LimitOutcome;
}

/** Every point judged, then shaped by `toResult`: the walk both checks below share. */
function judgeAgainstLimitMask<T>(
  points: readonly CmrrPointToJudge[],
  mask: LimitMask,
  guardBandDb: number,
  functionName: string,
  toResult: (point: CmrrPointToJudge, limitDb: number | null, marginDb: number | null, outcome: LimitOutcome) => T,
): { results: T[]; overall: LimitOutcome; counts: Record<LimitOutcome, number> } {
  validateLimitMask(mask, functionName);
  if (!Number.isFinite(guardBandDb) || guardBandDb < 0) {
    throw new EngineInputError(`${functionName} requires a finite guard band of at least 0 dB, got ${guardBandDb}`, {
      field: 'guardBandDb',
    });
  }
  const counts: Record<LimitOutcome, number> = { pass: 0, fail: 0, indeterminate: 0, 'outside-mask': 0 };
  const results = points.map((point, index): T => {
    const row = index + 1;
    if (!Number.isFinite(point.frequencyHz) || point.frequencyHz <= 0) {
      throw new EngineInputError(`${functionName}: point ${row} needs a finite frequency above 0 Hz, got ${point.frequencyHz}`, {
        row,
        field: 'frequencyHz',
      });
    }
    if (Number.isNaN(point.cmrrDb)) {
      throw new EngineInputError(`${functionName}: point ${row} has no CMRR value (NaN)`, { row, field: 'cmrrDb' });
    }
    const limitDb = limitAt(mask.points, point.frequencyHz);
    const outcome: LimitOutcome =
      limitDb === null ? 'outside-mask' : decideAgainstLimit(point.cmrrDb, limitDb, guardBandDb, point.lowerBound ?? false);
    counts[outcome]++;
    return toResult(point, limitDb, limitDb === null ? null : point.cmrrDb - limitDb, outcome);
  });
  const overall: LimitOutcome =
    counts.fail > 0 ? 'fail' : counts.indeterminate > 0 ? 'indeterminate' : counts.pass > 0 ? 'pass' : 'outside-mask';
  return { results, overall, counts };
}

/**
 * Judges every point against a mask (see {@link decideAgainstLimit}) and gives
 * the sweep's overall verdict. Each decision is a copy of its point (every field
 * it has) with the limit, margin and outcome added. O(points · mask corners).
 *
 * @param points frequencies (Hz, > 0), CMRR values (dB) and lower-bound flags
 * @param mask the limit mask
 * @param guardBandDb guard band w, dB (≥ 0, default 0)
 * @throws EngineInputError for a bad mask (naming the mask point), a bad point (row = 1-based point number) or guard band
 * @example checkAgainstLimitMask([{ frequencyHz: 100, cmrrDb: 85 }], mask80Flat).overall // → 'pass'
 */
export function checkAgainstLimitMask(points: readonly CmrrPointToJudge[], mask: LimitMask, guardBandDb = 0): LimitCheckResult {
  const { results, overall, counts } = judgeAgainstLimitMask(
    points,
    mask,
    guardBandDb,
    'checkAgainstLimitMask',
    (point, limitDb, marginDb, outcome): LimitDecision => ({ ...point, limitDb, marginDb, outcome }),
  );
  return { decisions: results, overall, counts };
}

/**
 * The same judgement as {@link checkAgainstLimitMask}, giving each point only its
 * frequency, CMRR, lower-bound flag, limit, margin and outcome instead of a copy of
 * the whole point: for a session of 100,000 CMRR points, making those copies was
 * most of the check's time. O(points · mask corners).
 *
 * @param points frequencies (Hz, > 0), CMRR values (dB) and lower-bound flags
 * @param mask the limit mask
 * @param guardBandDb guard band w, dB (≥ 0, default 0)
 * @param functionName name at the start of error messages
 * @throws EngineInputError as checkAgainstLimitMask does
 * @example limitMaskVerdicts([{ frequencyHz: 100, cmrrDb: 85 }], mask80Flat).verdicts[0].marginDb // → 5
 */
export function limitMaskVerdicts(
  points: readonly CmrrPointToJudge[],
  mask: LimitMask,
  guardBandDb = 0,
  functionName = 'limitMaskVerdicts',
): { verdicts: LimitVerdict[]; overall: LimitOutcome; counts: Record<LimitOutcome, number> } {
  const { results, overall, counts } = judgeAgainstLimitMask(points, mask, guardBandDb, functionName, (point, limitDb, marginDb, outcome) => ({
    frequencyHz: point.frequencyHz,
    cmrrDb: point.cmrrDb,
    lowerBound: point.lowerBound ?? false,
    limitDb,
    marginDb,
    outcome,
  }));
  return { verdicts: results, overall, counts };
}
