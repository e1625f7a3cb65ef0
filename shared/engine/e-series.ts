// Preferred resistor values: the E-series of IEC 60063 (E24, E96, E192), and
// the resistor pairs from a series that come closest to a wanted gain.
import { EngineInputError } from './errors';
import { approximateWorstCaseCmrrDb, worstCaseCmrrDb } from './resistor-tolerance';

/** The series this module knows. */
export type ESeriesName = 'E24' | 'E96' | 'E192';

/**
 * Values of one decade in hundredths (100 = 1.00), IEC 60063, from memory.
 * E24 keeps its historical two-significant-digit values, several of which
 * (2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2) differ from the rounded geometric
 * series 10^(i/24). E96 and E192 are 10^(i/N) rounded to three significant
 * digits, except E192's 9.20 where the rounding gives 9.19.
 */
const E24_HUNDREDTHS: readonly number[] = [
  100, 110, 120, 130, 150, 160, 180, 200, 220, 240, 270, 300, 330, 360, 390, 430,
  470, 510, 560, 620, 680, 750, 820, 910,
];

const E96_HUNDREDTHS: readonly number[] = [
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143,
  147, 150, 154, 158, 162, 165, 169, 174, 178, 182, 187, 191, 196, 200, 205, 210,
  215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309,
  316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453,
  464, 475, 487, 499, 511, 523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665,
  681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976,
];

const E192_HUNDREDTHS: readonly number[] = [
  100, 101, 102, 104, 105, 106, 107, 109, 110, 111, 113, 114, 115, 117, 118, 120,
  121, 123, 124, 126, 127, 129, 130, 132, 133, 135, 137, 138, 140, 142, 143, 145,
  147, 149, 150, 152, 154, 156, 158, 160, 162, 164, 165, 167, 169, 172, 174, 176,
  178, 180, 182, 184, 187, 189, 191, 193, 196, 198, 200, 203, 205, 208, 210, 213,
  215, 218, 221, 223, 226, 229, 232, 234, 237, 240, 243, 246, 249, 252, 255, 258,
  261, 264, 267, 271, 274, 277, 280, 284, 287, 291, 294, 298, 301, 305, 309, 312,
  316, 320, 324, 328, 332, 336, 340, 344, 348, 352, 357, 361, 365, 370, 374, 379,
  383, 388, 392, 397, 402, 407, 412, 417, 422, 427, 432, 437, 442, 448, 453, 459,
  464, 470, 475, 481, 487, 493, 499, 505, 511, 517, 523, 530, 536, 542, 549, 556,
  562, 569, 576, 583, 590, 597, 604, 612, 619, 626, 634, 642, 649, 657, 665, 673,
  681, 690, 698, 706, 715, 723, 732, 741, 750, 759, 768, 777, 787, 796, 806, 816,
  825, 835, 845, 856, 866, 876, 887, 898, 909, 920, 931, 942, 953, 965, 976, 988,
];

const SERIES: Record<ESeriesName, readonly number[]> = { E24: E24_HUNDREDTHS, E96: E96_HUNDREDTHS, E192: E192_HUNDREDTHS };

function seriesHundredths(functionName: string, series: string): readonly number[] {
  const table = (SERIES as Record<string, readonly number[] | undefined>)[series];
  if (!table) {
    throw new EngineInputError(`${functionName} knows the series E24, E96 and E192, got "${series}"`, { field: 'series' });
  }
  return table;
}

/** hundredths × 10^(exponent − 2), formed so decimal values come out as the nearest double (10.2, not 10.200000000000001). */
function valueFromHundredths(hundredths: number, decadeExponent: number): number {
  const shift = decadeExponent - 2;
  return shift >= 0 ? hundredths * 10 ** shift : hundredths / 10 ** -shift;
}

/**
 * The values of one decade of a series, 1.0 … 9.x (IEC 60063, from memory).
 * O(N).
 *
 * @param series "E24", "E96" or "E192"
 * @returns the N values, ascending, unitless mantissas
 * @throws EngineInputError (field "series") for another name
 * @example eSeriesDecade('E24')[10] // → 2.7
 */
export function eSeriesDecade(series: ESeriesName): number[] {
  return seriesHundredths('eSeriesDecade', series).map((hundredths) => hundredths / 100);
}

/**
 * Every value of a series between two resistances, inclusive. O(N · decades).
 *
 * @param series "E24", "E96" or "E192"
 * @param minimumOhms lowest resistance, ohms (> 0)
 * @param maximumOhms highest resistance, ohms (≥ minimumOhms, at most 12 decades above it)
 * @returns resistances, ohms, ascending
 * @throws EngineInputError for an unknown series or bad bounds
 * @example eSeriesValues('E24', 1000, 1500) // → [1000, 1100, 1200, 1300, 1500]
 */
export function eSeriesValues(series: ESeriesName, minimumOhms: number, maximumOhms: number): number[] {
  const table = seriesHundredths('eSeriesValues', series);
  if (!Number.isFinite(minimumOhms) || minimumOhms <= 0) {
    throw new EngineInputError(`eSeriesValues requires a finite minimum above 0 ohms, got ${minimumOhms}`, { field: 'minimumOhms' });
  }
  if (!Number.isFinite(maximumOhms) || maximumOhms < minimumOhms || maximumOhms / minimumOhms > 1e12) {
    throw new EngineInputError(
      `eSeriesValues requires a finite maximum from the minimum to 12 decades above it, got ${maximumOhms}`,
      { field: 'maximumOhms' },
    );
  }
  const values: number[] = [];
  const firstDecade = Math.floor(Math.log10(minimumOhms)) - 1;
  const lastDecade = Math.floor(Math.log10(maximumOhms)) + 1;
  for (let decade = firstDecade; decade <= lastDecade; decade++) {
    for (const hundredths of table) {
      const value = valueFromHundredths(hundredths, decade);
      if (value >= minimumOhms && value <= maximumOhms) values.push(value);
    }
  }
  return values;
}

