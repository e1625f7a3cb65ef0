// The session charts' plot width for a viewport, known before the page lays them out: the page
// asks the server for no more points than that width can show, and the view thins live refits to it.

/**
 * The charts' plot width in CSS pixels for a viewport width: the navigation column (from 1024 px)
 * and the 24 rem side column (from 1280 px) taken off, clamped to 480–1600 px.
 *
 * @example sessionChartWidthPx(1440) // → 704
 */
export function sessionChartWidthPx(viewportPx: number): number {
  const content = Math.min(viewportPx, 1408 + 264) - (viewportPx >= 1024 ? 264 : 0) - 64;
  const charts = viewportPx >= 1280 ? content - 384 - 24 : content;
  return Math.max(480, Math.min(1600, Math.round(charts)));
}

/**
 * How many points to ask the server for: per-column thinning keeps at most four points (first,
 * last, lowest, highest) in each pixel column, so four per pixel draws the same picture.
 *
 * @example sessionChartPointBudget(704) // → 2816
 */
export function sessionChartPointBudget(widthPx: number): number {
  return 4 * Math.max(1, Math.round(widthPx));
}
