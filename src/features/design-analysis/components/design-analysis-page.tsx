import { lazy, Suspense, useCallback, useMemo, useState, type ReactNode } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { predictDesign } from '../../../../shared/design-prediction';
import { worstCaseCmrrAtFrequency } from '../../../../shared/analysis/prediction-band';
import { evaluateLimitMask } from '../../../../shared/engine/limit-mask';
import { topologyLabels, type Circuit, type DesignRevision } from '../../../../shared/schemas/designs';
import type { Role } from '../../../../shared/schemas/users';
import { Button, Spinner } from '../../../components/button';
import { PageHeader } from '../../../components/page-header';
import { ErrorState, LoadingState } from '../../../components/states';
import { errorMessage, isApiStatus } from '../../../lib/api-client';
import { formatDb, formatFrequencyHz } from '../../../lib/charts/log-frequency-axis';
import { revisionName } from '../../../lib/format-revision';
import { useDesignForAnalysis } from '../api/get-design';
import { useMonteCarlo } from '../hooks/use-monte-carlo';
import { prepareDesignChart } from './design-chart-data';
import { explorerChanges, explorerCircuit, explorerFrequencies, explorerStateFromCircuit, tightestMaskFrequencyHz, type ExplorerState } from './explorer-state';
import { ToleranceExplorer } from './tolerance-explorer';
import { ToleranceTarget } from './tolerance-target';

// uPlot travels only with the charts' own chunks.
const PredictionChart = lazy(() => import('./prediction-chart'));
const HistogramChart = lazy(() => import('./histogram-chart'));

/** Trials of the histogram, percentiles and yield at the chosen frequency. */
export const EXPLORER_TRIALS = 100_000;
/** Trials of the band over frequency (about 40 frequencies: settles in a fraction of a second). */
export const EXPLORER_BAND_TRIALS = 20_000;
const EXPLORER_SEED = 1;

type Props = { designId: string; revisionId: string; role: Role };

export default function DesignAnalysisPage({ designId, revisionId, role }: Props) {
  const design = useDesignForAnalysis(designId);
  if (design.isPending) return <LoadingState label="Loading the design…" />;
  if (design.isError) {
    return (
      <>
        <BackLink designId={designId} name="the design" />
        <ErrorState
          title={isApiStatus(design.error, 404) ? 'No such design' : 'The design could not be loaded'}
          message={errorMessage(design.error)}
          onRetry={isApiStatus(design.error, 404) ? undefined : () => design.refetch()}
        />
      </>
    );
  }
  const detail = design.data.design;
  const revision = detail.revisions.find((candidate) => candidate.id === revisionId);
  if (!revision) {
    return (
      <>
        <BackLink designId={designId} name={detail.name} />
        <ErrorState title="No such revision" message={`${detail.name} has no revision with this address. Pick one from the design's page.`} />
      </>
    );
  }
  return <RevisionAnalysis key={revision.id} designId={designId} designName={detail.name} revisions={detail.revisions} revision={revision} canEdit={role === 'designer' || role === 'lead'} />;
}

function BackLink({ designId, name }: { designId: string; name: string }) {
  return (
    <Link to={`/designs/${encodeURIComponent(designId)}`} className="mb-3 inline-block text-[0.9375rem] font-medium text-trace-700 underline underline-offset-2">
      ← {name}
    </Link>
  );
}

