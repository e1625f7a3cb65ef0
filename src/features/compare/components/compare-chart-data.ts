// The compare view's chart data: every session's CMRR on one merged log-frequency grid, values and
// lower bounds as separate series per session. Pure.
import type { CmrrPoint } from '../../../../shared/engine/cmrr-points';
import { decimateForLogAxis } from '../../../lib/charts/decimation';

export interface ComparedSessionInput {
  sessionId: string;
  label: string;
  points: readonly CmrrPoint[];
}

export interface ComparisonChart {
  frequencyHz: number[];
  /** Per session in the order given: resolved CMRR and lower bounds aligned to frequencyHz (null elsewhere). */
  sessions: { sessionId: string; label: string; valuesDb: (number | null)[]; boundsDb: (number | null)[] }[];
  yRangeDb: [number, number] | null;
}

/**
 * Lays sessions' CMRR onto one ascending grid (the union of their frequencies; equal frequencies
 * share a row). A session above 4 × widthPx points keeps per pixel column its first, last, lowest
 * and highest point (decimateForLogAxis). O(total · log total).
 *
 * @example prepareComparisonChart([a, b], 1000).sessions[1].valuesDb.length // → frequencyHz.length
 */
export function prepareComparisonChart(sessions: readonly ComparedSessionInput[], widthPx: number): ComparisonChart {
  const kept = sessions.map((session) => {
    const sorted = [...session.points].filter((point) => point.frequencyHz > 0 && Number.isFinite(point.cmrrDb)).sort((a, b) => a.frequencyHz - b.frequencyHz);
    if (sorted.length <= 4 * widthPx) return sorted;
    const indices = decimateForLogAxis(sorted.map((point) => point.frequencyHz), [sorted.map((point) => point.cmrrDb)], widthPx);
    return Array.from(indices, (index) => sorted[index]);
  });
  const frequencyHz = [...new Set(kept.flatMap((points) => points.map((point) => point.frequencyHz)))].sort((a, b) => a - b);
  const rowOf = new Map(frequencyHz.map((frequency, index) => [frequency, index]));
  let low = Infinity;
  let high = -Infinity;
  const out = sessions.map((session, position) => {
    const valuesDb = new Array<number | null>(frequencyHz.length).fill(null);
    const boundsDb = new Array<number | null>(frequencyHz.length).fill(null);
    for (const point of kept[position]) {
      const row = rowOf.get(point.frequencyHz)!;
      (point.lowerBound ? boundsDb : valuesDb)[row] = point.cmrrDb;
      low = Math.min(low, point.cmrrDb);
      high = Math.max(high, point.cmrrDb);
    }
    return { sessionId: session.sessionId, label: session.label, valuesDb, boundsDb };
  });
  const yRangeDb: [number, number] | null = low === Infinity ? null : [Math.floor((low - 3) / 10) * 10, Math.ceil((high + 3) / 10) * 10];
  return { frequencyHz, sessions: out, yRangeDb };
}
