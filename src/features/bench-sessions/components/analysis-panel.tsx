import { lazy, Suspense, type ReactNode } from 'react';
import type { SessionAnalysis } from '../../../../shared/schemas/analysis';
import { Badge, type BadgeTone } from '../../../components/badge';
import { LoadingState } from '../../../components/states';
import { formatDateTime } from '../../../lib/format-date';
import { formatDb, formatHz } from '../../../lib/format-number';

// uPlot travels only with the chart's own chunk.
const CmrrChart = lazy(() => import('./cmrr-chart'));

const statusAppearance: Record<SessionAnalysis['status'], { tone: BadgeTone; symbol: string; label: string }> = {
  complete: { tone: 'good', symbol: '●', label: 'Analysis complete' },
  incomplete: { tone: 'warn', symbol: '◌', label: 'Analysis incomplete' },
  error: { tone: 'fault', symbol: '▲', label: 'Analysis refused the data' },
};

const outcomeAppearance: Record<string, { tone: BadgeTone; symbol: string; label: string }> = {
  pass: { tone: 'good', symbol: '✓', label: 'Pass' },
  fail: { tone: 'fault', symbol: '✗', label: 'Fail' },
  indeterminate: { tone: 'warn', symbol: '?', label: 'Indeterminate' },
  'outside-mask': { tone: 'quiet', symbol: '–', label: 'Outside mask' },
};

export function OutcomeBadge({ outcome }: { outcome: string }) {
  const appearance = outcomeAppearance[outcome] ?? outcomeAppearance['outside-mask'];
  return (
    <Badge tone={appearance.tone} symbol={appearance.symbol}>
      {appearance.label}
    </Badge>
  );
}

function interval(values: [number, number] | null, format: (value: number) => string) {
  if (!values) return null;
  return (
    <span className="block text-[0.875rem] text-ink-600">
      95 %: <span className="tabular">{format(values[0])}</span> … <span className="tabular">{format(values[1])}</span>
    </span>
  );
}

/** The engine's reading of the session: status, the fitted figures, the limit verdict and the CMRR per point. */
export function AnalysisPanel({ analysis }: { analysis: SessionAnalysis }) {
  const status = statusAppearance[analysis.status];
  const fit = analysis.fit;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-3">
        <Badge tone={status.tone} symbol={status.symbol}>
          {status.label}
        </Badge>
        <span className="text-[0.9375rem] text-ink-600">
          <span className="tabular">{analysis.pointCounts.differential}</span> differential and <span className="tabular">{analysis.pointCounts.commonMode}</span>{' '}
          common-mode points · computed <span className="tabular">{formatDateTime(analysis.computedAt)}</span>
        </span>
      </div>
      {analysis.message && <p className="text-ink-800">{analysis.message}</p>}
      <dl className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
        <Figure term="DC CMRR">
          <span className="tabular text-xl font-medium" data-testid="dc-cmrr">
            {formatDb(fit?.cmrrDcDb)}
          </span>
          {fit && interval(fit.cmrrDcDbInterval95, formatDb)}
        </Figure>
        <Figure term="CMRR corner">
          <span className="tabular text-xl font-medium">{fit?.cmrrCornerHz ? formatHz(fit.cmrrCornerHz) : '—'}</span>
          {fit && interval(fit.cmrrCornerHzInterval95, formatHz)}
        </Figure>
        <Figure term="Closed-loop bandwidth">
          <span className="tabular text-xl font-medium">{fit?.bandwidthHz ? formatHz(fit.bandwidthHz) : '—'}</span>
          {fit?.bandwidthNote && <span className="block text-[0.875rem] text-ink-600">{fit.bandwidthNote}</span>}
        </Figure>
        <Figure term="Limit mask verdict">
          {analysis.limits ? (
            <>
              <OutcomeBadge outcome={analysis.limits.overall} />
              <span className="mt-1 block text-[0.875rem] text-ink-600">
                guard band <span className="tabular">{formatDb(analysis.limits.guardBandDb)}</span>
              </span>
            </>
          ) : (
            <span className="text-ink-600">—</span>
          )}
        </Figure>
      </dl>
      {fit && (
        <p className="rounded-md bg-ink-50 px-4 py-3 text-ink-900">
          {fit.regimeSentence}{' '}
          <span className="text-[0.9375rem] text-ink-600">
            ({fit.model === 'first-order' ? 'first-order model' : fit.model === 'smooth' ? 'smooth fit' : 'no fit'}; residual{' '}
            <span className="tabular">{formatDb(fit.residualRmsDb)}</span> rms)
          </span>
        </p>
      )}
      {analysis.warnings.length > 0 && (
        <ul className="list-disc space-y-1 pl-5 text-[0.9375rem] text-amber-900">
          {analysis.warnings.map((warning) => (
            <li key={warning}>{warning}</li>
          ))}
        </ul>
      )}
      {analysis.points.length >= 2 && (
        <div className="rounded-md border border-ink-200 p-3">
          <Suspense fallback={<LoadingState label="Loading the chart…" />}>
            <CmrrChart analysis={analysis} />
          </Suspense>
        </div>
      )}
      {analysis.points.length > 0 && (
        <details className="rounded-md border border-ink-200">
          <summary className="cursor-pointer px-4 py-2 font-medium text-ink-900">
            CMRR per frequency (<span className="tabular">{analysis.points.length}</span> points)
          </summary>
          <div className="max-h-96 overflow-auto">
            <table className="w-full text-left">
              <caption className="sr-only">CMRR per frequency with the limit verdicts</caption>
              <thead className="sticky top-0 bg-ink-50 text-[0.9375rem] text-ink-700">
                <tr>
                  <th scope="col" className="px-3 py-1.5 text-right font-semibold">Frequency</th>
                  <th scope="col" className="px-3 py-1.5 text-right font-semibold">CMRR</th>
                  <th scope="col" className="px-3 py-1.5 text-right font-semibold">Fit</th>
                  <th scope="col" className="px-3 py-1.5 text-right font-semibold">Predicted</th>
                  <th scope="col" className="px-3 py-1.5 text-right font-semibold">Limit</th>
                  <th scope="col" className="px-3 py-1.5 font-semibold">Verdict</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {analysis.points.map((point, index) => {
                  const verdict = analysis.limits?.verdicts[index];
                  return (
                    <tr key={point.frequencyHz}>
                      <td className="tabular px-3 py-1 text-right">{formatHz(point.frequencyHz)}</td>
                      <td className="tabular px-3 py-1 text-right" title={point.lowerBound ? 'Output at the noise floor: the CMRR is at least this' : undefined}>
                        {point.lowerBound ? '≥ ' : ''}
                        {formatDb(point.cmrrDb)}
                      </td>
                      <td className="tabular px-3 py-1 text-right">{formatDb(fit?.fittedCmrrDb[index])}</td>
                      <td className="tabular px-3 py-1 text-right">{formatDb(analysis.prediction[index]?.cmrrDb)}</td>
                      <td className="tabular px-3 py-1 text-right">{formatDb(verdict?.limitDb)}</td>
                      <td className="px-3 py-1">{verdict ? <OutcomeBadge outcome={verdict.outcome} /> : '—'}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          <p className="px-4 py-2 text-[0.875rem] text-ink-600">“≥” marks a lower bound: the common-mode output was at its noise floor.</p>
        </details>
      )}
    </div>
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