/**
 * The series value nearest to a resistance, measured as a ratio (log
 * distance), which is how the series is spaced. O(N).
 *
 * @param series "E24", "E96" or "E192"
 * @param resistanceOhms wanted resistance, ohms (> 0)
 * @returns the nearest series value, ohms
 * @throws EngineInputError for an unknown series or a non-positive resistance
 * @example nearestESeriesValue('E96', 4700) // → 4750
 */
export function nearestESeriesValue(series: ESeriesName, resistanceOhms: number): number {
  const table = seriesHundredths('nearestESeriesValue', series);
  if (!Number.isFinite(resistanceOhms) || resistanceOhms <= 0) {
    throw new EngineInputError(`nearestESeriesValue requires a finite resistance above 0 ohms, got ${resistanceOhms}`, {
      field: 'resistanceOhms',
    });
  }
  const decade = Math.floor(Math.log10(resistanceOhms));
  let best = NaN;
  let bestDistance = Infinity;
  for (let candidateDecade = decade - 1; candidateDecade <= decade + 1; candidateDecade++) {
    for (const hundredths of table) {
      const value = valueFromHundredths(hundredths, candidateDecade);
      const distance = Math.abs(Math.log(value / resistanceOhms));
      if (distance < bestDistance) {
        bestDistance = distance;
        best = value;
      }
    }
  }
  return best;
}

/** One candidate pair for a difference amplifier (R1 = R3, R2 = R4). */
export interface ResistorPair {
  r1Ohms: number;
  r2Ohms: number;
  /** R2/R1. */
  gain: number;
  /** (gain − target)/target. */
  gainErrorFraction: number;
  /** Exact 16-corner worst-case CMRR at the tolerance, dB (when a tolerance was given). */
  worstCaseCmrrDb?: number;
  /** (1 + G)/(4ε), dB (when a tolerance was given). */
  approximationCmrrDb?: number;
}

/** Options of {@link nearestResistorPairs}. */
export interface NearestResistorPairsOptions {
  /** How many pairs to return (default 5, at most 100). */
  count?: number;
  /** R1 candidates run from this resistance (default 1 kΩ)… */
  r1MinimumOhms?: number;
  /** …to this one, inclusive (default 9.99 kΩ: one decade). */
  r1MaximumOhms?: number;
  /** Resistor tolerance for the CMRR each pair would give, 0 < ε < 0.5. */
  toleranceFraction?: number;
}

/**
 * Resistor pairs from an IEC 60063 series whose ratio R2/R1 comes closest to a
 * target gain, for a difference amplifier built as R1 = R3 and R2 = R4, with
 * the CMRR each pair would give at a tolerance (ideal op-amp; the nominal gain
 * error itself does not reduce rejection when both halves use the same pair).
 * For each R1 in range, R2 is the series value nearest R1·G. Sorted by |gain
 * error|, then by R1. O(N · decades · N).
 *
 * @param targetGain wanted R2/R1 (> 0)
 * @param series "E24", "E96" or "E192"
 * @param options count, R1 range (ohms) and tolerance (fraction)
 * @throws EngineInputError for a bad gain, series, count, range or tolerance
 * @example nearestResistorPairs(10, 'E96', { count: 1 })[0] // → { r1Ohms: 1000, r2Ohms: 10000, gain: 10, gainErrorFraction: 0 }
 */
export function nearestResistorPairs(targetGain: number, series: ESeriesName, options: NearestResistorPairsOptions = {}): ResistorPair[] {
  seriesHundredths('nearestResistorPairs', series);
  if (!Number.isFinite(targetGain) || targetGain <= 0) {
    throw new EngineInputError(`nearestResistorPairs requires a finite target gain above 0, got ${targetGain}`, { field: 'gain' });
  }
  const count = options.count ?? 5;
  if (!Number.isInteger(count) || count < 1 || count > 100) {
    throw new EngineInputError(`nearestResistorPairs requires a whole count from 1 to 100, got ${count}`, { field: 'count' });
  }
  const toleranceFraction = options.toleranceFraction;
  if (toleranceFraction !== undefined && !(toleranceFraction > 0 && toleranceFraction < 0.5)) {
    throw new EngineInputError(`nearestResistorPairs requires a tolerance fraction between 0 and 0.5 exclusive, got ${toleranceFraction}`, {
      field: 'toleranceFraction',
    });
  }
  const r1Candidates = eSeriesValues(series, options.r1MinimumOhms ?? 1000, options.r1MaximumOhms ?? 9990);
  if (r1Candidates.length === 0) {
    throw new EngineInputError('nearestResistorPairs found no series value in the R1 range', { field: 'r1MinimumOhms' });
  }
  const pairs: ResistorPair[] = r1Candidates.map((r1Ohms) => {
    const r2Ohms = nearestESeriesValue(series, r1Ohms * targetGain);
    const gain = r2Ohms / r1Ohms;
    return { r1Ohms, r2Ohms, gain, gainErrorFraction: (gain - targetGain) / targetGain };
  });
  pairs.sort((a, b) => Math.abs(a.gainErrorFraction) - Math.abs(b.gainErrorFraction) || a.r1Ohms - b.r1Ohms);
  return pairs.slice(0, count).map((pair) =>
    toleranceFraction === undefined
      ? pair
      : {
          ...pair,
          worstCaseCmrrDb: worstCaseCmrrDb(pair.gain, toleranceFraction),
          approximationCmrrDb: approximateWorstCaseCmrrDb(pair.gain, toleranceFraction),
        },
  );
}
