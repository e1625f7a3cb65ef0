// Per-frequency CMRR from a differential and a common-mode sweep.
import { EngineInputError } from './errors';
import type { Sweep } from './sweep-file';

/** One paired frequency. */
export interface CmrrPoint {
  /** Frequency in hertz (a frequency of the common-mode sweep). */
  frequencyHz: number;
  /** Differential gain |vout/vin| of the differential sweep, dimensionless. */
  ad: number;
  /** Common-mode gain |vout/vin|; for a lower-bound point, `2·floor/vin` (an upper bound on the gain). */
  acm: number;
  /** `20·log10(ad/acm)` in dB; for a lower-bound point, a lower bound on the CMRR. */
  cmrrDb: number;
  /** True when the common-mode output was within 6 dB of its floor (`vout < 2·floor`). */
  lowerBound: boolean;
  /** True when `ad` was interpolated between two differential frequencies. */
  interpolated: boolean;
  /** Line of the common-mode file this point comes from. */
  commonModeLine: number;
  /** Differential phase in degrees (interpolated like `ad`), when the differential sweep has phases. */
  adPhaseDeg?: number;
  /** Common-mode phase in degrees, when the common-mode sweep has phases (meaningless on bound points). */
  acmPhaseDeg?: number;
}

/** Result of {@link pairCmrrPoints}. */
export interface CmrrPoints {
  points: CmrrPoint[];
  /** Readable notes about data left out (points outside the overlap, differential points at the floor). */
  warnings: string[];
}

// Two frequencies closer than this (relative) are the same test frequency written with rounding.
const sameFrequencyRelative = 1e-9;

/**
 * Pairs a differential sweep with a common-mode sweep and computes per frequency
 * `ad = vout/vin` (differential drive), `acm = vout/vin` (common-mode drive) and
 * `cmrrDb = 20·log10(ad/acm)` (DOMAIN.md, "Quantities").
 *
 * The common-mode sweep sets the frequencies: its readings are the small, hard ones and may be
 * bounds, which interpolation would blur. Where a common-mode frequency is not one of the
 * differential frequencies, `log10(ad)` is interpolated linearly against `log10(f)` (and the
 * differential phase linearly against `log10(f)`, taking the shorter way round) between the two
 * neighbouring differential points. Only common-mode frequencies inside the differential sweep's
 * range are used: nothing is extrapolated.
 *
 * A common-mode point whose output is below twice its floor (`vout < 2·floor`, within 6 dB;
 * DOMAIN.md, "Measuring it") is a lower bound: acm is computed with `2·floor` in place of vout and
 * the point is flagged `lowerBound`. A differential point below twice its floor cannot give a
 * differential gain: it is left out and named in `warnings`.
 *
 * Cost O(n + m) for sweeps of n and m points (both are sorted by {@link parseSweepCsv}).
 *
 * Throws {@link EngineInputError} when the two sweeps have no overlapping frequencies, or when
 * fewer than 2 differential points are above their floor.
 *
 * @example pairCmrrPoints(differential, commonMode).points[0].cmrrDb // 80 for ad = 10, acm = 0.001
 */
