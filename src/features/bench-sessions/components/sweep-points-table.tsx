import type { SweepSummary } from '../../../../shared/schemas/sweeps';
import { ErrorState, LoadingState } from '../../../components/states';
import { cellClasses, headCellClasses, headClasses, Pager, SortHeader, TableFrame } from '../../../components/table';
import { errorMessage } from '../../../lib/api-client';
import { formatDb, formatHz, formatRatio, formatVolts } from '../../../lib/format-number';
import { positiveInteger } from '../../../lib/url-state';
import { useSweepPoints, type SweepPointsQuery } from '../api/get-sweep-points';

const pageSize = 50;
const sorts = ['sequence', 'frequencyHz', 'vinV', 'voutV', 'gain'] as const;

/** One sweep's points, paged and sorted on the server; page and order live in the address. */
export function SweepPointsTable({
  sessionId,
  sweep,
  view,
  onView,
}: {
  sessionId: string;
  sweep: SweepSummary;
  view: { pointsPage: string; pointsSort: string; pointsDirection: string };
  onView: (changes: { pointsPage?: string; pointsSort?: string; pointsDirection?: string }) => void;
}) {
  const query: SweepPointsQuery = {
    page: positiveInteger(view.pointsPage, 1),
    pageSize,
    sort: (sorts as readonly string[]).includes(view.pointsSort) ? (view.pointsSort as SweepPointsQuery['sort']) : 'frequencyHz',
    direction: view.pointsDirection === 'desc' ? 'desc' : 'asc',
  };
  const points = useSweepPoints(sessionId, sweep.id, query);
  const onSort = (column: string, direction: 'asc' | 'desc') => onView({ pointsSort: column, pointsDirection: direction, pointsPage: '1' });
  const commonMode = sweep.mode === 'common-mode';

  if (points.isPending) return <LoadingState label="Loading points…" />;
  if (points.isError) return <ErrorState title="Points could not be loaded" message={errorMessage(points.error)} onRetry={() => points.refetch()} />;
  if (points.data.total === 0) return <p className="text-ink-700">No points in this sweep yet{sweep.state === 'streaming' ? '; they appear here as they are streamed' : ''}.</p>;
  return (
    <div>
      <TableFrame caption={`Points of the ${sweep.mode} sweep ${sweep.sourceName}`}>
        <thead className={headClasses}>
          <tr>
            <SortHeader label="#" column="sequence" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
            <SortHeader label="Frequency" column="frequencyHz" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
            <SortHeader label="vin (rms)" column="vinV" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
            <SortHeader label="vout (rms)" column="voutV" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
            <SortHeader label="Gain" column="gain" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
            <th scope="col" className={`${headCellClasses} text-right`}>Gain (dB)</th>
            <th scope="col" className={`${headCellClasses} text-right`}>Phase</th>
            <th scope="col" className={`${headCellClasses} text-right`}>Floor (rms)</th>
            {commonMode && <th scope="col" className={headCellClasses}>At floor</th>}
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {points.data.items.map((point) => (
            <tr key={point.sequence} className={point.atFloor ? 'bg-amber-50' : ''}>
              <td className={`${cellClasses} tabular py-1.5 text-right text-ink-600`}>{point.sequence}</td>
              <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatHz(point.frequencyHz)}</td>
              <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatVolts(point.vinV)}</td>
              <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatVolts(point.voutV)}</td>
              <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatRatio(point.gain)}</td>
              <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatDb(point.gainDb)}</td>
              <td className={`${cellClasses} tabular py-1.5 text-right`}>{point.phaseDeg === null ? '—' : `${point.phaseDeg.toFixed(1)}°`}</td>
              <td className={`${cellClasses} tabular py-1.5 text-right`}>{point.floorV === null ? '—' : formatVolts(point.floorV)}</td>
              {commonMode && (
                <td className={`${cellClasses} py-1.5`}>
                  {point.atFloor ? (
                    <span className="font-medium text-amber-900" title="Output below twice the noise floor: the CMRR here is only a lower bound">
                      ◐ at floor
                    </span>
                  ) : (
                    ''
                  )}
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </TableFrame>
      <Pager label="Point pages" page={query.page} pageSize={pageSize} total={points.data.total} onPage={(page) => onView({ pointsPage: String(page) })} />
    </div>
  );
}