function RevisionAnalysis({ designId, designName, revisions, revision, canEdit }: { designId: string; designName: string; revisions: DesignRevision[]; revision: DesignRevision; canEdit: boolean }) {
  const navigate = useNavigate();
  const stored = revision.circuit;
  const mask = revision.limitMask;
  const startFrequencyHz = useMemo(
    () =>
      tightestMaskFrequencyHz(mask, (frequencyHz) => {
        try {
          return worstCaseCmrrAtFrequency(stored, frequencyHz);
        } catch {
          return null;
        }
      }),
    [stored, mask],
  );
  const initial = useMemo(() => explorerStateFromCircuit(stored, startFrequencyHz), [stored, startFrequencyHz]);
  const [state, setState] = useState<ExplorerState>(initial);
  const explored = useMemo(() => explorerCircuit(stored, state), [stored, state]);
  // The last usable circuit keeps the charts up while a field is being retyped.
  const [lastGood, setLastGood] = useState<{ circuit: Circuit; frequencyHz: number }>({ circuit: stored, frequencyHz: startFrequencyHz });
  if (explored.circuit && (explored.circuit !== lastGood.circuit || explored.frequencyHz !== lastGood.frequencyHz)) {
    setLastGood({ circuit: explored.circuit, frequencyHz: explored.frequencyHz });
  }
  const circuit = lastGood.circuit;
  const frequencyHz = lastGood.frequencyHz;

  const bandFrequencies = useMemo(() => explorerFrequencies(mask, []), [mask]);
  // The nominal prediction ignores tolerances: a tolerance change (the common one) does not redo
  // it on this thread (an in-amp's takes several ms).
  const nominalKey = JSON.stringify({ ...circuit, toleranceDistribution: 'uniform', ...nominalValues(circuit) });
  const prediction = useMemo(() => predictDesign(JSON.parse(nominalKey) as Circuit, bandFrequencies), [nominalKey, bandFrequencies]);
  const limitDb = useMemo(() => {
    try {
      return evaluateLimitMask(mask, frequencyHz);
    } catch {
      return null;
    }
  }, [mask, frequencyHz]);

  const monteCarlo = useMonteCarlo({
    circuit,
    frequencyHz,
    limitDb,
    trials: EXPLORER_TRIALS,
    bandTrials: EXPLORER_BAND_TRIALS,
    seed: EXPLORER_SEED,
    histogramBins: 40,
    bandFrequenciesHz: bandFrequencies,
  });
  const band = monteCarlo.band?.points ?? null;
  const chart = useMemo(() => prepareDesignChart(prediction, band, mask), [prediction, band, mask]);
  const changes = explorerChanges(stored, circuit);
  const atFrequency = monteCarlo.atFrequency?.result ?? null;
  const setFrequency = useCallback((value: number) => setState((current) => ({ ...current, frequencyHz: String(value) })), []);
  const tryTolerance = useCallback((percent: string) => setState((current) => ({ ...current, toleranceMode: 'all', allTolerancePercent: percent })), []);

  const startRevision = () =>
    navigate(`/designs/${encodeURIComponent(designId)}`, { state: { explorerStart: { fromRevisionId: revision.id, circuit } } });

  return (
    <>
      <title>{`${designName} ${revisionName(revision.label)} · prediction · Rejectra`}</title>
      <BackLink designId={designId} name={designName} />
      <PageHeader
        title={`${designName}: prediction`}
        lead={
          <>
            {revisionName(revision.label, true)} (r{revision.revision}), {topologyLabels[stored.topology].toLowerCase()}. Predicted rejection, its Monte Carlo spread over the resistor tolerances and
            op-amp data, and a tolerance explorer computed in your browser.
          </>
        }
        actions={
          <div className="flex flex-wrap items-end gap-3">
            <label className="text-[0.9375rem] text-ink-700">
              <span className="block font-medium text-ink-900">Revision</span>
              <select
                className="mt-1 rounded-md border border-ink-300 bg-white px-3 py-1.5"
                value={revision.id}
                onChange={(event) => navigate(`/designs/${encodeURIComponent(designId)}/revisions/${encodeURIComponent(event.target.value)}`)}
              >
                {revisions.map((candidate) => (
                  <option key={candidate.id} value={candidate.id}>
                    {revisionName(candidate.label, true)} (r{candidate.revision})
                  </option>
                ))}
              </select>
            </label>
            {revision.sessionCount > 0 && (
              <Link
                to={`/designs/${encodeURIComponent(designId)}/revisions/${encodeURIComponent(revision.id)}/lot`}
                className="rounded-md border border-ink-300 bg-white px-3 py-1.5 font-medium text-trace-700 hover:bg-ink-50"
              >
                Measured lot ({revision.sessionCount} session{revision.sessionCount === 1 ? '' : 's'})
              </Link>
            )}
          </div>
        }
      />

      <section aria-label="Explorer values compared with the stored revision" className={`mb-5 rounded-lg border px-4 py-3 ${changes.length > 0 ? 'border-amber-500/60 bg-amber-50' : 'border-ink-200 bg-white'}`}>
        {changes.length === 0 ? (
          <p className="text-ink-800">
            Showing {revisionName(revision.label)} as stored. Change values in the explorer to see what they would do; the stored revision is never changed from here.
          </p>
        ) : (
          <div className="flex flex-wrap items-center justify-between gap-3">
            <p className="text-ink-900">
              <span className="font-semibold">Exploring, not saved:</span> {changes.join(' · ')}. {revisionName(revision.label, true)} itself is unchanged.
            </p>
            <div className="flex gap-2">
              <Button size="sm" variant="secondary" onClick={() => setState(initial)}>
                Back to {revisionName(revision.label)}
              </Button>
              {canEdit && (
                <Button size="sm" onClick={startRevision} title="Opens the design form prefilled with these values; nothing is saved until you save it there">
                  Start a new revision with these values
                </Button>
              )}
            </div>
          </div>
        )}
      </section>

      <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-6">
          <Card
            title="Predicted CMRR against frequency"
            aside={
              monteCarlo.band && monteCarlo.bandProgress < 1 ? (
                <span className="inline-flex items-center gap-2 text-[0.875rem] text-ink-600" role="status">
                  <Spinner className="text-trace-600" /> Updating the band… <span className="tabular">{Math.round(100 * monteCarlo.bandProgress)} %</span>
                </span>
              ) : (
                <span className="text-[0.875rem] text-ink-600">
                  Band: <span className="tabular">{EXPLORER_BAND_TRIALS.toLocaleString('en-GB')}</span> trials per frequency
                </span>
              )
            }
          >
            <Suspense fallback={<LoadingState label="Loading the chart…" />}>
              <PredictionChart chart={chart} chosenFrequencyHz={frequencyHz} onPickFrequency={setFrequency} />
            </Suspense>
          </Card>

          <Card
            title={`Monte Carlo at ${formatFrequencyHz(frequencyHz)}`}
            aside={
              <span className="inline-flex items-center gap-2 text-[0.875rem] text-ink-600" role="status" aria-live="polite">
                {monteCarlo.pending ? (
                  <>
                    <Spinner className="text-trace-600" /> Computing…
                  </>
                ) : monteCarlo.atFrequency ? (
                  <>
                    <span className="tabular">{monteCarlo.atFrequency.result.trials.toLocaleString('en-GB')}</span> trials in{' '}
                    <span className="tabular" title={`${Math.round(monteCarlo.atFrequency.computeMs)} ms of it computing in the worker`}>
                      {Math.max(1, Math.round(monteCarlo.atFrequency.roundTripMs))} ms
                    </span>
                  </>
                ) : null}
              </span>
            }
          >
            <FrequencyPicker mask={mask.points.map((point) => point.frequencyHz)} value={state.frequencyHz} error={explored.errors.frequencyHz} onChange={(text) => setState((current) => ({ ...current, frequencyHz: text }))} />
            {monteCarlo.error && !monteCarlo.pending && (
              <p role="alert" className="mt-3 flex items-start gap-1.5 font-medium text-fault-600">
                <span aria-hidden="true">▲</span>
                {monteCarlo.error.message}
              </p>
            )}
            {atFrequency ? (
              <>
                <dl className="mt-4 grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
                  <Figure term={limitDb === null ? 'Yield' : `Yield against ${formatDb(limitDb)}`}>
                    {atFrequency.yieldFraction !== undefined ? (
                      <span className="tabular text-2xl font-semibold" data-testid="explorer-yield">
                        {formatYield(atFrequency.yieldFraction)}
                      </span>
                    ) : (
                      <span className="text-ink-600">no limit at this frequency</span>
                    )}
                    <span className="block text-[0.875rem] text-ink-600">trials at or above the limit{mask.guardBandDb > 0 ? ` (a measured unit must also clear the ${formatDb(mask.guardBandDb)} guard band)` : ''}</span>
                  </Figure>
                  <Figure term="5th / 50th / 95th percentile">
                    <span className="tabular text-lg font-medium">
                      {formatDb(atFrequency.p05Db)} / {formatDb(atFrequency.p50Db)} / {formatDb(atFrequency.p95Db)}
                    </span>
                  </Figure>
                  <Figure term="Worst case">
                    <span className="tabular text-lg font-medium" data-testid="explorer-worst-case">
                      {formatDb(atFrequency.worstCaseDb)}
                    </span>
                    <span className="block text-[0.875rem] text-ink-600">every resistor at a tolerance corner, both op-amp signs</span>
                  </Figure>
                  <Figure term="Trials">
                    <span className="tabular text-lg font-medium">{atFrequency.trials.toLocaleString('en-GB')}</span>
                    <span className="block text-[0.875rem] text-ink-600">
                      {atFrequency.distribution === 'uniform' ? 'uniform within ±tol' : 'normal, σ = tol/3'}, op-amp signs at random, seed <span className="tabular">{atFrequency.seed}</span>
                    </span>
                  </Figure>
                </dl>
                <div className="mt-4">
                  <Suspense fallback={<LoadingState label="Loading the histogram…" />}>
                    <HistogramChart result={atFrequency} />
                  </Suspense>
                </div>
              </>
            ) : (
              <LoadingState label={`Running ${EXPLORER_TRIALS.toLocaleString('en-GB')} trials…`} />
            )}
          </Card>
        </div>

        <aside className="space-y-6" aria-label="Tolerance explorer">
          <ToleranceExplorer topology={stored.topology} state={state} errors={explored.errors} onChange={setState} storedOpAmpName={stored.opAmp?.partNumber ?? null} />
        </aside>
      </div>

      <div className="mt-6">
        <ToleranceTarget
          circuit={circuit}
          defaultTargetDb={Math.max(...mask.points.map((point) => point.minimumCmrrDb)) + mask.guardBandDb}
          onTryTolerance={tryTolerance}
        />
      </div>
    </>
  );
}

