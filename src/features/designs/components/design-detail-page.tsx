import { useState } from 'react';
import { Link, useLocation, useNavigate } from 'react-router-dom';
import { circuitResistorLabels, topologyLabels, topologyResistorKeys, type Circuit, type DesignDetail, type DesignRevision } from '../../../../shared/schemas/designs';
import type { Role } from '../../../../shared/schemas/users';
import { Button } from '../../../components/button';
import { FormSuccess } from '../../../components/form-error';
import { PageHeader } from '../../../components/page-header';
import { ErrorState, LoadingState } from '../../../components/states';
import { errorMessage, isApiStatus } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format-date';
import { revisionName } from '../../../lib/format-revision';
import { formatDb, formatHz, formatOhms, formatPercent } from '../../../lib/format-number';
import { useDesign } from '../api/get-design';
import { DesignForm } from './design-form';

export default function DesignDetailPage({ designId, role }: { designId: string; role: Role }) {
  const design = useDesign(designId);
  const location = useLocation();
  const navigate = useNavigate();
  const canEdit = role === 'designer' || role === 'lead';
  const routeState = location.state as { notice?: string; explorerStart?: ExplorerStart } | null;
  const notice = routeState?.notice ?? null;
  // The tolerance explorer hands over what it tried; the form opens prefilled with it (nothing is saved until the form is).
  const explorerStart = canEdit ? (routeState?.explorerStart ?? null) : null;
  const [editing, setEditing] = useState(explorerStart !== null);

  if (design.isPending) return <LoadingState label="Loading the design…" />;
  if (design.isError) {
    return (
      <>
        <BackLink />
        <ErrorState
          title={isApiStatus(design.error, 404) ? 'No such design' : 'The design could not be loaded'}
          message={errorMessage(design.error)}
          onRetry={isApiStatus(design.error, 404) ? undefined : () => design.refetch()}
        />
      </>
    );
  }
  const detail = design.data.design;
  return (
    <>
      <title>{`${detail.name} · Designs · Rejectra`}</title>
      <BackLink />
      <PageHeader
        title={detail.name}
        lead={detail.description || undefined}
        actions={
          canEdit && !editing ? (
            <Button onClick={() => setEditing(true)} title="Opens the latest revision to edit; saving adds a new revision">
              Edit (new revision)
            </Button>
          ) : undefined
        }
      />
      <div className="space-y-6">
        <FormSuccess message={editing ? null : notice} />
        {editing && explorerStart && (
          <p className="rounded-md border border-amber-500/60 bg-amber-50 px-4 py-2 text-ink-900">
            Prefilled from the tolerance explorer: the form below holds the values you tried. Give the revision a label and a change note, then save it as a new revision.
          </p>
        )}
        {editing && (
          <DesignForm
            design={explorerStart ? designStartingFrom(detail, explorerStart) : detail}
            onCancel={() => setEditing(false)}
            onSaved={(_id, message) => {
              setEditing(false);
              navigate('.', { replace: true, state: { notice: message } });
            }}
          />
        )}
        <p className="text-[0.9375rem] text-ink-700">
          Created by {detail.createdBy.name} on <span className="tabular">{formatDateTime(detail.createdAt)}</span> ·{' '}
          <span className="tabular">{detail.revisions.length}</span> revision{detail.revisions.length === 1 ? '' : 's'}, newest first.
        </p>
        {detail.revisions.map((revision, index) => (
          <RevisionCard key={revision.id} designId={detail.id} revision={revision} latest={index === 0} />
        ))}
      </div>
    </>
  );
}

/** What the tolerance explorer passes when asked to start a new revision with its values. */
type ExplorerStart = { fromRevisionId: string; circuit: Circuit };

/**
 * The design as the form should start from it: the form starts from the newest revision, so the
 * explored revision (with the explored circuit) is put first.
 */
function designStartingFrom(detail: DesignDetail, start: ExplorerStart): DesignDetail {
  const from = detail.revisions.find((revision) => revision.id === start.fromRevisionId) ?? detail.revisions[0];
  return { ...detail, revisions: [{ ...from, circuit: start.circuit }, ...detail.revisions.filter((revision) => revision.id !== from.id)] };
}

function BackLink() {
  return (
    <Link to="/designs" className="mb-3 inline-block text-[0.9375rem] font-medium text-trace-700 underline underline-offset-2">
      ← All designs
    </Link>
  );
}

