// Axis helpers for charts on a logarithmic frequency axis, and how numbers with units are written
// on them. Pure: no DOM, no uPlot import, so the same code serves the charts, hover readouts and tests.

/** One tick of a logarithmic frequency axis. */
export interface FrequencyTick {
  valueHz: number;
  /** "10 Hz", "2 kHz", … ; empty for unlabelled minor ticks. */
  label: string;
  /** Decades (1, 10, 100 …) are major ticks; 2 and 5 are labelled minor ticks; the rest are unlabelled. */
  kind: 'decade' | 'labelled' | 'minor';
}

/** Writes a frequency with an SI prefix and at most 3 significant digits: 10 Hz, 1 kHz, 20 kHz, 1.5 MHz. */
export function formatFrequencyHz(frequencyHz: number): string {
  if (!Number.isFinite(frequencyHz)) return '—';
  const magnitude = Math.abs(frequencyHz);
  const [scale, unit] = magnitude >= 1e6 ? [1e6, 'MHz'] : magnitude >= 1e3 ? [1e3, 'kHz'] : magnitude >= 1 || magnitude === 0 ? [1, 'Hz'] : [1e-3, 'mHz'];
  return `${Number((frequencyHz / scale).toPrecision(3))} ${unit}`;
}

/**
 * Writes a level in dB with its unit and a true minus sign: "80.0 dB", "−3.2 dB"; a lower bound as
 * "≥ 80.0 dB"; a missing value as "—".
 */
export function formatDb(levelDb: number | null | undefined, options: { digits?: number; lowerBound?: boolean; signed?: boolean } = {}): string {
  if (levelDb === null || levelDb === undefined || Number.isNaN(levelDb)) return '—';
  if (!Number.isFinite(levelDb)) return levelDb > 0 ? '∞ dB' : '−∞ dB';
  const digits = options.digits ?? 1;
  const rounded = Number(levelDb.toFixed(digits)) === 0 ? 0 : levelDb;
  const magnitude = Math.abs(rounded).toFixed(digits);
  const sign = rounded < 0 ? '−' : options.signed ? '+' : '';
  return `${options.lowerBound ? '≥ ' : ''}${sign}${magnitude} dB`;
}

/**
 * Ticks of a log frequency axis from `minimumHz` to `maximumHz`: every 1-2-…-9 × 10ⁿ inside the
 * range, decades and 2, 5 labelled (the 1-2-5 pattern of log graph paper). When the range spans
 * more than 4 decades only decades are labelled, so labels do not collide. O(decades).
 *
 * @throws RangeError for a range that is not positive, finite and rising
 */
export function logFrequencyTicks(minimumHz: number, maximumHz: number): FrequencyTick[] {
  if (!(minimumHz > 0) || !(maximumHz > minimumHz) || !Number.isFinite(maximumHz)) {
    throw new RangeError(`logFrequencyTicks requires 0 < minimum < maximum, got ${minimumHz} … ${maximumHz}`);
  }
  const firstDecade = Math.floor(Math.log10(minimumHz));
  const lastDecade = Math.ceil(Math.log10(maximumHz));
  const labelTwoAndFive = lastDecade - firstDecade <= 4;
  const ticks: FrequencyTick[] = [];
  for (let decade = firstDecade; decade <= lastDecade; decade++) {
    for (let mantissa = 1; mantissa <= 9; mantissa++) {
      // Built from an exact decimal string so 0.2, 2000 … are the same doubles as typed.
      const valueHz = Number(`${mantissa}e${decade}`);
      if (valueHz < minimumHz * (1 - 1e-12) || valueHz > maximumHz * (1 + 1e-12)) continue;
      const kind: FrequencyTick['kind'] = mantissa === 1 ? 'decade' : (mantissa === 2 || mantissa === 5) && labelTwoAndFive ? 'labelled' : 'minor';
      ticks.push({ valueHz, label: kind === 'minor' ? '' : formatFrequencyHz(valueHz), kind });
    }
  }
  return ticks;
}

/**
 * `count` frequencies evenly spaced in log f from `startHz` to `stopHz`, both included, as a
 * Float64Array (for evaluating fitted curves densely). O(count).
 * @throws RangeError for a range that is not positive and rising, or fewer than 2 points
 */
export function logFrequencyGrid(startHz: number, stopHz: number, count: number): Float64Array {
  if (!(startHz > 0) || !(stopHz >= startHz) || !Number.isInteger(count) || count < 2) {
    throw new RangeError(`logFrequencyGrid requires 0 < start ≤ stop and at least 2 points, got ${startHz}, ${stopHz}, ${count}`);
  }
  const grid = new Float64Array(count);
  const logStart = Math.log(startHz);
  const logStep = (Math.log(stopHz) - logStart) / (count - 1);
  for (let index = 0; index < count; index++) grid[index] = Math.exp(logStart + logStep * index);
  grid[0] = startHz;
  grid[count - 1] = stopHz;
  return grid;
}
