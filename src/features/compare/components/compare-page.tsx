// Compare (issue 5): any bench sessions side by side — same or different designs or revisions —
// their CMRR overlaid, and the difference from the first at a chosen frequency. The address holds
// the choice (?sessions=…&f=…), so a comparison can be shared by link.
import { lazy, Suspense, useMemo, useState } from 'react';
import { compareSessionsAt } from '../../../../shared/analysis/session-summary';
import type { Role } from '../../../../shared/schemas/users';
import { Button } from '../../../components/button';
import { PageHeader } from '../../../components/page-header';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { errorMessage } from '../../../lib/api-client';
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';
import { formatDateTime } from '../../../lib/format-date';
import { revisionName } from '../../../lib/format-revision';
import { useUrlState } from '../../../lib/url-state';
import { useComparedSessions, useSessionSearch } from '../api/get-compare-data';
import { prepareComparisonChart } from './compare-chart-data';
import {
  DEFAULT_COMPARE_FREQUENCY_HZ,
  MAX_COMPARED_SESSIONS,
  parseFrequencyHz,
  parseSessionIds,
  serialiseFrequencyHz,
  serialiseSessionIds,
} from './compare-state';
import { sessionStyle } from './compare-styles';

// uPlot travels only with the chart's own chunk.
const CompareChart = lazy(() => import('./compare-chart'));

export default function ComparePage({ role }: { role: Role }) {
  const [view, setView] = useUrlState({ sessions: '', f: String(DEFAULT_COMPARE_FREQUENCY_HZ) });
  const sessionIds = useMemo(() => parseSessionIds(view.sessions), [view.sessions]);
  const frequencyHz = parseFrequencyHz(view.f) ?? DEFAULT_COMPARE_FREQUENCY_HZ;
  const compared = useComparedSessions(sessionIds);
  const setSessions = (ids: string[]) => setView({ sessions: serialiseSessionIds(ids) });

  const labelOf = (index: number) => {
    const detail = compared[index]?.detail;
    return detail ? `${detail.unitSerial} (${detail.design.name}, ${revisionName(detail.designRevision.label)})` : sessionIds[index];
  };
  const ready = compared.filter((entry) => entry.analysis);
  const chart = useMemo(
    () =>
      prepareComparisonChart(
        compared.filter((entry) => entry.analysis).map((entry) => ({ sessionId: entry.sessionId, label: entry.detail?.unitSerial ?? entry.sessionId, points: entry.analysis!.points })),
        1600,
      ),
    [compared],
  );
  const comparison = useMemo(() => {
    const sessions = compared.filter((entry) => entry.analysis);
    if (sessions.length === 0) return null;
    return compareSessionsAt(
      sessions.map((entry) => ({ sessionId: entry.sessionId, label: entry.detail?.unitSerial ?? entry.sessionId, points: entry.analysis!.points })),
      frequencyHz,
    );
  }, [compared, frequencyHz]);

  return (
    <>
      <PageHeader
        title="Compare"
        lead="Bench sessions side by side — the same board over time, two revisions, or two designs — with the difference in CMRR at the frequency you choose."
      />
      <div className="grid gap-6 xl:grid-cols-[22rem_minmax(0,1fr)]">
        <SessionPicker
          chosen={sessionIds}
          onAdd={(id) => setSessions([...sessionIds, id])}
          full={sessionIds.length >= MAX_COMPARED_SESSIONS}
          role={role}
        />
        <div className="min-w-0 space-y-5">
          {sessionIds.length === 0 ? (
            <EmptyState title="Choose sessions to compare" icon={<CompareIcon />}>
              <p>Search for bench sessions on the left and add two or more. The first one you add is the reference the others are measured against.</p>
            </EmptyState>
          ) : (
            <>
              <section aria-labelledby="compared-title" className="rounded-lg border border-ink-200 bg-white">
                <h2 id="compared-title" className="border-b border-ink-200 px-5 py-3 text-lg font-semibold text-ink-900">
                  Sessions compared
                </h2>
                <ul className="divide-y divide-ink-100" aria-label="Legend">
                  {sessionIds.map((id, index) => {
                    const entry = compared[index];
                    const style = sessionStyle(index);
                    return (
                      <li key={id} className="flex flex-wrap items-center justify-between gap-2 px-5 py-2.5" data-compared-session={id}>
                        <span className="flex items-center gap-3">
                          <SessionSwatch position={index} />
                          <span>
                            <span className="tabular font-medium" style={{ color: style.colour }}>
                              {entry?.detail?.unitSerial ?? '…'}
                            </span>{' '}
                            {entry?.detail && (
                              <span className="text-ink-700">
                                {entry.detail.design.name}, {revisionName(entry.detail.designRevision.label)} ·{' '}
                                <span className="tabular text-ink-600">{formatDateTime(entry.detail.measuredAt)}</span>
                              </span>
                            )}
                            {index === 0 && <span className="ml-2 text-[0.875rem] font-medium text-ink-600">reference</span>}
                            {entry?.error ? <span className="ml-2 text-fault-700">{errorMessage(entry.error)}</span> : null}
                            {entry?.analysis && entry.analysis.points.length === 0 && <span className="ml-2 text-ink-600">no CMRR points yet</span>}
                          </span>
                        </span>
                        <span className="flex gap-2">
                          {index > 0 && (
                            <Button variant="secondary" onClick={() => setSessions([id, ...sessionIds.filter((other) => other !== id)])}>
                              Make reference
                            </Button>
                          )}
                          <Button variant="secondary" onClick={() => setSessions(sessionIds.filter((other) => other !== id))} aria-label={`Remove ${entry?.detail?.unitSerial ?? id} from the comparison`}>
                            Remove
                          </Button>
                        </span>
                      </li>
                    );
                  })}
                </ul>
              </section>

              {ready.length < compared.length && compared.some((entry) => entry.pending) && <LoadingState label="Loading the sessions' analyses…" />}
              {ready.length > 0 && (
                <section aria-label="CMRR overlaid" className="rounded-lg border border-ink-200 bg-white p-4">
                  <Suspense fallback={<LoadingState label="Loading the chart…" />}>
                    <CompareChart chart={chart} frequencyHz={frequencyHz} onPick={(picked) => setView({ f: serialiseFrequencyHz(picked) })} />
                  </Suspense>
                </section>
              )}

              <FrequencyReadout frequencyHz={frequencyHz} text={view.f} onChange={(f) => setView({ f })} comparison={comparison} labelOf={labelOf} ids={sessionIds} />
            </>
          )}
        </div>
      </div>
    </>
  );
}

