// The analysed points of a session a page at a time: the page's table of every CMRR point, with
// its fit, prediction and verdict, sorted and filtered here so a 100,000-point session never
// crosses the wire whole. Reads the kept analysis (analysis-cache.ts), so paging costs a sort.
import type { AnalysisPointRow, AnalysisPointsPage, AnalysisPointsQuery, SessionAnalysis } from '../../shared/schemas/analysis';

const finiteOrNull = (value: number | null | undefined): number | null => (value === null || value === undefined || !Number.isFinite(value) ? null : value);

/** Every point of the analysis as a table row, in the analysis' own (rising frequency) order. */
export function analysisPointRows(analysis: SessionAnalysis): AnalysisPointRow[] {
  const { points, fit, prediction, limits } = analysis;
  const predictionAligned = prediction.length === points.length;
  const fitAligned = fit !== null && fit.fittedCmrrDb.length === points.length;
  const rows = new Array<AnalysisPointRow>(points.length);
  for (let index = 0; index < points.length; index++) {
    const point = points[index];
    const verdict = limits?.verdicts[index];
    rows[index] = {
      index,
      frequencyHz: point.frequencyHz,
      cmrrDb: point.cmrrDb,
      lowerBound: point.lowerBound,
      fittedCmrrDb: fitAligned ? finiteOrNull(fit.fittedCmrrDb[index]) : null,
      residualDb: fitAligned ? finiteOrNull(fit.residualsDb[index]) : null,
      predictedCmrrDb: predictionAligned ? finiteOrNull(prediction[index].cmrrDb) : null,
      limitDb: finiteOrNull(verdict?.limitDb),
      marginDb: finiteOrNull(verdict?.marginDb),
      outcome: verdict?.outcome ?? null,
    };
  }
  return rows;
}

/**
 * One page of the analysed points, filtered by verdict and sorted by frequency, CMRR, margin or
 * residual. Rows without the sorted value (no limit there, no fit) come last either way; ties keep
 * rising frequency. O(n log n) for n points.
 */
export function pageAnalysisPoints(analysis: SessionAnalysis, query: AnalysisPointsQuery): AnalysisPointsPage {
  let rows = analysisPointRows(analysis);
  if (query.outcome !== 'all') rows = rows.filter((row) => row.outcome === query.outcome);
  if (query.sort !== 'frequencyHz' || query.direction === 'desc') {
    const key = query.sort;
    const sign = query.direction === 'asc' ? 1 : -1;
    rows.sort((a, b) => {
      const x = a[key];
      const y = b[key];
      if (x === null || y === null) return x === y ? a.index - b.index : x === null ? 1 : -1;
      return x === y ? a.index - b.index : sign * (x - y);
    });
  }
  const first = (query.page - 1) * query.pageSize;
  return {
    items: rows.slice(first, first + query.pageSize),
    page: query.page,
    pageSize: query.pageSize,
    total: rows.length,
    pointCount: analysis.points.length,
    computedAt: analysis.computedAt,
  };
}
