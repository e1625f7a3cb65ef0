import { useState, type FormEvent } from 'react';
import { Link } from 'react-router-dom';
import type { BenchSessionListQuery } from '../../../../shared/schemas/bench-sessions';
import type { Role } from '../../../../shared/schemas/users';
import { Badge, HazardMarker } from '../../../components/badge';
import { Button } from '../../../components/button';
import { PageHeader } from '../../../components/page-header';
import { SafetyNote } from '../../../components/safety-note';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { cellClasses, headCellClasses, headClasses, Pager, SortHeader, TableFrame } from '../../../components/table';
import { errorMessage } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format-date';
import { revisionName } from '../../../lib/format-revision';
import { positiveInteger, useUrlState } from '../../../lib/url-state';
import { useDesignChoices } from '../api/get-design-choices';
import { useSessions } from '../api/get-sessions';
import { canRecordSessions } from './can-record-sessions';

const pageSize = 25;
const sortColumns = ['measuredAt', 'unitSerial', 'design', 'status', 'operator'] as const;
type SortColumn = (typeof sortColumns)[number];

export default function SessionsPage({ role }: { role: Role }) {
  const [view, setView] = useUrlState({ page: '1', sort: 'measuredAt', direction: 'desc', status: '', search: '', designId: '', designRevisionId: '' });
  const sort: SortColumn = (sortColumns as readonly string[]).includes(view.sort) ? (view.sort as SortColumn) : 'measuredAt';
  const page = positiveInteger(view.page, 1);
  const direction = view.direction === 'asc' ? 'asc' : 'desc';
  const query: BenchSessionListQuery = {
    page,
    pageSize,
    sort,
    direction,
    status: view.status === 'open' || view.status === 'archived' ? view.status : undefined,
    search: view.search || undefined,
    designId: view.designId || undefined,
    designRevisionId: view.designRevisionId || undefined,
  };
  const sessions = useSessions(query);
  const designs = useDesignChoices();
  const [searchText, setSearchText] = useState(view.search);
  const filtered = Boolean(query.status || query.search || query.designId || query.designRevisionId);
  const revisionFilterName = (() => {
    const first = sessions.data?.items[0];
    return query.designRevisionId && first ? `${first.design.name}, ${revisionName(first.designRevision.label)}` : 'one design revision';
  })();

  function handleSearch(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setView({ search: searchText.trim() }, { resetPage: true });
  }

  return (
    <>
      <PageHeader
        title="Bench sessions"
        lead="A bench session is one sitting at the bench with one board: the board serial, the instruments and probes used, and every common-mode sweep or capture taken."
        actions={
          canRecordSessions(role) ? (
            <Link to="/sessions/new" className="inline-flex items-center rounded-md border border-trace-700 bg-trace-600 px-4 py-2 font-medium text-white hover:bg-trace-700">
              Start a bench session
            </Link>
          ) : undefined
        }
      />
      <div className="space-y-4">
        <div className="flex flex-wrap items-end gap-3 rounded-lg border border-ink-200 bg-white p-4">
          <form role="search" onSubmit={handleSearch} className="flex items-end gap-2">
            <div className="space-y-1.5">
              <label htmlFor="session-search" className="block font-medium text-ink-900">
                Unit serial or fixture
              </label>
              <input
                id="session-search"
                type="search"
                value={searchText}
                onChange={(event) => setSearchText(event.target.value)}
                placeholder="e.g. HRB204-0007"
                className="block w-64 rounded-md border border-ink-300 bg-white px-3 py-2 text-ink-900 placeholder:text-ink-500"
              />
            </div>
            <Button type="submit" variant="secondary">
              Search
            </Button>
          </form>
          <div className="space-y-1.5">
            <label htmlFor="session-status" className="block font-medium text-ink-900">
              Status
            </label>
            <select
              id="session-status"
              value={view.status}
              onChange={(event) => setView({ status: event.target.value }, { resetPage: true })}
              className="block rounded-md border border-ink-300 bg-white px-3 py-2 text-ink-900"
            >
              <option value="">Open and archived</option>
              <option value="open">Open</option>
              <option value="archived">Archived</option>
            </select>
          </div>
          <div className="space-y-1.5">
            <label htmlFor="session-design" className="block font-medium text-ink-900">
              Design
            </label>
            <select
              id="session-design"
              value={view.designId}
              onChange={(event) => setView({ designId: event.target.value, designRevisionId: '' }, { resetPage: true })}
              className="block max-w-xs rounded-md border border-ink-300 bg-white px-3 py-2 text-ink-900"
            >
              <option value="">All designs</option>
              {designs.data?.designs.map((design) => (
                <option key={design.id} value={design.id}>
                  {design.name}
                </option>
              ))}
            </select>
          </div>
          {query.designRevisionId && (
            <p className="flex items-center gap-2 self-center rounded-full border border-trace-300 bg-trace-50 px-3 py-1 text-[0.9375rem] text-trace-800">
              Only {revisionFilterName}
              <button type="button" className="font-semibold underline" onClick={() => setView({ designRevisionId: '' }, { resetPage: true })}>
                Show all
              </button>
            </p>
          )}
          {filtered && (
            <Button
              variant="quiet"
              className="self-end"
              onClick={() => {
                setSearchText('');
                setView({ status: '', search: '', designId: '', designRevisionId: '' }, { resetPage: true });
              }}
            >
              Clear filters
            </Button>
          )}
        </div>

        {sessions.isPending && <LoadingState label="Loading bench sessions…" />}
        {sessions.isError && <ErrorState title="Bench sessions could not be loaded" message={errorMessage(sessions.error)} onRetry={() => sessions.refetch()} />}
        {sessions.isSuccess && sessions.data.total === 0 && !filtered && (
          <EmptyState title="No bench sessions recorded yet" icon={<TraceIcon />}>
            <p>
              Technicians, designers and leads start a session for each board they measure with “Start a bench session”. Sessions appear here,
              newest first, with the board and the design revision they were measured against.
            </p>
          </EmptyState>
        )}
        {sessions.isSuccess && sessions.data.total === 0 && filtered && (
          <EmptyState title="No bench sessions match these filters">
            <p>Change the search or filters above, or clear them to see every session.</p>
          </EmptyState>
        )}
        {sessions.isSuccess && sessions.data.total > 0 && (
          <div aria-busy={sessions.isPlaceholderData || undefined} className={sessions.isPlaceholderData ? 'opacity-70' : ''}>
            <TableFrame caption="Bench sessions">
              <thead className={headClasses}>
                <tr>
                  <SortHeader label="Unit serial" column="unitSerial" sort={sort} direction={direction} onSort={(column, direction) => setView({ sort: column, direction, page: '1' })} />
                  <SortHeader label="Design" column="design" sort={sort} direction={direction} onSort={(column, direction) => setView({ sort: column, direction, page: '1' })} />
                  <SortHeader label="Operator" column="operator" sort={sort} direction={direction} onSort={(column, direction) => setView({ sort: column, direction, page: '1' })} />
                  <SortHeader label="Measured at" column="measuredAt" sort={sort} direction={direction} onSort={(column, direction) => setView({ sort: column, direction, page: '1' })} />
                  <SortHeader label="Status" column="status" sort={sort} direction={direction} onSort={(column, direction) => setView({ sort: column, direction, page: '1' })} />
                  <th scope="col" className={`${headCellClasses} text-right`}>
                    Sweeps <span className="font-normal">(diff / cm)</span>
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {sessions.data.items.map((session) => (
                  <tr key={session.id} className={session.status === 'archived' ? 'text-ink-700' : ''}>
                    <th scope="row" className={`${cellClasses} text-left`}>
                      <span className="flex flex-wrap items-center gap-2">
                        <Link to={`/sessions/${session.id}`} className="tabular font-medium text-trace-700 underline underline-offset-2 hover:text-trace-800">
                          {session.unitSerial}
                        </Link>
                        {session.hazardousDrive && <HazardMarker compact />}
                      </span>
                      <span className="block text-[0.9375rem] font-normal text-ink-600">{session.fixture}</span>
                    </th>
                    <td className={cellClasses}>
                      {session.design.name} <span className="text-ink-600">{revisionName(session.designRevision.label)}</span>
                    </td>
                    <td className={cellClasses}>{session.operator.name}</td>
                    <td className={`${cellClasses} tabular whitespace-nowrap`}>{formatDateTime(session.measuredAt)}</td>
                    <td className={cellClasses}>
                      {session.status === 'open' ? (
                        <Badge tone="good" symbol="●">Open</Badge>
                      ) : (
                        <Badge tone="quiet" symbol="■">Archived</Badge>
                      )}
                    </td>
                    <td className={`${cellClasses} tabular text-right whitespace-nowrap`}>
                      {session.sweepCounts.differential} / {session.sweepCounts.commonMode}
                    </td>
                  </tr>
                ))}
              </tbody>
            </TableFrame>
            <Pager label="Bench session pages" page={page} pageSize={pageSize} total={sessions.data.total} onPage={(page) => setView({ page: String(page) })} />
          </div>
        )}
        <SafetyNote />
      </div>
    </>
  );
}

function TraceIcon() {
  return (
    <svg viewBox="0 0 48 48" className="h-12 w-12" aria-hidden="true">
      <path d="M5 32h8l4-16 6 22 5-16 3 10h12" fill="none" stroke="currentColor" strokeWidth="2.5" strokeLinejoin="round" strokeLinecap="round" />
    </svg>
  );
}