function FrequencyReadout({
  frequencyHz,
  text,
  onChange,
  comparison,
  labelOf,
  ids,
}: {
  frequencyHz: number;
  text: string;
  onChange: (text: string) => void;
  comparison: ReturnType<typeof compareSessionsAt> | null;
  labelOf: (index: number) => string;
  ids: string[];
}) {
  const [draft, setDraft] = useState(text);
  const [lastText, setLastText] = useState(text);
  if (text !== lastText) {
    // The address changed (a click on the chart): show it in the box.
    setLastText(text);
    setDraft(text);
  }
  const invalid = draft.trim() !== '' && parseFrequencyHz(draft) === null;
  return (
    <section aria-labelledby="difference-title" className="rounded-lg border border-ink-200 bg-white">
      <h2 id="difference-title" className="border-b border-ink-200 px-5 py-3 text-lg font-semibold text-ink-900">
        Difference at <span className="tabular">{formatFrequencyHz(frequencyHz)}</span>
      </h2>
      <form
        className="flex flex-wrap items-end gap-3 px-5 py-3"
        onSubmit={(event) => {
          event.preventDefault();
          const parsed = parseFrequencyHz(draft);
          if (parsed !== null) onChange(String(Number(parsed.toPrecision(6))));
        }}
      >
        <label className="flex flex-col gap-1 text-[0.9375rem] font-medium text-ink-800">
          Comparison frequency
          <input
            className="tabular w-44 rounded-md border border-ink-300 px-3 py-1.5"
            value={draft}
            onChange={(event) => setDraft(event.target.value)}
            aria-invalid={invalid || undefined}
            aria-describedby="frequency-hint"
          />
        </label>
        <Button type="submit" variant="secondary">
          Compare here
        </Button>
        <span id="frequency-hint" className={`text-[0.875rem] ${invalid ? 'text-fault-700' : 'text-ink-600'}`}>
          {invalid ? 'Type a frequency such as 1000, 1 kHz or 2.5k.' : 'In hertz; “k” for kHz. Or click the chart.'}
        </span>
      </form>
      {comparison && (
        <>
          <p className="px-5 pb-2 text-ink-900" data-testid="compare-sentence">
            {comparison.sentence}
          </p>
          <div className="overflow-x-auto">
            <table className="min-w-full text-[0.9375rem]">
              <caption className="sr-only">CMRR of each session at the comparison frequency and its difference from the reference</caption>
              <thead className="bg-ink-50 text-ink-700">
                <tr>
                  <th scope="col" className="px-5 py-1.5 text-left font-semibold">
                    Session
                  </th>
                  <th scope="col" className="px-3 py-1.5 text-right font-semibold">
                    CMRR
                  </th>
                  <th scope="col" className="px-5 py-1.5 text-right font-semibold">
                    Difference from the reference
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {comparison.sessions.map((session, index) => {
                  const position = ids.indexOf(session.sessionId);
                  const kind = session.differenceKind;
                  const qualifier = index === 0 ? '' : kind === 'at-least' ? (session.differenceFromFirstDb! >= 0 ? '≥ ' : '≤ ') : kind === 'at-most' ? (session.differenceFromFirstDb! >= 0 ? '≤ ' : '≥ ') : '';
                  return (
                    <tr key={session.sessionId} data-testid="compare-row">
                      <td className="px-5 py-1.5">
                        <span className="flex items-center gap-2">
                          <SessionSwatch position={position} />
                          {labelOf(position)}
                        </span>
                      </td>
                      <td className="tabular px-3 py-1.5 text-right whitespace-nowrap">{session.cmrrDb === null ? 'not measured here' : formatDb(session.cmrrDb, { lowerBound: session.lowerBound })}</td>
                      <td className="tabular px-5 py-1.5 text-right whitespace-nowrap">
                        {index === 0
                          ? 'reference'
                          : session.differenceFromFirstDb === null || kind === 'unknown'
                            ? '—'
                            : `${qualifier}${formatDb(session.differenceFromFirstDb, { signed: true })}`}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          <p className="px-5 py-2 text-[0.875rem] text-ink-600">Readings between measured points are interpolated in dB against log frequency; nothing is extrapolated. “≥” marks a floor-limited reading.</p>
        </>
      )}
    </section>
  );
}

function SessionPicker({ chosen, onAdd, full, role }: { chosen: string[]; onAdd: (id: string) => void; full: boolean; role: Role }) {
  const [search, setSearch] = useState('');
  const results = useSessionSearch(search);
  return (
    <section aria-labelledby="picker-title" className="h-fit rounded-lg border border-ink-200 bg-white">
      <h2 id="picker-title" className="border-b border-ink-200 px-4 py-3 text-lg font-semibold text-ink-900">
        Add sessions
      </h2>
      <div className="space-y-3 px-4 py-3">
        <label className="flex flex-col gap-1 text-[0.9375rem] font-medium text-ink-800">
          Search sessions
          <input
            type="search"
            className="rounded-md border border-ink-300 px-3 py-1.5 font-normal"
            value={search}
            onChange={(event) => setSearch(event.target.value)}
            placeholder="Unit serial, design or operator"
          />
        </label>
        {full && <p className="text-[0.875rem] text-ink-600">{MAX_COMPARED_SESSIONS} sessions is the most one chart shows clearly; remove one to add another.</p>}
        {results.isPending && <LoadingState label="Searching…" />}
        {results.isError && <ErrorState title="Sessions could not be searched" message={errorMessage(results.error)} onRetry={() => results.refetch()} />}
        {results.isSuccess && results.data.items.length === 0 && (
          <p className="text-ink-700">{role === 'technician' ? 'No sessions match. Sessions you record appear here.' : 'No sessions match.'}</p>
        )}
        {results.isSuccess && results.data.items.length > 0 && (
          <ul className="divide-y divide-ink-100" aria-label="Matching sessions">
            {results.data.items.map((session) => {
              const added = chosen.includes(session.id);
              return (
                <li key={session.id} className="flex items-center justify-between gap-2 py-2">
                  <span className="min-w-0">
                    <span className="tabular block font-medium text-ink-900">{session.unitSerial}</span>
                    <span className="block truncate text-[0.875rem] text-ink-600">
                      {session.design.name}, {revisionName(session.designRevision.label)}
                    </span>
                  </span>
                  <Button variant="secondary" disabled={added || full} onClick={() => onAdd(session.id)} aria-label={added ? `${session.unitSerial} is compared` : `Add ${session.unitSerial}`}>
                    {added ? 'Added' : 'Add'}
                  </Button>
                </li>
              );
            })}
          </ul>
        )}
      </div>
    </section>
  );
}

function SessionSwatch({ position }: { position: number }) {
  const style = sessionStyle(position);
  const fill = style.filled ? style.colour : 'white';
  const shape = {
    circle: <circle cx="17" cy="7" r="4" fill={fill} stroke={style.colour} />,
    square: <rect x="13" y="3" width="8" height="8" fill={fill} stroke={style.colour} />,
    diamond: <path d="M17 2L22 7L17 12L12 7Z" fill={fill} stroke={style.colour} />,
    'triangle-down': <path d="M17 12L22 3H12Z" fill={fill} stroke={style.colour} />,
    'triangle-up': <path d="M17 2L22 11H12Z" fill={fill} stroke={style.colour} />,
    ring: <circle cx="17" cy="7" r="4" fill="white" stroke={style.colour} />,
  }[style.marker];
  return (
    <svg width="34" height="14" viewBox="0 0 34 14" aria-hidden="true" className="shrink-0">
      <line x1="1" y1="7" x2="33" y2="7" stroke={style.colour} strokeWidth="1.5" strokeDasharray={style.dash?.join(' ')} />
      {shape}
    </svg>
  );
}

function CompareIcon() {
  return (
    <svg viewBox="0 0 48 48" className="h-12 w-12" aria-hidden="true">
      <path d="M6 38V8M6 38h36" stroke="currentColor" strokeWidth="2.5" strokeLinecap="round" />
      <path d="M10 14c8 0 10 4 14 10s8 10 16 10" fill="none" stroke="currentColor" strokeWidth="2.5" />
      <path d="M10 18c8 0 11 4 15 9s7 8 15 8" fill="none" stroke="currentColor" strokeWidth="2.5" strokeDasharray="3 4" />
    </svg>
  );
}
