// The session view (issue 5): CMRR and gain charts against the design, the fit with its
// uncertainty, the verdict, the diagnosis against the design, and the session's exports. Updates in
// place while a sweep streams in: new analyses reach the charts through setData. While the first
// analysis is on its way (seconds for a long session) the charts are already laid out, empty, so
// its arrival only fills them.
import { lazy, Suspense, useCallback, useDeferredValue, useMemo, useRef, useState, type ReactNode } from 'react';
import { summariseSession, type SessionSummary } from '../../../../shared/analysis/session-summary';
import type { CmrrPoint } from '../../../../shared/engine/cmrr-points';
import type { PredictedPoint } from '../../../../shared/design-prediction';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import type { BenchSessionDetail } from '../../../../shared/schemas/bench-sessions';
import { Badge, type BadgeTone } from '../../../components/badge';
import { LoadingState } from '../../../components/states';
import { errorMessage } from '../../../lib/api-client';
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';
import { prepareSessionCharts } from '../../../lib/charts/session-chart-data';
import { sessionChartWidthPx } from '../../../lib/charts/session-chart-width';
import { formatDateTime } from '../../../lib/format-date';
import { useDesignRevision } from '../api/get-design-revision';
import { AnalysisPointsTable } from './analysis-points-table';
import { SESSION_BAND_TRIALS, useMonteCarloBand } from '../hooks/use-monte-carlo-band';
import { fitParameterRows, marginStatement, prepareResiduals, thinPrediction, thinSessionPoints } from './analysis-figures';
import { alignToFixedSeries, cmrrSeries, gainSeries, type TraceGroup } from './chart-series';

// uPlot travels only with the charts' own chunk, fetched as soon as this view's chunk runs so it
// is usually there before the analysis is; once loaded, the charts render without suspending.
let chartsModule: typeof import('./session-charts') | null = null;
const chartsLoading = import('./session-charts').then((module) => (chartsModule = module));
const LazySessionCharts = lazy(() => chartsLoading.then((module) => ({ default: module.default })));
const LazyResidualChart = lazy(() => chartsLoading.then((module) => ({ default: module.ResidualChart })));

export interface SessionAnalysisViewProps {
  session: BenchSessionDetail;
  /** Null while the analysis is on its way: the charts are laid out empty meanwhile. */
  analysis: SessionAnalysis | null;
  /** When this analysis reached the page (ms since the epoch, TanStack Query's dataUpdatedAt). */
  analysisUpdatedAt: number;
}

const statusAppearance: Record<SessionAnalysis['status'], { tone: BadgeTone; symbol: string; label: string }> = {
  complete: { tone: 'good', symbol: '●', label: 'Analysis complete' },
  incomplete: { tone: 'warn', symbol: '◌', label: 'Analysis incomplete' },
  error: { tone: 'fault', symbol: '▲', label: 'Analysis refused the data' },
};

const pendingAppearance = { tone: 'quiet' as BadgeTone, symbol: '◌', label: 'Analysing the sweeps…' };

const outcomeAppearance: Record<SessionSummary['outcome'], { tone: BadgeTone; symbol: string; label: string }> = {
  pass: { tone: 'good', symbol: '✓', label: 'Pass' },
  fail: { tone: 'fault', symbol: '✗', label: 'Fail' },
  indeterminate: { tone: 'warn', symbol: '?', label: 'Indeterminate' },
  'outside-mask': { tone: 'quiet', symbol: '–', label: 'Outside mask' },
  'no-limit': { tone: 'quiet', symbol: '–', label: 'No limit' },
  'no-data': { tone: 'quiet', symbol: '◌', label: 'No verdict yet' },
};

function OutcomeBadge({ outcome }: { outcome: string }) {
  const appearance = outcomeAppearance[outcome as SessionSummary['outcome']] ?? outcomeAppearance['outside-mask'];
  return (
    <Badge tone={appearance.tone} symbol={appearance.symbol}>
      {appearance.label}
    </Badge>
  );
}

const capitalise = (text: string) => text.charAt(0).toUpperCase() + text.slice(1);

/** Where the session's charts measure their speed (bench/session-chart.bench.ts reads these). */
function markChartsDrawn(analysisUpdatedAt: number): void {
  const arrived = Math.max(0, analysisUpdatedAt - performance.timeOrigin);
  performance.clearMarks('analysis-data-arrived');
  performance.clearMarks('charts-drawn');
  performance.clearMeasures('session-charts');
  performance.mark('analysis-data-arrived', { startTime: arrived });
  performance.mark('charts-drawn');
  performance.measure('session-charts', 'analysis-data-arrived', 'charts-drawn');
}

