// The lot's per-unit table: one row per unit (its session, verdict and tightest margin), sortable.
import type { LotData } from '../api/get-lot';

export interface LotUnitRow {
  sessionId: string;
  unitSerial: string;
  measuredAt: string;
  operator: string;
  archived: boolean;
  outcome: string;
  tightestMarginDb: number | null;
  tightestFrequencyHz: number | null;
  tightestIsLowerBound: boolean;
  outlierFrequenciesHz: number[];
  /** Why a unit has no verdict (its analysis is incomplete or refused). */
  note: string | null;
}

export const lotUnitSortColumns = ['unit', 'measured', 'operator', 'verdict', 'margin'] as const;
export type LotUnitSortColumn = (typeof lotUnitSortColumns)[number];

/** Rows for every unit, joined with the summary's verdicts (units without a complete analysis say why). */
export function lotUnitRows(lot: LotData): LotUnitRow[] {
  const verdicts = new Map((lot.summary?.units ?? []).map((verdict) => [verdict.sessionId, verdict]));
  return lot.units.map((unit) => {
    const verdict = verdicts.get(unit.sessionId);
    return {
      sessionId: unit.sessionId,
      unitSerial: unit.unitSerial,
      measuredAt: unit.measuredAt,
      operator: unit.operator,
      archived: unit.status === 'archived',
      outcome: verdict?.outcome ?? 'none',
      tightestMarginDb: verdict?.tightestMarginDb ?? null,
      tightestFrequencyHz: verdict?.tightestFrequencyHz ?? null,
      tightestIsLowerBound: verdict?.tightestIsLowerBound ?? false,
      outlierFrequenciesHz: verdict?.outlierFrequenciesHz ?? [],
      note: verdict ? null : (unit.analysis.message ?? 'No complete analysis yet'),
    };
  });
}

// Worst first when sorting by verdict ascending.
const outcomeRank: Record<string, number> = { fail: 0, indeterminate: 1, pass: 2, 'outside-mask': 3, none: 4 };

/** Sorted copy; ties fall back to the unit serial. Missing margins sort last either way. */
export function sortLotUnitRows(rows: readonly LotUnitRow[], column: LotUnitSortColumn, direction: 'asc' | 'desc'): LotUnitRow[] {
  const sign = direction === 'asc' ? 1 : -1;
  const bySerial = (a: LotUnitRow, b: LotUnitRow) => a.unitSerial.localeCompare(b.unitSerial, 'en', { numeric: true });
  const compare = (a: LotUnitRow, b: LotUnitRow): number => {
    switch (column) {
      case 'measured':
        return sign * (Date.parse(a.measuredAt) - Date.parse(b.measuredAt));
      case 'operator':
        return sign * a.operator.localeCompare(b.operator, 'en');
      case 'verdict':
        return sign * ((outcomeRank[a.outcome] ?? 5) - (outcomeRank[b.outcome] ?? 5));
      case 'margin': {
        if (a.tightestMarginDb === null || b.tightestMarginDb === null) return (a.tightestMarginDb === null ? 1 : 0) - (b.tightestMarginDb === null ? 1 : 0);
        return sign * (a.tightestMarginDb - b.tightestMarginDb);
      }
      default:
        return sign * bySerial(a, b);
    }
  };
  return [...rows].sort((a, b) => compare(a, b) || bySerial(a, b));
}
