import { useState } from 'react';
import type { SweepSummary } from '../../../../shared/schemas/sweeps';
import type { User } from '../../../../shared/schemas/users';
import { Badge } from '../../../components/badge';
import { Button } from '../../../components/button';
import { ConfirmDialog } from '../../../components/confirm-dialog';
import { TextAreaField } from '../../../components/field';
import { cellClasses, headCellClasses, headClasses, TableFrame } from '../../../components/table';
import { errorMessage } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format-date';
import { formatHz } from '../../../lib/format-number';
import { useDeleteSweep } from '../api/delete-sweep';

const sourceLabels: Record<SweepSummary['source'], string> = { upload: 'File upload', captures: 'Captures', stream: 'Live stream', demo: 'Demo data' };

/** The session's sweeps, oldest first; deleted ones stay listed, struck through, with who and why. */
export function SweepsList({
  sessionId,
  sweeps,
  user,
  archived,
  selectedSweepId,
  onSelect,
}: {
  sessionId: string;
  sweeps: SweepSummary[];
  user: User;
  archived: boolean;
  selectedSweepId: string;
  onSelect: (sweepId: string) => void;
}) {
  const remove = useDeleteSweep();
  const [deleting, setDeleting] = useState<SweepSummary | null>(null);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | null>(null);
  const mayDelete = (sweep: SweepSummary) => !archived && !sweep.deletedAt && (user.role === 'lead' || sweep.createdBy.id === user.id);

  function confirmDelete() {
    if (!deleting) return;
    if (reason.trim().length < 3) {
      setReasonError('Say why the sweep is deleted (at least 3 characters)');
      return;
    }
    setReasonError(null);
    remove.mutate(
      { sessionId, sweepId: deleting.id, reason: reason.trim() },
      {
        onSuccess: () => {
          setDeleting(null);
          setReason('');
        },
      },
    );
  }

  return (
    <>
      <TableFrame caption="Sweeps in this bench session">
        <thead className={headClasses}>
          <tr>
            <th scope="col" className={headCellClasses}>Mode</th>
            <th scope="col" className={headCellClasses}>Source</th>
            <th scope="col" className={`${headCellClasses} text-right`}>Points</th>
            <th scope="col" className={headCellClasses}>Frequency range</th>
            <th scope="col" className={headCellClasses}>By, when</th>
            <th scope="col" className={headCellClasses}><span className="sr-only">Actions</span></th>
          </tr>
        </thead>
        <tbody className="divide-y divide-ink-100">
          {sweeps.map((sweep) => {
            const deleted = sweep.deletedAt !== null;
            const selected = sweep.id === selectedSweepId;
            return (
              <tr key={sweep.id} className={deleted ? 'bg-ink-50 text-ink-600' : selected ? 'bg-trace-50' : ''} data-sweep-mode={sweep.mode}>
                <th scope="row" className={`${cellClasses} text-left font-medium ${deleted ? 'line-through' : ''}`}>
                  {sweep.mode === 'differential' ? 'Differential' : 'Common-mode'}
                  {sweep.state === 'streaming' && (
                    <span className="ml-2 no-underline">
                      <Badge tone="info" symbol="◉">
                        Streaming
                      </Badge>
                    </span>
                  )}
                </th>
                <td className={`${cellClasses} ${deleted ? 'line-through' : ''}`}>
                  {sourceLabels[sweep.source]}
                  {sweep.sourceName && <span className="block max-w-xs truncate text-[0.9375rem] text-ink-600" title={sweep.sourceName}>{sweep.sourceName}</span>}
                </td>
                <td className={`${cellClasses} tabular text-right ${deleted ? 'line-through' : ''}`} data-testid="sweep-point-count">
                  {sweep.pointCount}
                </td>
                <td className={`${cellClasses} tabular whitespace-nowrap ${deleted ? 'line-through' : ''}`}>
                  {sweep.frequencyRangeHz ? `${formatHz(sweep.frequencyRangeHz[0])} – ${formatHz(sweep.frequencyRangeHz[1])}` : '—'}
                </td>
                <td className={cellClasses}>
                  {sweep.createdBy.name} <span className="tabular block text-[0.9375rem] text-ink-600">{formatDateTime(sweep.createdAt)}</span>
                  {deleted && (
                    <span className="mt-1 block text-[0.9375rem] text-fault-700">
                      Deleted by {sweep.deletedBy?.name ?? 'someone'} <span className="tabular">{formatDateTime(sweep.deletedAt!)}</span>: “{sweep.deleteReason}”
                    </span>
                  )}
                </td>
                <td className={cellClasses}>
                  <div className="flex flex-wrap gap-2">
                    {!deleted && (
                      <Button size="sm" variant={selected ? 'primary' : 'secondary'} aria-pressed={selected} onClick={() => onSelect(sweep.id)} aria-label={`Show the points of the ${sweep.mode} sweep ${sweep.sourceName}`}>
                        Points
                      </Button>
                    )}
                    {mayDelete(sweep) && (
                      <Button
                        size="sm"
                        variant="quiet"
                        className="!text-fault-700"
                        onClick={() => {
                          remove.reset();
                          setReason('');
                          setReasonError(null);
                          setDeleting(sweep);
                        }}
                      >
                        Delete…
                      </Button>
                    )}
                  </div>
                </td>
              </tr>
            );
          })}
        </tbody>
      </TableFrame>
      <ConfirmDialog
        open={deleting !== null}
        title="Delete this sweep?"
        confirmLabel="Delete sweep"
        busyLabel="Deleting…"
        busy={remove.isPending}
        error={remove.isError ? errorMessage(remove.error) : null}
        onCancel={() => setDeleting(null)}
        onConfirm={confirmDelete}
      >
        {deleting && (
          <>
            <p>
              The {deleting.mode} sweep <strong className="font-semibold">{deleting.sourceName || sourceLabels[deleting.source]}</strong> (
              <span className="tabular">{deleting.pointCount}</span> points) leaves the analysis. It stays on record, struck through, with your name and
              the reason.
            </p>
            <TextAreaField label="Reason" autoFocus value={reason} onChange={(event) => setReason(event.target.value)} error={reasonError ?? undefined} hint="Required, e.g. “probe ground clip was loose”." />
          </>
        )}
      </ConfirmDialog>
    </>
  );
}
