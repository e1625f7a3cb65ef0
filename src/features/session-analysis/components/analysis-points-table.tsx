// Every analysed point of the session (not the thinned set the charts draw): measured, fitted,
// predicted, and against the limit, paged, sorted and filtered on the server; the view lives in
// the address so a list of the worst points can be shared by link.
import { useState } from 'react';
import type { AnalysisPointsQuery } from '../../../../shared/schemas/analysis';
import { Badge, type BadgeTone } from '../../../components/badge';
import { ErrorState, LoadingState } from '../../../components/states';
import { cellClasses, headCellClasses, headClasses, Pager, SortHeader, TableFrame } from '../../../components/table';
import { errorMessage } from '../../../lib/api-client';
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';
import { positiveInteger, useUrlState } from '../../../lib/url-state';
import { useAnalysisPoints } from '../api/get-analysis-points';

const pageSize = 50;
const sorts = ['frequencyHz', 'cmrrDb', 'marginDb', 'residualDb'] as const;
const outcomes = ['all', 'fail', 'indeterminate', 'pass', 'outside-mask'] as const;
const outcomeChoices: Record<(typeof outcomes)[number], string> = {
  all: 'Every point',
  fail: 'Below the limit',
  indeterminate: 'Indeterminate (inside the guard band)',
  pass: 'Passing',
  'outside-mask': 'Outside the mask',
};
const verdictAppearance: Record<string, { tone: BadgeTone; symbol: string; label: string }> = {
  pass: { tone: 'good', symbol: '✓', label: 'Pass' },
  fail: { tone: 'fault', symbol: '✗', label: 'Fail' },
  indeterminate: { tone: 'warn', symbol: '?', label: 'Indeterminate' },
  'outside-mask': { tone: 'quiet', symbol: '–', label: 'Outside mask' },
};

const viewDefaults = { cmrrPage: '1', cmrrSort: 'frequencyHz', cmrrDirection: 'asc', cmrrOutcome: 'all' };

export function AnalysisPointsTable({ sessionId, computedAt, pointCount }: { sessionId: string; computedAt: string; pointCount: number }) {
  const [view, setView] = useUrlState(viewDefaults);
  const shared = Object.entries(view).some(([key, value]) => value !== viewDefaults[key as keyof typeof viewDefaults]);
  const [open, setOpen] = useState(shared);
  const query: AnalysisPointsQuery = {
    page: positiveInteger(view.cmrrPage, 1),
    pageSize,
    sort: (sorts as readonly string[]).includes(view.cmrrSort) ? (view.cmrrSort as AnalysisPointsQuery['sort']) : 'frequencyHz',
    direction: view.cmrrDirection === 'desc' ? 'desc' : 'asc',
    outcome: (outcomes as readonly string[]).includes(view.cmrrOutcome) ? (view.cmrrOutcome as AnalysisPointsQuery['outcome']) : 'all',
  };
  const rows = useAnalysisPoints(sessionId, computedAt, query, open);
  const onSort = (column: string, direction: 'asc' | 'desc') => setView({ cmrrSort: column, cmrrDirection: direction, cmrrPage: '1' });

  return (
    <details className="rounded-md border border-ink-200" open={open} onToggle={(event) => setOpen(event.currentTarget.open)} data-testid="analysis-points">
      <summary className="cursor-pointer px-4 py-2 font-medium text-trace-700">
        CMRR at each point (<span className="tabular">{pointCount.toLocaleString('en')}</span>)
      </summary>
      {open && (
        <div className="space-y-2 px-4 pb-3">
          <label className="flex flex-wrap items-center gap-2 text-[0.9375rem] text-ink-700">
            Points listed
            <select
              className="rounded-md border border-ink-300 bg-white px-2 py-1 text-ink-900"
              value={query.outcome}
              onChange={(event) => setView({ cmrrOutcome: event.target.value, cmrrPage: '1' })}
            >
              {outcomes.map((outcome) => (
                <option key={outcome} value={outcome}>
                  {outcomeChoices[outcome]}
                </option>
              ))}
            </select>
          </label>
          {rows.isPending && <LoadingState label="Loading the analysed points…" />}
          {rows.isError && <ErrorState title="The analysed points could not be loaded" message={errorMessage(rows.error)} onRetry={() => rows.refetch()} />}
          {rows.isSuccess && rows.data.total === 0 && <p className="text-ink-700">No point of this session is {outcomeChoices[query.outcome].toLowerCase()}.</p>}
          {rows.isSuccess && rows.data.total > 0 && (
            <div aria-busy={rows.isPlaceholderData || undefined}>
              <TableFrame caption="CMRR at each measured frequency, with the fit, the prediction and the verdict against the limit">
                <thead className={headClasses}>
                  <tr>
                    <SortHeader label="Frequency" column="frequencyHz" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
                    <SortHeader label="CMRR" column="cmrrDb" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
                    <th scope="col" className={`${headCellClasses} text-right`}>Fit</th>
                    <SortHeader label="Residual" column="residualDb" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
                    <th scope="col" className={`${headCellClasses} text-right`}>Predicted</th>
                    <th scope="col" className={`${headCellClasses} text-right`}>Limit</th>
                    <SortHeader label="Margin" column="marginDb" sort={query.sort} direction={query.direction} onSort={onSort} align="right" />
                    <th scope="col" className={headCellClasses}>Verdict</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink-100">
                  {rows.data.items.map((row) => {
                    const verdict = row.outcome ? verdictAppearance[row.outcome] : null;
                    return (
                      <tr key={row.index}>
                        <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatFrequencyHz(row.frequencyHz)}</td>
                        <td
                          className={`${cellClasses} tabular py-1.5 text-right`}
                          title={row.lowerBound ? 'Output at the noise floor: the CMRR is at least this' : undefined}
                        >
                          {formatDb(row.cmrrDb, { lowerBound: row.lowerBound })}
                        </td>
                        <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatDb(row.fittedCmrrDb)}</td>
                        <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatDb(row.residualDb, { digits: 2, signed: true })}</td>
                        <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatDb(row.predictedCmrrDb)}</td>
                        <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatDb(row.limitDb)}</td>
                        <td className={`${cellClasses} tabular py-1.5 text-right`}>{formatDb(row.marginDb, { signed: true })}</td>
                        <td className={`${cellClasses} py-1.5`}>
                          {verdict ? (
                            <Badge tone={verdict.tone} symbol={verdict.symbol}>
                              {verdict.label}
                            </Badge>
                          ) : (
                            '—'
                          )}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </TableFrame>
              <Pager label="Analysed point pages" page={query.page} pageSize={pageSize} total={rows.data.total} onPage={(page) => setView({ cmrrPage: String(page) })} />
              <p className="text-[0.875rem] text-ink-600">“≥” marks a lower bound: the common-mode output was at its noise floor. Margin is measured minus limit.</p>
            </div>
          )}
        </div>
      )}
    </details>
  );
}
