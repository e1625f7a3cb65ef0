// Fewer points for huge sessions without changing the picture: per pixel column of a log-frequency
// axis keep the first, last, lowest and highest point of every series (the M4 aggregation of
// Jugel et al., "M4: a visualization-oriented time series data aggregation", VLDB 2014, applied to
// a log x axis). A line through the kept points covers exactly the pixels the full line covers.

/**
 * Indices of the points to keep, rising. `frequencyHz` must be sorted ascending; each series is
 * aligned to it (NaN marks a gap, never kept as an extreme). Points listed in `alwaysKeep` (e.g.
 * failing points, whose markers must all show) are kept too. O(n · series), one pass.
 *
 * @param frequencyHz x values, Hz, ascending and positive
 * @param series y arrays aligned to x
 * @param widthPx plot width in pixels (≥ 1)
 * @param alwaysKeep optional flags (1 = keep) aligned to x
 * @throws RangeError for a width below 1 or arrays of different lengths
 */
export function decimateForLogAxis(
  frequencyHz: ArrayLike<number>,
  series: readonly ArrayLike<number>[],
  widthPx: number,
  alwaysKeep?: ArrayLike<number>,
): Uint32Array {
  const count = frequencyHz.length;
  if (!(widthPx >= 1)) throw new RangeError(`decimateForLogAxis requires a width of at least 1 pixel, got ${widthPx}`);
  for (const values of series) {
    if (values.length !== count) throw new RangeError(`decimateForLogAxis: a series has ${values.length} values for ${count} frequencies`);
  }
  if (count === 0) return new Uint32Array(0);
  const columns = Math.floor(widthPx);
  const logStart = Math.log(frequencyHz[0]);
  const logSpan = Math.log(frequencyHz[count - 1]) - logStart;
  const columnScale = logSpan > 0 ? columns / logSpan : 0;
  const kept = new Uint32Array(count);
  let keptCount = 0;
  const seriesCount = series.length;
  const minimumAt = new Int32Array(seriesCount);
  const maximumAt = new Int32Array(seriesCount);
  const candidates: number[] = [];
  let columnStart = 0;
  const flush = (end: number) => {
    // end is exclusive; the column holds [columnStart, end).
    candidates.length = 0;
    candidates.push(columnStart, end - 1);
    for (let s = 0; s < seriesCount; s++) {
      if (minimumAt[s] >= 0) candidates.push(minimumAt[s], maximumAt[s]);
    }
    if (alwaysKeep) for (let index = columnStart; index < end; index++) if (alwaysKeep[index]) candidates.push(index);
    candidates.sort((a, b) => a - b);
    for (let c = 0; c < candidates.length; c++) {
      if (keptCount === 0 || kept[keptCount - 1] !== candidates[c]) kept[keptCount++] = candidates[c];
    }
  };
  let currentColumn = -1;
  for (let index = 0; index < count; index++) {
    const column = Math.min(columns - 1, Math.floor((Math.log(frequencyHz[index]) - logStart) * columnScale));
    if (column !== currentColumn) {
      if (currentColumn >= 0) flush(index);
      currentColumn = column;
      columnStart = index;
      minimumAt.fill(-1);
      maximumAt.fill(-1);
    }
    for (let s = 0; s < seriesCount; s++) {
      const value = series[s][index];
      if (Number.isNaN(value)) continue;
      if (minimumAt[s] < 0 || value < series[s][minimumAt[s]]) minimumAt[s] = index;
      if (maximumAt[s] < 0 || value > series[s][maximumAt[s]]) maximumAt[s] = index;
    }
  }
  flush(count);
  return kept.slice(0, keptCount);
}
