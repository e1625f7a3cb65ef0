import { lazy, Suspense, useMemo, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { LotFrequencySummary } from '../../../../shared/analysis/lot-summary';
import { Badge, type BadgeTone } from '../../../components/badge';
import { PageHeader } from '../../../components/page-header';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { cellClasses, headCellClasses, headClasses, SortHeader, TableFrame } from '../../../components/table';
import { errorMessage, isApiStatus } from '../../../lib/api-client';
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';
import { formatDateTime } from '../../../lib/format-date';
import { revisionName } from '../../../lib/format-revision';
import { useUrlState } from '../../../lib/url-state';
import { lotPath, useLot, type LotData } from '../api/get-lot';
import { prepareLotChart } from './lot-chart-data';
import { lotUnitRows, lotUnitSortColumns, sortLotUnitRows, type LotUnitSortColumn } from './lot-units';

// uPlot travels only with the chart's own chunk.
const LotChart = lazy(() => import('./lot-chart'));

const outcomeAppearance: Record<string, { tone: BadgeTone; symbol: string; label: string }> = {
  pass: { tone: 'good', symbol: '✓', label: 'Pass' },
  fail: { tone: 'fault', symbol: '✗', label: 'Fail' },
  indeterminate: { tone: 'warn', symbol: '?', label: 'Indeterminate' },
  'outside-mask': { tone: 'quiet', symbol: '–', label: 'Outside mask' },
  none: { tone: 'quiet', symbol: '○', label: 'No verdict' },
};

function OutcomeBadge({ outcome }: { outcome: string }) {
  const appearance = outcomeAppearance[outcome] ?? outcomeAppearance.none;
  return (
    <Badge tone={appearance.tone} symbol={appearance.symbol}>
      {appearance.label}
    </Badge>
  );
}

export default function LotPage({ designId, revisionId }: { designId: string; revisionId: string }) {
  const lot = useLot(designId, revisionId);
  if (lot.isPending) return <LoadingState label="Loading the lot and its analyses…" />;
  if (lot.isError) {
    return (
      <>
        <BackLink designId={designId} name="the design" />
        <ErrorState
          title={isApiStatus(lot.error, 404) ? 'No such design revision' : 'The lot could not be loaded'}
          message={errorMessage(lot.error)}
          onRetry={isApiStatus(lot.error, 404) ? undefined : () => lot.refetch()}
        />
      </>
    );
  }
  return <LotView lot={lot.data.lot} />;
}

function BackLink({ designId, name }: { designId: string; name: string }) {
  return (
    <Link to={`/designs/${encodeURIComponent(designId)}`} className="mb-3 inline-block text-[0.9375rem] font-medium text-trace-700 underline underline-offset-2">
      ← {name}
    </Link>
  );
}

function LotView({ lot }: { lot: LotData }) {
  const chart = useMemo(() => prepareLotChart(lot), [lot]);
  const summary = lot.summary;
  const revisionLabel = revisionName(lot.revision.label);
  const exportBase = lotPath(lot.design.id, lot.revision.id);
  const analysisPath = `/designs/${encodeURIComponent(lot.design.id)}/revisions/${encodeURIComponent(lot.revision.id)}`;
  return (
    <>
      <title>{`${lot.design.name} ${revisionLabel} lot · Rejectra`}</title>
      <BackLink designId={lot.design.id} name={lot.design.name} />
      <PageHeader
        title={`${lot.design.name}: ${revisionLabel} lot`}
        lead={
          <>
            <span className="tabular">{lot.units.length}</span> unit{lot.units.length === 1 ? '' : 's'} measured against {revisionLabel} (r{lot.revision.revision}), each by its latest bench session, set against
            the spread the design&apos;s tolerances predict.
          </>
        }
        actions={
          <>
            <Link to={analysisPath} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 font-medium text-trace-700 hover:bg-ink-50">
              Prediction and explorer
            </Link>
            <a href={`${exportBase}/export.csv`} download className="rounded-md border border-ink-300 bg-white px-3 py-1.5 font-medium text-ink-900 hover:bg-ink-50">
              Export CSV
            </a>
            <a href={`${exportBase}/export.json`} download className="rounded-md border border-ink-300 bg-white px-3 py-1.5 font-medium text-ink-900 hover:bg-ink-50">
              Export JSON
            </a>
          </>
        }
      />
      {lot.units.length === 0 ? (
        <EmptyState title={`No unit measured against ${revisionLabel} yet`}>
          <p>Start a bench session for a unit and choose this revision; its curve and verdict appear here once both sweeps are in.</p>
        </EmptyState>
      ) : (
        <div className="space-y-6">
          {summary && (
            <section aria-label="Lot verdict" className="rounded-lg border border-ink-200 bg-white px-5 py-4">
              <div className="flex flex-wrap gap-2">
                {(['pass', 'fail', 'indeterminate', 'outside-mask'] as const)
                  .filter((outcome) => summary.counts[outcome] > 0)
                  .map((outcome) => (
                    <Badge key={outcome} tone={outcomeAppearance[outcome].tone} symbol={outcomeAppearance[outcome].symbol}>
                      <span className="tabular">{summary.counts[outcome]}</span> {outcomeAppearance[outcome].label.toLowerCase()}
                    </Badge>
                  ))}
              </div>
              <p className="mt-3 text-lg text-ink-900" data-testid="lot-verdict-sentence">
                {summary.verdictSentence}
              </p>
              {summary.spreadSentence && (
                <p className="mt-2 text-ink-800" data-testid="lot-spread-sentence">
                  <span className="font-semibold">Are our parts as matched as we think?</span> {summary.spreadSentence}
                </p>
              )}
            </section>
          )}

          <Card title="CMRR of every unit">
            <Suspense fallback={<LoadingState label="Loading the chart…" />}>
              <LotChart chart={chart} />
            </Suspense>
          </Card>

          {summary && <SpreadTable frequencies={summary.frequencies} />}
          <UnitsTable lot={lot} />
        </div>
      )}
    </>
  );
}

function Card({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-lg border border-ink-200 bg-white p-4" aria-label={title}>
      <h2 className="mb-3 text-lg font-semibold text-ink-900">{title}</h2>
      {children}
    </section>
  );
}

function formatCpk(cpk: number | null): string {
  return cpk === null || !Number.isFinite(cpk) ? '—' : cpk.toFixed(2);
}

function SpreadTable({ frequencies }: { frequencies: LotFrequencySummary[] }) {
  return (
    <section aria-labelledby="spread-title">
      <h2 id="spread-title" className="mb-2 text-lg font-semibold text-ink-900">
        Spread at the mask frequencies
      </h2>
      <TableFrame caption="Spread of the lot's CMRR at each summary frequency: mean, standard deviation, minimum, Cpk against the limit, outliers and the predicted band">
        <thead className={headClasses}>
          <tr>
            <th scope="col" className={`${headCellClasses} text-right`}>Frequency</th>
            <th scope="col" className={`${headCellClasses} text-right`}>Limit</th>
            <th scope="col" className={`${headCellClasses} text-right`}>Units</th>
            <th scope="col" className={`${headCellClasses} text-right`}>Mean</th>
            <th scope="col" className={`${headCellClasses} text-right`}>σ</th>
            <th scope="col" className={`${headCellClasses} text-right`}>Min</th>
            <th scope="col" className={`${headCellClasses} text-right`} title="(mean − limit)/(3σ)">
              Cpk
            </th>
            <th scope="col" className={headCellClasses}>Outliers</th>
            <th scope="col" className={headCellClasses}>Measured against predicted</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100" data-testid="lot-spread-rows">
          {frequencies.map((entry) => (
            <tr key={entry.frequencyHz} className="align-top">
              <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>{formatFrequencyHz(entry.frequencyHz)}</td>
              <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>{formatDb(entry.limitDb)}</td>
              <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>
                {entry.resolvedCount}
                {entry.boundCount > 0 && <span className="block text-[0.8125rem] text-ink-600">+{entry.boundCount} bound{entry.boundCount === 1 ? '' : 's'}</span>}
              </td>
              <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>{formatDb(entry.meanDb)}</td>
              <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>{formatDb(entry.standardDeviationDb, { digits: 2 })}</td>
              <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>{formatDb(entry.minimumDb)}</td>
              <td className={`${cellClasses} tabular text-right ${entry.cpk !== null && entry.cpk < 1 ? 'font-semibold text-fault-700' : ''}`}>
                {formatCpk(entry.cpk)}
                {entry.cpk !== null && entry.cpk < 1 && <span className="sr-only"> (below 1)</span>}
              </td>
              <td className={cellClasses}>
                {entry.outliers.length === 0 ? (
                  <span className="text-ink-500">none</span>
                ) : (
                  <ul>
                    {entry.outliers.map((outlier) => (
                      <li key={outlier.sessionId}>
                        <span aria-hidden="true">◇ </span>
                        <Link to={`/sessions/${encodeURIComponent(outlier.sessionId)}`} className="font-medium text-trace-700 underline underline-offset-2">
                          {outlier.unitSerial}
                        </Link>{' '}
                        <span className="tabular">{formatDb(outlier.cmrrDb)}</span> <span className="text-[0.8125rem] text-ink-600">({outlier.direction}, z {outlier.modifiedZ.toFixed(1)})</span>
                      </li>
                    ))}
                  </ul>
                )}
              </td>
              <td className={`${cellClasses} min-w-[16rem] text-[0.9375rem]`}>
                {entry.spread ? (
                  <>
                    <span className="tabular">
                      {formatDb(entry.spread.predictedP05Db)} … {formatDb(entry.spread.predictedP95Db)}
                    </span>{' '}
                    predicted
                    <span className="block text-ink-700">{entry.spread.sentence}</span>
                  </>
                ) : (
                  <span className="text-ink-500">—</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </TableFrame>
      <p className="mt-2 text-[0.875rem] text-ink-600">
        Mean, σ (n − 1), minimum and Cpk over the resolved units at each frequency; lower bounds are counted apart. Cpk = (mean − limit)/(3σ): below <span className="tabular">1.00</span> the lot
        spreads into the limit. Outliers by the modified z-score (beyond <span className="tabular">3.5</span>).
      </p>
    </section>
  );
}

function UnitsTable({ lot }: { lot: LotData }) {
  const [view, setView] = useUrlState({ sort: 'unit', direction: 'asc' });
  const column = (lotUnitSortColumns as readonly string[]).includes(view.sort) ? (view.sort as LotUnitSortColumn) : 'unit';
  const direction = view.direction === 'desc' ? 'desc' : 'asc';
  const rows = useMemo(() => sortLotUnitRows(lotUnitRows(lot), column, direction), [lot, column, direction]);
  const onSort = (next: string, nextDirection: 'asc' | 'desc') => setView({ sort: next, direction: nextDirection });
  return (
    <section aria-labelledby="units-title">
      <h2 id="units-title" className="mb-2 text-lg font-semibold text-ink-900">
        Units
      </h2>
      <TableFrame caption="Verdict of every unit against the limit mask, with its tightest margin; sortable">
        <thead className={headClasses}>
          <tr>
            <SortHeader label="Unit" column="unit" sort={column} direction={direction} onSort={onSort} />
            <SortHeader label="Measured" column="measured" sort={column} direction={direction} onSort={onSort} />
            <SortHeader label="Operator" column="operator" sort={column} direction={direction} onSort={onSort} />
            <SortHeader label="Verdict" column="verdict" sort={column} direction={direction} onSort={onSort} />
            <SortHeader label="Tightest margin" column="margin" sort={column} direction={direction} onSort={onSort} align="right" />
            <th scope="col" className={headCellClasses}>Outlier at</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100" data-testid="lot-unit-rows">
          {rows.map((row) => (
            <tr key={row.sessionId}>
              <td className={cellClasses}>
                <Link to={`/sessions/${encodeURIComponent(row.sessionId)}`} className="font-medium text-trace-700 underline underline-offset-2">
                  {row.unitSerial}
                </Link>
                {row.archived && <span className="ml-2 text-[0.8125rem] text-ink-600">archived</span>}
              </td>
              <td className={`${cellClasses} tabular`}>{formatDateTime(row.measuredAt)}</td>
              <td className={cellClasses}>{row.operator || '—'}</td>
              <td className={cellClasses}>
                <OutcomeBadge outcome={row.outcome} />
                {row.note && <span className="mt-1 block text-[0.8125rem] text-ink-600">{row.note}</span>}
              </td>
              <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>
                {row.tightestMarginDb === null ? (
                  '—'
                ) : (
                  <>
                    {formatDb(row.tightestMarginDb, { signed: true, lowerBound: row.tightestIsLowerBound })}
                    {row.tightestFrequencyHz !== null && <span className="block text-[0.8125rem] text-ink-600">at {formatFrequencyHz(row.tightestFrequencyHz)}</span>}
                  </>
                )}
              </td>
              <td className={`${cellClasses} tabular`}>
                {row.outlierFrequenciesHz.length === 0 ? <span className="text-ink-500">—</span> : row.outlierFrequenciesHz.map((frequencyHz) => formatFrequencyHz(frequencyHz)).join(', ')}
              </td>
            </tr>
          ))}
        </tbody>
      </TableFrame>
      <p className="mt-2 text-[0.875rem] text-ink-600">Margin = CMRR − limit at the unit&apos;s tightest point (guard band applied in the verdict); “≥” where that point is a lower bound.</p>
    </section>
  );
}