export function pairCmrrPoints(differential: Sweep, commonMode: Sweep): CmrrPoints {
  const warnings: string[] = [];
  const differentialName = differential.file ?? 'differential sweep';
  const commonModeName = commonMode.file ?? 'common-mode sweep';

  // Differential points that can be used: output resolved above its floor.
  const differentialGain: number[] = [];
  const differentialFrequencyHz: number[] = [];
  const differentialPhaseDeg: number[] = [];
  for (let i = 0; i < differential.frequencyHz.length; i++) {
    const floorVolts = differential.floorVolts ? differential.floorVolts[i] : 0;
    if (differential.voutVolts[i] < 2 * floorVolts) {
      warnings.push(
        `${differentialName}, line ${differential.lineNumber[i]}: differential output is within 6 dB of its floor ` +
          `at ${differential.frequencyHz[i]} Hz and was left out`,
      );
      continue;
    }
    differentialFrequencyHz.push(differential.frequencyHz[i]);
    differentialGain.push(differential.gain[i]);
    if (differential.phaseDeg) differentialPhaseDeg.push(differential.phaseDeg[i]);
  }
  if (differentialFrequencyHz.length < 2) {
    throw new EngineInputError(
      'pairCmrrPoints: fewer than 2 differential points are above their noise floor; the differential gain is unknown',
      { file: differential.file, field: 'vout_v' },
    );
  }

  const lowestHz = differentialFrequencyHz[0] * (1 - sameFrequencyRelative);
  const highestHz = differentialFrequencyHz[differentialFrequencyHz.length - 1] * (1 + sameFrequencyRelative);
  const points: CmrrPoint[] = [];
  let outside = 0;
  let upper = 1;
  for (let j = 0; j < commonMode.frequencyHz.length; j++) {
    const frequencyHz = commonMode.frequencyHz[j];
    if (frequencyHz < lowestHz || frequencyHz > highestHz) {
      outside++;
      continue;
    }
    // Advance to the first differential point at or above this frequency (both are sorted).
    while (upper < differentialFrequencyHz.length - 1 && differentialFrequencyHz[upper] < frequencyHz) upper++;
    const lower = upper - 1;
    let ad: number;
    let adPhaseDeg: number | undefined;
    let interpolated = false;
    const tolerance = sameFrequencyRelative * frequencyHz;
    const matchesUpper = Math.abs(differentialFrequencyHz[upper] - frequencyHz) <= tolerance;
    if (matchesUpper || Math.abs(differentialFrequencyHz[lower] - frequencyHz) <= tolerance) {
      const index = matchesUpper ? upper : lower;
      ad = differentialGain[index];
      if (differential.phaseDeg) adPhaseDeg = differentialPhaseDeg[index];
    } else {
      interpolated = true;
      // Linear in log10(gain) against log10(f): gain = lower·(upper/lower)^weight.
      const weight =
        Math.log(frequencyHz / differentialFrequencyHz[lower]) /
        Math.log(differentialFrequencyHz[upper] / differentialFrequencyHz[lower]);
      ad = differentialGain[lower] * (differentialGain[upper] / differentialGain[lower]) ** weight;
      if (differential.phaseDeg) {
        const step = ((((differentialPhaseDeg[upper] - differentialPhaseDeg[lower]) % 360) + 540) % 360) - 180;
        adPhaseDeg = differentialPhaseDeg[lower] + weight * step;
      }
    }
    const floorVolts = commonMode.floorVolts ? commonMode.floorVolts[j] : 0;
    const lowerBound = commonMode.voutVolts[j] < 2 * floorVolts;
    const acm = lowerBound ? (2 * floorVolts) / commonMode.vinVolts[j] : commonMode.gain[j];
    const point: CmrrPoint = {
      frequencyHz,
      ad,
      acm,
      cmrrDb: 20 * Math.log10(ad / acm),
      lowerBound,
      interpolated,
      commonModeLine: commonMode.lineNumber[j],
    };
    if (adPhaseDeg !== undefined) point.adPhaseDeg = adPhaseDeg;
    if (commonMode.phaseDeg) point.acmPhaseDeg = commonMode.phaseDeg[j];
    points.push(point);
  }

  if (points.length === 0) {
    const range = (sweep: ArrayLike<number>) => `${sweep[0]}–${sweep[sweep.length - 1]} Hz`;
    throw new EngineInputError(
      `pairCmrrPoints: the sweeps do not overlap in frequency (${differentialName} covers ${range(differentialFrequencyHz)}, ` +
        `${commonModeName} covers ${range(commonMode.frequencyHz)})`,
      { file: commonMode.file, field: 'frequency_hz' },
    );
  }
  if (outside > 0) {
    warnings.push(
      `${commonModeName}: ${outside} point(s) outside the differential sweep's range ` +
        `${differentialFrequencyHz[0]}–${differentialFrequencyHz[differentialFrequencyHz.length - 1]} Hz were left out`,
    );
  }
  return { points, warnings };
}