/** The resistors with their tolerances left out (what the nominal prediction depends on), each given a placeholder tolerance. */
function nominalValues(circuit: Circuit): Record<string, { ohms: number; tolerance: number }> {
  const values: Record<string, { ohms: number; tolerance: number }> = {};
  for (const [key, value] of Object.entries(circuit)) {
    if (value && typeof value === 'object' && 'ohms' in value) values[key] = { ohms: (value as { ohms: number }).ohms, tolerance: 0.001 };
  }
  return values;
}

function formatYield(fraction: number): string {
  const percent = 100 * fraction;
  if (percent === 100) return '100 %';
  if (percent >= 99.9) return `${percent.toFixed(3)} %`;
  return `${percent.toFixed(1)} %`;
}

function FrequencyPicker({ mask, value, error, onChange }: { mask: number[]; value: string; error?: string; onChange: (text: string) => void }) {
  return (
    <div className="flex flex-wrap items-end gap-3">
      <label className="block">
        <span className="block font-medium text-ink-900">Frequency (Hz)</span>
        <input
          className={`mt-1 w-36 rounded-md border bg-white px-3 py-1.5 font-mono ${error ? 'border-fault-600' : 'border-ink-300'}`}
          inputMode="decimal"
          value={value}
          aria-invalid={error ? true : undefined}
          onChange={(event) => onChange(event.target.value)}
        />
      </label>
      <div className="flex flex-wrap gap-1.5" role="group" aria-label="Mask frequencies">
        {mask.map((frequencyHz) => (
          <Button key={frequencyHz} size="sm" variant="secondary" onClick={() => onChange(String(frequencyHz))}>
            <span className="tabular">{formatFrequencyHz(frequencyHz)}</span>
          </Button>
        ))}
      </div>
      {error && (
        <p className="basis-full text-[0.9375rem] font-medium text-fault-600">
          <span aria-hidden="true">▲ </span>
          {error}
        </p>
      )}
    </div>
  );
}

function Card({ title, aside, children }: { title: string; aside?: ReactNode; children: ReactNode }) {
  return (
    <section className="rounded-lg border border-ink-200 bg-white p-4" aria-label={title}>
      <header className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-lg font-semibold text-ink-900">{title}</h2>
        {aside}
      </header>
      {children}
    </section>
  );
}

function Figure({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="rounded-md border border-ink-200 px-4 py-3">
      <dt className="text-[0.9375rem] text-ink-600">{term}</dt>
      <dd className="mt-1">{children}</dd>
    </div>
  );
}