function RevisionCard({ designId, revision, latest }: { designId: string; revision: DesignRevision; latest: boolean }) {
  const circuit = revision.circuit;
  const revisionPath = `/designs/${encodeURIComponent(designId)}/revisions/${encodeURIComponent(revision.id)}`;
  return (
    <section aria-labelledby={`revision-${revision.id}`} className="rounded-lg border border-ink-200 bg-white">
      <header className="flex flex-wrap items-baseline justify-between gap-3 border-b border-ink-200 px-5 py-3">
        <h2 id={`revision-${revision.id}`} className="text-lg font-semibold text-ink-900">
          {revisionName(revision.label, true)} <span className="tabular font-normal text-ink-600">r{revision.revision}</span>
          {latest && <span className="ml-2 rounded bg-trace-100 px-1.5 py-0.5 align-middle text-sm font-medium text-trace-800">latest</span>}
        </h2>
        <p className="text-[0.9375rem] text-ink-700">
          {revision.createdBy.name} · <span className="tabular">{formatDateTime(revision.createdAt)}</span> ·{' '}
          {revision.sessionCount > 0 ? (
            <Link to={`/sessions?designRevisionId=${encodeURIComponent(revision.id)}`} className="font-medium text-trace-700 underline underline-offset-2">
              {revision.sessionCount} bench session{revision.sessionCount === 1 ? '' : 's'}
            </Link>
          ) : (
            'no bench sessions yet'
          )}
        </p>
        <nav aria-label={`Analysis of ${revisionName(revision.label)}`} className="flex basis-full flex-wrap gap-2">
          <Link to={revisionPath} className="rounded-md border border-trace-300 bg-trace-50 px-3 py-1 text-[0.9375rem] font-medium text-trace-800 hover:bg-trace-100">
            Prediction and tolerance explorer
          </Link>
          {revision.sessionCount > 0 && (
            <Link to={`${revisionPath}/lot`} className="rounded-md border border-trace-300 bg-trace-50 px-3 py-1 text-[0.9375rem] font-medium text-trace-800 hover:bg-trace-100">
              Lot view: units measured against {revisionName(revision.label)}
            </Link>
          )}
        </nav>
      </header>
      <div className="grid gap-6 px-5 py-4 lg:grid-cols-3">
        <div>
          <h3 className="font-semibold text-ink-900">{topologyLabels[circuit.topology]}</h3>
          <table className="mt-2 w-full text-left">
            <caption className="sr-only">Resistors of revision {revision.label}</caption>
            <thead className="text-[0.9375rem] text-ink-600">
              <tr>
                <th scope="col" className="py-1 font-medium">Part</th>
                <th scope="col" className="py-1 text-right font-medium">Value</th>
                <th scope="col" className="py-1 text-right font-medium">Tolerance</th>
              </tr>
            </thead>
            <tbody>
              {topologyResistorKeys[circuit.topology].map((name) => {
                const resistor = (circuit as unknown as Record<string, { ohms: number; tolerance: number }>)[name];
                return (
                  <tr key={name} className="border-t border-ink-100">
                    <th scope="row" className="py-1 font-medium">{circuitResistorLabels[name]}</th>
                    <td className="tabular py-1 text-right">{formatOhms(resistor.ohms)}</td>
                    <td className="tabular py-1 text-right">±{formatPercent(resistor.tolerance)}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          <p className="mt-2 text-[0.9375rem] text-ink-700">
            {circuit.toleranceDistribution === 'uniform' ? 'Uniform' : 'Normal'} tolerance distribution · Rs1{' '}
            <span className="tabular">{formatOhms(circuit.sourceResistance1Ohms)}</span>, Rs2 <span className="tabular">{formatOhms(circuit.sourceResistance2Ohms)}</span>
          </p>
        </div>
        <div>
          <h3 className="font-semibold text-ink-900">Op-amp</h3>
          {circuit.opAmp ? (
            <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
              <dt className="text-ink-600">Part</dt>
              <dd className="font-medium">{circuit.opAmp.partNumber}</dd>
              <dt className="text-ink-600">A0</dt>
              <dd className="tabular">{formatDb(circuit.opAmp.openLoopGainDb)}</dd>
              <dt className="text-ink-600">GBW</dt>
              <dd className="tabular">{formatHz(circuit.opAmp.gainBandwidthHz)}</dd>
              <dt className="text-ink-600">CMRR</dt>
              <dd className="tabular">{formatDb(circuit.opAmp.cmrrDb)}</dd>
              <dt className="text-ink-600">CMRR corner</dt>
              <dd className="tabular">{formatHz(circuit.opAmp.cmrrCornerHz)}</dd>
            </dl>
          ) : (
            <p className="mt-2 text-ink-700">No op-amp data: predictions use an ideal op-amp.</p>
          )}
        </div>
        <div>
          <h3 className="font-semibold text-ink-900">Limit mask</h3>
          <table className="mt-2 w-full text-left">
            <caption className="sr-only">Limit mask of revision {revision.label}</caption>
            <thead className="text-[0.9375rem] text-ink-600">
              <tr>
                <th scope="col" className="py-1 font-medium">Frequency</th>
                <th scope="col" className="py-1 text-right font-medium">Minimum CMRR</th>
              </tr>
            </thead>
            <tbody>
              {revision.limitMask.points.map((point) => (
                <tr key={point.frequencyHz} className="border-t border-ink-100">
                  <td className="tabular py-1">{formatHz(point.frequencyHz)}</td>
                  <td className="tabular py-1 text-right">{formatDb(point.minimumCmrrDb)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-[0.9375rem] text-ink-700">
            Guard band <span className="tabular">{formatDb(revision.limitMask.guardBandDb)}</span>
          </p>
        </div>
      </div>
      {revision.changeNote && (
        <p className="border-t border-ink-100 px-5 py-3 text-ink-800">
          <span className="font-medium">Change note:</span> {revision.changeNote}
        </p>
      )}
    </section>
  );
}
