import { Suspense, useState, type ComponentType, type ReactNode } from 'react';
import { Link, useLocation } from 'react-router-dom';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import type { BenchSessionDetail, Drive } from '../../../../shared/schemas/bench-sessions';
import type { User } from '../../../../shared/schemas/users';
import { Badge, CalibrationBadge, HazardMarker } from '../../../components/badge';
import { Button } from '../../../components/button';
import { ConfirmDialog } from '../../../components/confirm-dialog';
import { FormSuccess } from '../../../components/form-error';
import { PageHeader } from '../../../components/page-header';
import { SafetyNote } from '../../../components/safety-note';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { errorMessage, isApiStatus } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format-date';
import { revisionName } from '../../../lib/format-revision';
import { formatVolts } from '../../../lib/format-number';
import { useUrlState } from '../../../lib/url-state';
import { useArchiveSession } from '../api/archive-session';
import { useAnalysis } from '../api/get-analysis';
import { useSession } from '../api/get-session';
import { useSweeps } from '../api/get-sweeps';
import { useLiveSession } from '../hooks/use-live-session';
import { CapturesUpload } from './captures-upload';
import { LiveIndicator } from './live-indicator';
import { canRecordSessions } from './can-record-sessions';
import { StreamInstructions } from './stream-instructions';
import { SweepPointsTable } from './sweep-points-table';
import { SweepUpload } from './sweep-upload';
import { SweepsList } from './sweeps-list';

function describeDrive(drive: Drive) {
  return (
    <span className="tabular">
      {formatVolts(drive.acVolts)} {drive.acConvention}
      {drive.dcVolts !== 0 && <> + {formatVolts(drive.dcVolts)} dc</>}
    </span>
  );
}

/** What the page hands the analysis view (supplied by the app, so this feature does not import another). */
export interface AnalysisViewProps {
  session: BenchSessionDetail;
  /** Null while the analysis is on its way (the view lays out its charts meanwhile). */
  analysis: SessionAnalysis | null;
  /** When this analysis reached the page, ms since the epoch (0 before it has). */
  analysisUpdatedAt: number;
}

export default function SessionDetailPage({ sessionId, user, analysisView }: { sessionId: string; user: User; analysisView: ComponentType<AnalysisViewProps> }) {
  const session = useSession(sessionId);
  const live = useLiveSession(sessionId);
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice ?? null;

  if (session.isPending) return <LoadingState label="Loading the bench session…" />;
  if (session.isError) {
    return (
      <>
        <BackLink />
        <ErrorState
          title={isApiStatus(session.error, 404) ? 'No such bench session' : 'The bench session could not be loaded'}
          message={errorMessage(session.error)}
          onRetry={isApiStatus(session.error, 404) ? undefined : () => session.refetch()}
        />
      </>
    );
  }
  const detail = session.data.session;
  return (
    <>
      <title>{`${detail.unitSerial} · Bench sessions · Rejectra`}</title>
      <BackLink />
      <SessionBody detail={detail} user={user} live={<LiveIndicator state={live} />} notice={notice} analysisView={analysisView} />
    </>
  );
}

function BackLink() {
  return (
    <Link to="/sessions" className="mb-3 inline-block text-[0.9375rem] font-medium text-trace-700 underline underline-offset-2">
      ← All bench sessions
    </Link>
  );
}

type AddTab = 'file' | 'captures' | 'stream';

