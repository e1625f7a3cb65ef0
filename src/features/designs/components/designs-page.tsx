import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { topologyLabels } from '../../../../shared/schemas/designs';
import type { Role } from '../../../../shared/schemas/users';
import { Button } from '../../../components/button';
import { PageHeader } from '../../../components/page-header';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { cellClasses, headCellClasses, headClasses, TableFrame } from '../../../components/table';
import { errorMessage } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format-date';
import { useDesigns } from '../api/get-designs';
import { DesignForm } from './design-form';

export default function DesignsPage({ role }: { role: Role }) {
  const canCreate = role === 'designer' || role === 'lead';
  const designs = useDesigns();
  const navigate = useNavigate();
  const [creating, setCreating] = useState(false);

  return (
    <>
      <PageHeader
        title="Designs"
        lead="A design is one analog front-end: its amplifier topology, resistor network, gains and tolerances, and the common-mode rejection it must reach. Every edit is kept as a new revision."
        actions={canCreate && !creating ? <Button onClick={() => setCreating(true)}>Create a design</Button> : undefined}
      />
      <div className="space-y-6">
        {creating && (
          <DesignForm
            onCancel={() => setCreating(false)}
            onSaved={(designId, message) => navigate(`/designs/${designId}`, { state: { notice: message } })}
          />
        )}
        {designs.isPending && <LoadingState label="Loading designs…" />}
        {designs.isError && <ErrorState title="Designs could not be loaded" message={errorMessage(designs.error)} onRetry={() => designs.refetch()} />}
        {designs.isSuccess && designs.data.designs.length === 0 && (
          <EmptyState title="No designs in Rejectra yet" icon={<BoardIcon />}>
            {canCreate ? (
              <p>
                Designs are created by designers and leads — that includes you: use “Create a design”. Each design is listed here with its
                latest revision, ready for technicians to measure against.
              </p>
            ) : (
              <p>
                Designs are created by designers and leads. Once one exists it is listed here, and you can choose it when you start a bench
                session on that board.
              </p>
            )}
          </EmptyState>
        )}
        {designs.isSuccess && designs.data.designs.length > 0 && (
          <TableFrame caption="Designs with their latest revision">
            <thead className={headClasses}>
              <tr>
                <th scope="col" className={headCellClasses}>Name</th>
                <th scope="col" className={headCellClasses}>Latest revision</th>
                <th scope="col" className={headCellClasses}>Topology</th>
                <th scope="col" className={`${headCellClasses} text-right`}>Revisions</th>
                <th scope="col" className={`${headCellClasses} text-right`}>Sessions</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {designs.data.designs.map((design) => (
                <tr key={design.id}>
                  <th scope="row" className={`${cellClasses} font-medium`}>
                    <Link to={`/designs/${design.id}`} className="text-trace-700 underline underline-offset-2 hover:text-trace-800">
                      {design.name}
                    </Link>
                    {design.description && <span className="block max-w-xl text-[0.9375rem] font-normal text-ink-600">{design.description}</span>}
                  </th>
                  <td className={cellClasses}>
                    <span className="font-medium">{design.latestRevision.label}</span>{' '}
                    <span className="tabular text-ink-600">r{design.latestRevision.revision}</span>
                    <span className="tabular block text-ink-600">{formatDateTime(design.latestRevision.createdAt)}</span>
                  </td>
                  <td className={cellClasses}>{topologyLabels[design.latestRevision.topology]}</td>
                  <td className={`${cellClasses} tabular text-right`}>{design.revisionCount}</td>
                  <td className={`${cellClasses} tabular text-right`}>
                    {design.sessionCount > 0 ? (
                      <Link to={`/sessions?designId=${encodeURIComponent(design.id)}`} className="text-trace-700 underline underline-offset-2">
                        {design.sessionCount}
                      </Link>
                    ) : (
                      0
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </TableFrame>
        )}
      </div>
    </>
  );
}

function BoardIcon() {
  return (
    <svg viewBox="0 0 48 48" className="h-12 w-12" aria-hidden="true">
      <rect x="7" y="9" width="34" height="30" rx="3" fill="none" stroke="currentColor" strokeWidth="2.5" />
      <rect x="17" y="18" width="14" height="12" fill="none" stroke="currentColor" strokeWidth="2.5" />
      <path d="M20 18v-4M24 18v-4M28 18v-4M20 30v4M24 30v4M28 30v4" stroke="currentColor" strokeWidth="2" />
    </svg>
  );
}
