// Where a CMRR curve crosses its limit mask, and the mask itself on any frequency grid.
import type { LimitMaskPoint } from '../../../shared/engine/limit-mask';

/** A frequency where the curve passes through the limit. */
export interface MaskCrossing {
  frequencyHz: number;
  /** `falls-below`: the curve goes from above the limit to below it with rising frequency. */
  direction: 'falls-below' | 'rises-above';
}

/**
 * The mask's limit at every frequency of a grid sorted ascending: linear in dB against log10(f)
 * between corners (the engine's evaluateLimitMask rule), NaN outside the mask's span. O(n + m)
 * by walking both in order.
 */
export function limitOnGrid(frequencyHz: ArrayLike<number>, mask: readonly LimitMaskPoint[]): Float64Array {
  const limits = new Float64Array(frequencyHz.length).fill(Number.NaN);
  if (mask.length === 0) return limits;
  const first = mask[0].frequencyHz;
  const last = mask[mask.length - 1].frequencyHz;
  let upper = 1;
  for (let index = 0; index < frequencyHz.length; index++) {
    const f = frequencyHz[index];
    if (f < first * (1 - 1e-12) || f > last * (1 + 1e-12)) continue;
    if (mask.length === 1) {
      limits[index] = mask[0].minimumCmrrDb;
      continue;
    }
    while (upper < mask.length - 1 && mask[upper].frequencyHz < f) upper++;
    const below = mask[upper - 1];
    const above = mask[upper];
    const clamped = Math.min(Math.max(f, below.frequencyHz), above.frequencyHz);
    const weight = Math.log(clamped / below.frequencyHz) / Math.log(above.frequencyHz / below.frequencyHz);
    limits[index] = below.minimumCmrrDb + weight * (above.minimumCmrrDb - below.minimumCmrrDb);
  }
  return limits;
}

/**
 * Crossings of a curve (sorted by frequency; NaN = gap) with the mask: where `cmrr − limit` changes
 * sign between two neighbouring grid points inside the mask, the crossing frequency is found by
 * linear interpolation of that difference against log10(f) (exact for a straight curve segment on
 * the log axis). A point exactly on the limit counts as above. O(n + m).
 */
export function maskCrossings(frequencyHz: ArrayLike<number>, cmrrDb: ArrayLike<number>, mask: readonly LimitMaskPoint[]): MaskCrossing[] {
  const limits = limitOnGrid(frequencyHz, mask);
  const crossings: MaskCrossing[] = [];
  let previous = -1;
  for (let index = 0; index < frequencyHz.length; index++) {
    const margin = cmrrDb[index] - limits[index];
    if (Number.isNaN(margin)) {
      previous = -1;
      continue;
    }
    if (previous >= 0) {
      const previousMargin = cmrrDb[previous] - limits[previous];
      const wasAbove = previousMargin >= 0;
      const isAbove = margin >= 0;
      if (wasAbove !== isAbove) {
        const fraction = previousMargin / (previousMargin - margin);
        const logF = Math.log(frequencyHz[previous]) + fraction * (Math.log(frequencyHz[index]) - Math.log(frequencyHz[previous]));
        crossings.push({ frequencyHz: Math.exp(logF), direction: isAbove ? 'rises-above' : 'falls-below' });
      }
    }
    previous = index;
  }
  return crossings;
}