function SessionBody({
  detail,
  user,
  live,
  notice,
  analysisView: AnalysisView,
}: {
  detail: BenchSessionDetail;
  user: User;
  live: ReactNode;
  notice: string | null;
  analysisView: ComponentType<AnalysisViewProps>;
}) {
  const sweeps = useSweeps(detail.id);
  const analysis = useAnalysis(detail.id);
  const archive = useArchiveSession();
  const [confirmArchive, setConfirmArchive] = useState(false);
  const [tab, setTab] = useState<AddTab>('file');
  const [view, setView] = useUrlState({ sweep: '', pointsPage: '1', pointsSort: 'frequencyHz', pointsDirection: 'asc' });
  const archived = detail.status === 'archived';
  const canAdd = !archived && canRecordSessions(user.role);
  const visibleSweeps = sweeps.data?.sweeps ?? [];
  const selectedSweep = visibleSweeps.find((sweep) => sweep.id === view.sweep && !sweep.deletedAt) ?? null;
  // With a sweep of each kind there will be charts: the view lays them out while the analysis
  // (seconds for a long session) is computed, so its arrival only has to fill them.
  const chartsExpected = detail.sweepCounts.differential > 0 && detail.sweepCounts.commonMode > 0;
  const showView = analysis.isSuccess || (analysis.isPending && chartsExpected);

  return (
    <>
      <PageHeader
        title={`Unit ${detail.unitSerial}`}
        lead={
          <>
            {detail.design.name}, {revisionName(detail.designRevision.label)} · measured by {detail.operator.name} on{' '}
            <span className="tabular">{formatDateTime(detail.measuredAt)}</span>
          </>
        }
        actions={
          <>
            {/* An archived session takes no more points, so there is nothing live to show. */}
            {!archived && live}
            {archived ? <Badge tone="quiet" symbol="■">Archived</Badge> : <Badge tone="good" symbol="●">Open</Badge>}
            {user.role === 'lead' && !archived && (
              <Button variant="secondary" onClick={() => setConfirmArchive(true)}>
                Archive…
              </Button>
            )}
          </>
        }
      />
      <div className="space-y-6">
        <FormSuccess message={notice} />
        {detail.hazardousDrive && (
          <div className="space-y-2">
            <HazardMarker />
            <SafetyNote />
          </div>
        )}
        <div className="grid gap-6 lg:grid-cols-2">
          <Card title="Set-up">
            <dl className="divide-y divide-ink-100">
              <Row term="Design">
                {detail.design.name}, {revisionName(detail.designRevision.label)} <span className="tabular text-ink-600">r{detail.designRevision.revision}</span>
              </Row>
              <Row term="Fixture">{detail.fixture}</Row>
              <Row term="Ambient temperature">{detail.ambientTemperatureC === null ? '—' : <span className="tabular">{detail.ambientTemperatureC} °C</span>}</Row>
              <Row term="Differential drive">{describeDrive(detail.differentialDrive)}</Row>
              <Row term="Common-mode drive">
                {describeDrive(detail.commonModeDrive)} {detail.hazardousDrive && <HazardMarker compact />}
              </Row>
              <Row term="Status">
                {archived ? (
                  <>
                    Archived{detail.archivedBy ? ` by ${detail.archivedBy.name}` : ''}
                    {detail.archivedAt && <span className="tabular"> {formatDateTime(detail.archivedAt)}</span>}
                  </>
                ) : (
                  'Open: sweeps can be added'
                )}
              </Row>
              {detail.notes && <Row term="Notes"><span className="whitespace-pre-line">{detail.notes}</span></Row>}
            </dl>
          </Card>
          <Card title="Instruments">
            {detail.instruments.length === 0 ? (
              <p className="px-5 py-4 text-ink-700">No instruments were named for this session.</p>
            ) : (
              <ul className="divide-y divide-ink-100">
                {detail.instruments.map((instrument) => (
                  <li key={instrument.id} className="flex flex-wrap items-center justify-between gap-2 px-5 py-3">
                    <span>
                      <span className="font-medium">{instrument.name}</span>{' '}
                      <span className="text-[0.9375rem] text-ink-600">
                        {instrument.model} · <span className="tabular">{instrument.serialNumber}</span>
                      </span>
                    </span>
                    <span className="flex items-center gap-2">
                      {instrument.calibratedOn && <span className="tabular text-ink-600">calibrated {instrument.calibratedOn}</span>}
                      {instrument.calibrationDueOn && <span className="tabular text-ink-600">due {instrument.calibrationDueOn}</span>}
                      <CalibrationBadge state={instrument.calibrationState} />
                    </span>
                  </li>
                ))}
              </ul>
            )}
          </Card>
        </div>

        <Card title="Analysis">
          <div className="px-5 py-4" aria-busy={analysis.isFetching || undefined}>
            {analysis.isPending && !chartsExpected && <LoadingState label="Analysing the sweeps…" />}
            {analysis.isError && <ErrorState title="The analysis could not be loaded" message={errorMessage(analysis.error)} onRetry={() => analysis.refetch()} />}
            {showView && (
              <Suspense fallback={<LoadingState label="Analysing the sweeps…" />}>
                <AnalysisView session={detail} analysis={analysis.data?.analysis ?? null} analysisUpdatedAt={analysis.data ? analysis.dataUpdatedAt : 0} />
              </Suspense>
            )}
          </div>
        </Card>

        <section aria-labelledby="sweeps-title" className="space-y-3">
          <h2 id="sweeps-title" className="text-xl font-semibold text-ink-900">
            Sweeps
          </h2>
          {sweeps.isPending && <LoadingState label="Loading sweeps…" />}
          {sweeps.isError && <ErrorState title="Sweeps could not be loaded" message={errorMessage(sweeps.error)} onRetry={() => sweeps.refetch()} />}
          {sweeps.isSuccess && visibleSweeps.length === 0 && (
            <EmptyState title="No sweeps yet">
              <p>
                {canAdd
                  ? 'Add a differential and a common-mode sweep below: upload a file, upload captures, or stream from the bench. The analysis needs one of each.'
                  : 'Sweeps are added by whoever measures the board; this session has none.'}
              </p>
            </EmptyState>
          )}
          {sweeps.isSuccess && visibleSweeps.length > 0 && (
            <SweepsList
              sessionId={detail.id}
              sweeps={visibleSweeps}
              user={user}
              archived={archived}
              selectedSweepId={selectedSweep?.id ?? ''}
              onSelect={(sweepId) => setView({ sweep: sweepId === view.sweep ? '' : sweepId, pointsPage: '1' })}
            />
          )}
          {selectedSweep && (
            <div className="space-y-2 pt-2">
              <h3 className="text-lg font-semibold text-ink-900">
                Points of the {selectedSweep.mode} sweep <span className="font-normal text-ink-700">{selectedSweep.sourceName}</span>
              </h3>
              <SweepPointsTable sessionId={detail.id} sweep={selectedSweep} view={view} onView={setView} />
            </div>
          )}
        </section>

        {canAdd && (
          <section aria-labelledby="add-title" className="rounded-lg border border-ink-200 bg-white">
            <h2 id="add-title" className="border-b border-ink-200 px-5 py-3 text-xl font-semibold text-ink-900">
              Add sweeps
            </h2>
            <div role="tablist" aria-label="Ways to add sweeps" className="flex flex-wrap gap-1 border-b border-ink-200 px-3 pt-2">
              {(
                [
                  ['file', 'Upload a sweep file'],
                  ['captures', 'Upload captures'],
                  ['stream', 'Stream live'],
                ] as const
              ).map(([id, label]) => (
                <button
                  key={id}
                  type="button"
                  role="tab"
                  id={`add-tab-${id}`}
                  aria-selected={tab === id}
                  aria-controls={`add-panel-${id}`}
                  onClick={() => setTab(id)}
                  className={`-mb-px rounded-t-md border px-4 py-2 font-medium ${tab === id ? 'border-ink-200 border-b-white bg-white text-ink-900' : 'border-transparent text-trace-700 hover:bg-trace-50'}`}
                >
                  {label}
                </button>
              ))}
            </div>
            <div role="tabpanel" id={`add-panel-${tab}`} aria-labelledby={`add-tab-${tab}`} className="px-5 py-4">
              {tab === 'file' && <SweepUpload sessionId={detail.id} />}
              {tab === 'captures' && <CapturesUpload sessionId={detail.id} />}
              {tab === 'stream' && <StreamInstructions sessionId={detail.id} />}
            </div>
          </section>
        )}
        {archived && <p className="text-ink-700">This session is archived: its sweeps are kept as they are and no more can be added.</p>}
      </div>

      <ConfirmDialog
        open={confirmArchive}
        title={`Archive the session of ${detail.unitSerial}?`}
        confirmLabel="Archive session"
        busyLabel="Archiving…"
        tone="primary"
        busy={archive.isPending}
        error={archive.isError ? errorMessage(archive.error) : null}
        onCancel={() => setConfirmArchive(false)}
        onConfirm={() => archive.mutate(detail.id, { onSuccess: () => setConfirmArchive(false) })}
      >
        <p>Archived sessions keep their sweeps and analysis, but no sweeps can be added, streamed or deleted afterwards. This cannot be undone here.</p>
      </ConfirmDialog>
    </>
  );
}

function Card({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section aria-label={title} className="rounded-lg border border-ink-200 bg-white">
      <h2 className="border-b border-ink-200 px-5 py-3 text-lg font-semibold text-ink-900">{title}</h2>
      {children}
    </section>
  );
}

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="grid gap-1 px-5 py-2.5 sm:grid-cols-[11rem_1fr]">
      <dt className="text-ink-600">{term}</dt>
      <dd className="text-ink-900">{children}</dd>
    </div>
  );
}
