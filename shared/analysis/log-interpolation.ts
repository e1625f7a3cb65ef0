// Reading a measured CMRR curve at a frequency it was not measured at.
import { EngineInputError } from '../engine';

/** A CMRR point as interpolation needs it. */
export interface CmrrReading {
  frequencyHz: number;
  cmrrDb: number;
  /** True when cmrrDb is only a lower bound (output at the noise floor). */
  lowerBound?: boolean;
}

/** A CMRR read at a frequency. */
export interface InterpolatedCmrr {
  cmrrDb: number;
  /**
   * True when either neighbour is a lower bound: the interpolated number is then a lower bound
   * too (the interpolation weights are positive, so raising a neighbour can only raise the result).
   */
  lowerBound: boolean;
  /** False when a point sits exactly at the frequency. */
  interpolated: boolean;
}

// Two frequencies closer than this (relative) are the same test frequency written with rounding.
const SAME_FREQUENCY_RELATIVE = 1e-9;

/**
 * CMRR at a frequency, interpolated linearly in dB against log10(f) between the two neighbouring
 * points (DOMAIN.md: "If frequencies differ, interpolate on log-f"). Nothing is extrapolated:
 * outside the points' span the answer is null. Points may come in any order. O(n).
 *
 * @param points readings (frequencies in Hz, CMRR in dB)
 * @param frequencyHz where to read, Hz (> 0)
 * @returns the value and whether it is a lower bound, or null outside the span / with no points
 * @throws EngineInputError for a frequency that is not finite and positive
 * @example interpolateCmrrAtFrequency([{ frequencyHz: 10, cmrrDb: 90 }, { frequencyHz: 1000, cmrrDb: 70 }], 100) // → { cmrrDb: 80, lowerBound: false, interpolated: true }
 */
export function interpolateCmrrAtFrequency(points: readonly CmrrReading[], frequencyHz: number): InterpolatedCmrr | null {
  if (!Number.isFinite(frequencyHz) || frequencyHz <= 0) {
    throw new EngineInputError(`interpolateCmrrAtFrequency requires a finite frequency above 0 Hz, got ${frequencyHz}`, { field: 'frequencyHz' });
  }
  let below: CmrrReading | null = null;
  let above: CmrrReading | null = null;
  for (const point of points) {
    if (Math.abs(point.frequencyHz - frequencyHz) <= SAME_FREQUENCY_RELATIVE * frequencyHz) {
      return { cmrrDb: point.cmrrDb, lowerBound: point.lowerBound ?? false, interpolated: false };
    }
    if (point.frequencyHz < frequencyHz && (below === null || point.frequencyHz > below.frequencyHz)) below = point;
    if (point.frequencyHz > frequencyHz && (above === null || point.frequencyHz < above.frequencyHz)) above = point;
  }
  if (below === null || above === null) return null;
  const weight = Math.log(frequencyHz / below.frequencyHz) / Math.log(above.frequencyHz / below.frequencyHz);
  return {
    cmrrDb: below.cmrrDb + weight * (above.cmrrDb - below.cmrrDb),
    lowerBound: Boolean(below.lowerBound || above.lowerBound),
    interpolated: true,
  };
}

/**
 * Linear interpolation of a tabulated level (dB) against log10(f), for tables sorted by rising
 * frequency; null outside the table. O(log n).
 * @example interpolateLevelOnLogFrequency([10, 1000], [90, 70], 100) // → 80
 */
export function interpolateLevelOnLogFrequency(frequenciesHz: ArrayLike<number>, levelsDb: ArrayLike<number>, frequencyHz: number): number | null {
  const count = frequenciesHz.length;
  if (count === 0 || !(frequencyHz >= frequenciesHz[0] * (1 - SAME_FREQUENCY_RELATIVE)) || !(frequencyHz <= frequenciesHz[count - 1] * (1 + SAME_FREQUENCY_RELATIVE))) {
    return null;
  }
  let low = 0;
  let high = count - 1;
  while (high - low > 1) {
    const middle = (low + high) >> 1;
    if (frequenciesHz[middle] <= frequencyHz) low = middle;
    else high = middle;
  }
  if (count === 1 || frequencyHz <= frequenciesHz[low]) return levelsDb[low];
  if (frequencyHz >= frequenciesHz[high]) return levelsDb[high];
  const weight = Math.log(frequencyHz / frequenciesHz[low]) / Math.log(frequenciesHz[high] / frequenciesHz[low]);
  return levelsDb[low] + weight * (levelsDb[high] - levelsDb[low]);
}