/** Why there is nothing to draw yet, in the bench's words. */
function incompleteText(analysis: SessionAnalysis): string {
  const { differential, commonMode } = analysis.pointCounts;
  if (differential > 0 && commonMode === 0) {
    return `Only a differential sweep so far (${differential} points). CMRR needs the common-mode sweep too; the charts appear as soon as its first points arrive.`;
  }
  if (commonMode > 0 && differential === 0) {
    return `Only a common-mode sweep so far (${commonMode} points). CMRR needs the differential sweep too; the charts appear as soon as its first points arrive.`;
  }
  if (differential === 0 && commonMode === 0) return 'No sweeps yet. Add a differential and a common-mode sweep below; the charts appear as soon as both have points.';
  return analysis.message ?? 'The sweeps do not overlap in frequency yet, so no CMRR point can be formed.';
}

const noPoints: readonly CmrrPoint[] = [];
const noPrediction: readonly PredictedPoint[] = [];

export default function SessionAnalysisView({ session, analysis, analysisUpdatedAt }: SessionAnalysisViewProps) {
  const design = useDesignRevision(session.design.id, session.designRevision.id);
  const revision = design.data?.revision ?? null;
  const circuit = revision?.circuit ?? null;
  const points = analysis?.points ?? noPoints;
  const analysisFit = analysis?.fit ?? null;
  const analysisPrediction = analysis?.prediction ?? noPrediction;
  const rangeHz = useMemo((): [number, number] | null => {
    let low = Infinity;
    let high = -Infinity;
    for (let index = 0; index < points.length; index++) {
      const frequencyHz = points[index].frequencyHz;
      if (frequencyHz < low) low = frequencyHz;
      if (frequencyHz > high) high = frequencyHz;
    }
    return low > 0 && high >= low ? [low, high] : null;
  }, [points]);
  const band = useMonteCarloBand(session.designRevision.id, circuit, rangeHz);
  // Decimate to about the charts' width on this screen (beside the 24 rem column from 1280 px, the
  // navigation column from 1024 px): a few kept points per pixel column, never fewer than pixels.
  const [widthPx] = useState(() => sessionChartWidthPx(window.innerWidth));
  const [hidden, setHidden] = useState<ReadonlySet<TraceGroup>>(() => new Set());
  const limitMask = revision?.limitMask ?? null;
  // Long sessions are thinned once per analysis; the limit and the Monte Carlo band, which arrive
  // later, then only re-prepare the thinned points.
  const thinned = useMemo(() => thinSessionPoints(points, analysisFit, widthPx), [points, analysisFit, widthPx]);
  const prediction = useMemo(() => thinPrediction(analysisPrediction, widthPx, { points, keptIndices: thinned.keptIndices }), [analysisPrediction, points, thinned, widthPx]);
  const prepared = useMemo(() => {
    const charts = prepareSessionCharts({ points: thinned.points, fit: thinned.fit, prediction, monteCarloBand: band.data, limitMask }, { widthPx });
    return { ...charts, totalPointCount: analysis?.thinnedFrom ?? points.length };
  }, [thinned, prediction, band.data, limitMask, widthPx, analysis?.thinnedFrom, points.length]);
  const cmrr = useMemo(() => alignToFixedSeries(prepared.cmrr, cmrrSeries), [prepared]);
  const gains = useMemo(() => alignToFixedSeries(prepared.gains, gainSeries), [prepared]);
  // The verdict, diagnosis and residuals follow the charts in a render of their own (the
  // diagnosis runs a 20,000-trial Monte Carlo; a long sweep's residuals are 100,000 points), so a
  // new analysis reaches the charts first.
  const settled = useDeferredValue(analysis, null);
  const residuals = useMemo(
    () => (settled?.fit && settled.fit.residualsDb.length > 0 ? prepareResiduals(settled.points, settled.fit, 480) : null),
    [settled],
  );
  const summary = useMemo(() => {
    if (!settled) return null;
    try {
      return { value: summariseSession(settled, circuit), error: null };
    } catch (error) {
      return { value: summariseSession(settled, null), error: errorMessage(error) };
    }
  }, [settled, circuit]);

  const drawn = useRef({ cmrr: -1, gains: -1, marked: -1 });
  const onDrawn = useCallback((chart: 'cmrr' | 'gains', version: number) => {
    const state = drawn.current;
    state[chart] = version;
    // Version 0 is the empty frame laid out before the first analysis: nothing arrived yet.
    if (version > 0 && state.cmrr === version && state.gains === version && state.marked !== version) {
      state.marked = version;
      markChartsDrawn(version);
    }
  }, []);
  const onToggle = useCallback((group: TraceGroup, visible: boolean) => {
    setHidden((current) => {
      const next = new Set(current);
      if (visible) next.delete(group);
      else next.add(group);
      return next;
    });
  }, []);

  const status = analysis ? statusAppearance[analysis.status] : pendingAppearance;
  const fit = analysisFit;
  const margin = summary ? marginStatement(summary.value.tightest, summary.value.predictedAtTightestDb) : null;
  const diagnosis = summary?.value.diagnosis ?? null;
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div className="flex flex-wrap items-center gap-3">
          <Badge tone={status.tone} symbol={status.symbol}>
            {status.label}
          </Badge>
          {analysis ? (
            <span className="text-[0.9375rem] text-ink-600">
              <span className="tabular">{analysis.pointCounts.differential.toLocaleString('en')}</span> differential and{' '}
              <span className="tabular">{analysis.pointCounts.commonMode.toLocaleString('en')}</span>{' '}
              common-mode points · computed <span className="tabular">{formatDateTime(analysis.computedAt)}</span>
            </span>
          ) : (
            <span className="text-[0.9375rem] text-ink-600" data-testid="analysis-pending">
              Fitting the sweeps (<span className="tabular">{session.sweepCounts.differential}</span> differential, <span className="tabular">{session.sweepCounts.commonMode}</span>{' '}
              common-mode); a long session takes a few seconds.
            </span>
          )}
        </div>
        <ExportLinks sessionId={session.id} />
      </div>

      <div className="flex flex-wrap items-center gap-3 rounded-md border border-ink-200 bg-ink-50 px-4 py-3" data-testid="session-verdict" aria-live="polite">
        {summary ? (
          <>
            <OutcomeBadge outcome={summary.value.outcome} />
            <p className="text-lg text-ink-900" data-testid="verdict-sentence">
              {capitalise(summary.value.sentence)}
            </p>
          </>
        ) : (
          <p className="text-ink-700">{analysis ? 'Reading the verdict…' : 'The verdict follows the analysis.'}</p>
        )}
      </div>

      {analysis && analysis.points.length === 0 ? (
        <p className="rounded-md border border-dashed border-ink-300 px-4 py-6 text-ink-800" data-testid="analysis-incomplete">
          {incompleteText(analysis)}
        </p>
      ) : (
        <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_24rem]">
          <div className="min-w-0 space-y-2">
            {analysis && analysis.status !== 'complete' && analysis.message && <p className="text-ink-800">{analysis.message}</p>}
            <Suspense fallback={<LoadingState label="Loading the charts…" />}>
              <SessionChartsNow
                cmrr={cmrr}
                gains={gains}
                prepared={prepared}
                version={analysisUpdatedAt}
                hidden={hidden}
                onToggle={onToggle}
                onDrawn={onDrawn}
                syncKey={`session-${session.id}`}
                pending={analysis === null}
              />
            </Suspense>
            <BandNote
              state={
                circuit === null ? (design.isError ? 'no-design' : 'waiting') : analysis === null ? 'after-analysis' : band.isError ? 'error' : band.isPending ? 'computing' : 'ready'
              }
              message={band.isError ? errorMessage(band.error) : design.isError ? errorMessage(design.error) : null}
            />
          </div>

          <aside className="min-w-0 space-y-4" aria-label="Fit, margin and diagnosis">
            {analysis === null && (
              <Panel title="Fit">
                <p className="text-ink-700">The fit, the margin to the limit and the diagnosis against the design follow the analysis.</p>
              </Panel>
            )}
            {analysis !== null && (
              <>
                {margin && (
                  <Panel title="Margin at the tightest frequency">
                    <p className="text-ink-900" data-testid="tightest-margin">
                      {margin}
                    </p>
                  </Panel>
                )}
                <Panel title="Fit">
                  {fit ? (
                    <>
                      <dl className="divide-y divide-ink-100">
                        {fitParameterRows(fit).map((row) => (
                          <div key={row.key} className="grid grid-cols-[9.5rem_1fr] gap-2 py-1.5">
                            <dt className="text-[0.9375rem] text-ink-600">{row.label}</dt>
                            <dd>
                              <span className="tabular font-medium text-ink-900" data-testid={row.key === 'dc-cmrr' ? 'dc-cmrr' : undefined}>
                                {row.value}
                              </span>
                              {row.detail && <span className="block text-[0.875rem] text-ink-600">{row.detail}</span>}
                            </dd>
                          </div>
                        ))}
                      </dl>
                      <p className="mt-2 text-[0.875rem] text-ink-600">
                        {fit.model === 'first-order' ? 'First-order model' : fit.model === 'smooth' ? `Smooth description (degree ${fit.smoothDegree ?? '?'} in log f)` : 'No model'}: {fit.modelReason}
                      </p>
                    </>
                  ) : (
                    <p className="text-ink-700">No fit yet: too few resolved points.</p>
                  )}
                </Panel>
                {fit && (
                  <Panel title="Where the rejection is limited">
                    <p className="text-ink-900" data-testid="regime-sentence">
                      {fit.regimeSentence}
                    </p>
                  </Panel>
                )}
                <Panel title="Against the design">
                  {diagnosis && diagnosis.sentences.length > 0 ? (
                    <ul className="list-disc space-y-1.5 pl-5 text-ink-900" data-testid="diagnosis">
                      {diagnosis.sentences.map((sentence) => (
                        <li key={sentence}>{sentence}</li>
                      ))}
                    </ul>
                  ) : (
                    <p className="text-ink-700">
                      {!summary
                        ? 'Working out the diagnosis…'
                        : summary.error
                        ? `The design's circuit could not be used: ${summary.error}`
                        : !fit
                          ? 'The diagnosis needs a fit of the measured curve.'
                          : design.isPending
                            ? 'Reading the design revision…'
                            : 'No diagnosis: the design revision could not be read.'}
                    </p>
                  )}
                </Panel>
                {residuals && (
                  <Panel title="Residuals">
                    <Suspense fallback={<LoadingState label="Loading the residual plot…" />}>
                      <ResidualChartNow residuals={residuals} version={analysisUpdatedAt} syncKey={`session-${session.id}`} />
                    </Suspense>
                    <p className="mt-1 text-[0.875rem] text-ink-600">
                      rms <span className="tabular">{formatDb(fit?.residualRmsDb, { digits: 2 })}</span>
                      {residuals.largest && (
                        <>
                          ; largest <span className="tabular">{formatDb(residuals.largest.residualDb, { digits: 2, signed: true })}</span> at{' '}
                          <span className="tabular">{formatFrequencyHz(residuals.largest.frequencyHz)}</span>
                        </>
                      )}
                    </p>
                  </Panel>
                )}
                {analysis.warnings.length > 0 && (
                  <Panel title="Warnings">
                    <ul className="list-disc space-y-1 pl-5 text-[0.9375rem] text-amber-900">
                      {analysis.warnings.map((warning) => (
                        <li key={warning}>{warning}</li>
                      ))}
                    </ul>
                  </Panel>
                )}
              </>
            )}
          </aside>
        </div>
      )}

      {analysis && analysis.points.length > 0 && <AnalysisPointsTable sessionId={session.id} computedAt={analysis.computedAt} pointCount={analysis.thinnedFrom ?? analysis.points.length} />}
    </div>
  );
}

