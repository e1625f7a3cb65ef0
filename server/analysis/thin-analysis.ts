// A session analysis thinned for drawing: a 100,000-point session would otherwise cross the wire
// as tens of megabytes that no screen can show. Points are kept per log-frequency column: the
// first, the last, the lowest and the highest CMRR, and every point that fails its limit (up to a
// cap), so the shape, the extremes and the failures all survive.
import type { SessionAnalysis } from '../../shared/schemas/analysis';

/** What live viewers are sent, and what the session page asks for: enough for any screen. */
export const liveAnalysisMaximumPoints = 4000;

/** Index of the points kept, ascending. O(n). */
export function thinnedIndices(frequenciesHz: readonly number[], cmrrDb: readonly number[], failing: readonly boolean[], maximumPoints: number): number[] {
  const count = frequenciesHz.length;
  if (count <= maximumPoints) return Array.from({ length: count }, (_, index) => index);
  const columns = Math.max(1, Math.floor(maximumPoints / 4));
  const lowest = Math.log10(frequenciesHz[0]);
  const span = Math.max(Math.log10(frequenciesHz[count - 1]) - lowest, 1e-12);
  const keep = new Set<number>();
  let column = -1;
  let first = 0;
  let minimum = 0;
  let maximum = 0;
  const close = (last: number) => {
    keep.add(first).add(last).add(minimum).add(maximum);
  };
  for (let index = 0; index < count; index++) {
    const at = Math.min(columns - 1, Math.floor(((Math.log10(frequenciesHz[index]) - lowest) / span) * columns));
    if (at !== column) {
      if (column >= 0) close(index - 1);
      column = at;
      first = minimum = maximum = index;
    }
    if (cmrrDb[index] < cmrrDb[minimum]) minimum = index;
    if (cmrrDb[index] > cmrrDb[maximum]) maximum = index;
  }
  close(count - 1);
  const failureCap = maximumPoints;
  let failures = 0;
  for (let index = 0; index < count && failures < failureCap; index++) {
    if (failing[index]) {
      keep.add(index);
      failures++;
    }
  }
  return [...keep].sort((a, b) => a - b);
}

/** The analysis with at most about `maximumPoints` points (plus failures), everything per point kept aligned. */
export function thinAnalysis(analysis: SessionAnalysis, maximumPoints: number): SessionAnalysis {
  const { points } = analysis;
  if (points.length <= maximumPoints) return analysis;
  const verdicts = analysis.limits?.verdicts;
  const keep = thinnedIndices(
    points.map((point) => point.frequencyHz),
    points.map((point) => point.cmrrDb),
    points.map((_, index) => verdicts?.[index]?.outcome === 'fail'),
    maximumPoints,
  );
  const pick = <T>(values: readonly T[]) => keep.map((index) => values[index]);
  return {
    ...analysis,
    points: pick(points),
    prediction: analysis.prediction.length === points.length ? pick(analysis.prediction) : analysis.prediction,
    fit: analysis.fit ? { ...analysis.fit, fittedCmrrDb: pick(analysis.fit.fittedCmrrDb), residualsDb: pick(analysis.fit.residualsDb) } : null,
    limits: analysis.limits ? { ...analysis.limits, verdicts: pick(analysis.limits.verdicts) } : null,
    thinnedFrom: points.length,
  };
}
