import type { Role } from '../../../../shared/schemas/users';
import { PageHeader } from '../../../components/page-header';
import { SafetyNote } from '../../../components/safety-note';
import { EmptyState } from '../../../components/states';

export default function SessionsPage({ role }: { role: Role }) {
  return (
    <>
      <PageHeader
        title="Bench sessions"
        lead="A bench session is one sitting at the bench with one board: the board serial, the instruments and probes used, and every common-mode sweep or capture taken."
      />
      <div className="space-y-6">
        <EmptyState title="No bench sessions recorded yet" icon={<TraceIcon />}>
          {role === 'technician' ? (
            <p>
              Recording sessions is your part of the work. Sessions you and other technicians record appear here, newest
              first, with the board and the design they were measured against.
            </p>
          ) : (
            <p>
              Technicians record bench sessions{role === 'lead' ? ', and leads can too' : ''}. Each one appears here,
              newest first, for {role === 'designer' ? 'you' : 'designers and leads'} to review against the design it
              measures.
            </p>
          )}
        </EmptyState>
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