function SessionChartsNow(props: Parameters<typeof import('./session-charts').default>[0]) {
  const Charts = chartsModule?.default ?? LazySessionCharts;
  return <Charts {...props} />;
}

function ResidualChartNow(props: Parameters<typeof import('./session-charts').ResidualChart>[0]) {
  const Chart = chartsModule?.ResidualChart ?? LazyResidualChart;
  return <Chart {...props} />;
}

function BandNote({ state, message }: { state: 'waiting' | 'after-analysis' | 'computing' | 'ready' | 'error' | 'no-design'; message: string | null }) {
  const text = {
    waiting: 'Reading the design revision for its prediction bands…',
    'after-analysis': "The Monte Carlo band of the design's tolerances is computed once the analysis gives the measured frequency range.",
    computing: `Computing the Monte Carlo band (${SESSION_BAND_TRIALS.toLocaleString('en')} trials of the design's tolerances) in the background…`,
    ready: `Monte Carlo band: 5th to 95th percentile of ${SESSION_BAND_TRIALS.toLocaleString('en')} trials of the design's tolerances.`,
    error: `The Monte Carlo band could not be computed: ${message ?? ''}`,
    'no-design': `The design revision could not be read, so the Monte Carlo band and the limit are missing: ${message ?? ''}`,
  }[state];
  return (
    <p className="text-[0.875rem] text-ink-600" data-band-state={state}>
      {text}
    </p>
  );
}

function ExportLinks({ sessionId }: { sessionId: string }) {
  const base = `/api/sessions/${encodeURIComponent(sessionId)}`;
  const link = 'rounded-md border border-ink-300 bg-white px-3 py-1.5 text-[0.9375rem] font-medium text-trace-700 hover:bg-trace-50';
  return (
    <nav aria-label="Export this session" className="flex flex-wrap items-center gap-2">
      <span className="text-[0.9375rem] text-ink-600">Download</span>
      <a className={link} href={`${base}/export.csv`} download>
        CSV
      </a>
      <a className={link} href={`${base}/export.json`} download>
        JSON
      </a>
      <a className={link} href={`${base}/report.pdf`} download>
        PDF report
      </a>
    </nav>
  );
}

function Panel({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-md border border-ink-200 px-4 py-3">
      <h3 className="mb-1.5 text-[0.9375rem] font-semibold text-ink-800">{title}</h3>
      {children}
    </section>
  );
}

