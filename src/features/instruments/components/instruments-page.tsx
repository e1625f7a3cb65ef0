import { useState } from 'react';
import type { Instrument } from '../../../../shared/schemas/instruments';
import type { Role } from '../../../../shared/schemas/users';
import { CalibrationBadge } from '../../../components/badge';
import { Button } from '../../../components/button';
import { FormSuccess } from '../../../components/form-error';
import { PageHeader } from '../../../components/page-header';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { cellClasses, headCellClasses, headClasses, TableFrame } from '../../../components/table';
import { errorMessage } from '../../../lib/api-client';
import { useInstruments } from '../api/get-instruments';
import { InstrumentForm } from './instrument-form';

export default function InstrumentsPage({ role }: { role: Role }) {
  const instruments = useInstruments();
  const isLead = role === 'lead';
  // null: no form; 'new': adding; an instrument: editing it.
  const [editing, setEditing] = useState<Instrument | 'new' | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  function finish(message: string) {
    setEditing(null);
    setNotice(message || null);
  }

  return (
    <>
      <PageHeader
        title="Instruments"
        lead="The signal generators, oscilloscopes, differential and isolated probes used on the bench, with serial numbers and calibration dates, so every measurement says what it was taken with."
        actions={
          isLead && editing === null ? (
            <Button
              onClick={() => {
                setNotice(null);
                setEditing('new');
              }}
            >
              Add instrument
            </Button>
          ) : undefined
        }
      />
      <div className="space-y-6">
        {editing !== null && <InstrumentForm key={editing === 'new' ? 'new' : editing.id} instrument={editing === 'new' ? null : editing} onDone={finish} />}
        <FormSuccess message={notice} />
        {instruments.isPending && <LoadingState label="Loading instruments…" />}
        {instruments.isError && (
          <ErrorState title="Instruments could not be loaded" message={errorMessage(instruments.error)} onRetry={() => instruments.refetch()} />
        )}
        {instruments.isSuccess && instruments.data.instruments.length === 0 && (
          <EmptyState title="No instruments registered yet" icon={<ScopeIcon />}>
            <p>
              {isLead
                ? 'Add the generators, scopes and probes your bench uses with “Add instrument”. '
                : 'A lead registers the instruments used on the bench. '}
              Once registered, they are listed here with their calibration state and can be named in a bench session.
            </p>
          </EmptyState>
        )}
        {instruments.isSuccess && instruments.data.instruments.length > 0 && (
          <TableFrame caption="Instruments used on the bench, with calibration state">
            <thead className={headClasses}>
              <tr>
                <th scope="col" className={headCellClasses}>Name</th>
                <th scope="col" className={headCellClasses}>Kind</th>
                <th scope="col" className={headCellClasses}>Manufacturer / model</th>
                <th scope="col" className={headCellClasses}>Serial</th>
                <th scope="col" className={headCellClasses}>Calibrated on</th>
                <th scope="col" className={headCellClasses}>Due on</th>
                <th scope="col" className={headCellClasses}>Calibration</th>
                {isLead && <th scope="col" className={headCellClasses}><span className="sr-only">Actions</span></th>}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {instruments.data.instruments.map((instrument) => (
                <tr key={instrument.id} className={instrument.retired ? 'bg-ink-50 text-ink-600' : ''}>
                  <th scope="row" className={`${cellClasses} font-medium ${instrument.retired ? 'text-ink-600' : 'text-ink-900'}`}>
                    {instrument.name}
                    {instrument.retired && <span className="ml-2 rounded bg-ink-200 px-1.5 py-0.5 text-sm font-medium text-ink-700">retired</span>}
                    {instrument.notes && <span className="block text-[0.9375rem] font-normal text-ink-600">{instrument.notes}</span>}
                  </th>
                  <td className={cellClasses}>{instrument.kind}</td>
                  <td className={cellClasses}>
                    {instrument.manufacturer} {instrument.model}
                  </td>
                  <td className={`${cellClasses} tabular`}>{instrument.serialNumber}</td>
                  <td className={`${cellClasses} tabular whitespace-nowrap`}>{instrument.calibratedOn ?? '—'}</td>
                  <td className={`${cellClasses} tabular whitespace-nowrap`}>{instrument.calibrationDueOn ?? '—'}</td>
                  <td className={cellClasses}>{instrument.retired ? <span className="text-ink-600">—</span> : <CalibrationBadge state={instrument.calibrationState} />}</td>
                  {isLead && (
                    <td className={cellClasses}>
                      <Button
                        size="sm"
                        variant="secondary"
                        aria-label={`Edit ${instrument.name}`}
                        onClick={() => {
                          setNotice(null);
                          setEditing(instrument);
                          window.scrollTo({ top: 0 });
                        }}
                      >
                        Edit
                      </Button>
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </TableFrame>
        )}
      </div>
    </>
  );
}

function ScopeIcon() {
  return (
    <svg viewBox="0 0 48 48" className="h-12 w-12" aria-hidden="true">
      <rect x="5" y="10" width="38" height="26" rx="2" fill="none" stroke="currentColor" strokeWidth="2.5" />
      <path d="M10 26c3-9 5-9 8 0s5 9 8 0" fill="none" stroke="currentColor" strokeWidth="2.5" />
      <circle cx="35" cy="18" r="2" fill="currentColor" />
      <circle cx="35" cy="27" r="2" fill="currentColor" />
    </svg>
  );
}
