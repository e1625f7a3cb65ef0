// Percentiles the way numpy computes them by default, by selection rather than a full sort.
import { selectInPlace } from '../engine';

/**
 * Percentiles of `values` with numpy's default ('linear') method: position `q/100·(n − 1)`,
 * linear interpolation between the two neighbouring order statistics (numpy.percentile,
 * method='linear'). Reorders `values` in place (quickselect, expected O(n) per percentile; no
 * full sort). NaN is not allowed; ±Infinity sorts to the ends.
 *
 * @param values the sample (reordered)
 * @param percents each 0 … 100
 * @returns one value per percent, in the given order
 * @throws RangeError for an empty sample or a percent outside 0 … 100
 * @example percentilesInPlace(Float64Array.of(1, 2, 3, 4), [50]) // → [2.5]
 */
export function percentilesInPlace(values: Float64Array, percents: readonly number[]): number[] {
  const count = values.length;
  if (count === 0) throw new RangeError('percentilesInPlace requires at least one value');
  return percents.map((percent) => {
    if (!(percent >= 0 && percent <= 100)) throw new RangeError(`percentilesInPlace: percent must be 0 … 100, got ${percent}`);
    const position = (percent / 100) * (count - 1);
    const lower = Math.floor(position);
    const fraction = position - lower;
    const lowerValue = selectInPlace(values, lower);
    if (fraction === 0 || lower + 1 >= count) return lowerValue;
    // After selection everything right of `lower` is at least lowerValue: the next order statistic is their minimum.
    let upperValue = Infinity;
    for (let index = lower + 1; index < count; index++) if (values[index] < upperValue) upperValue = values[index];
    if (upperValue === lowerValue) return lowerValue;
    return lowerValue + fraction * (upperValue - lowerValue);
  });
}

/**
 * numpy-style linear percentiles of a plain array, leaving it untouched. O(n) per percent.
 * @throws RangeError as {@link percentilesInPlace}
 * @example linearPercentiles([10, 20, 30], [5, 95]) // → [11, 29]
 */
export function linearPercentiles(values: readonly number[], percents: readonly number[]): number[] {
  return percentilesInPlace(Float64Array.from(values), percents);
}
