import type { Role } from '../../../../shared/schemas/users';
import { PageHeader } from '../../../components/page-header';
import { EmptyState } from '../../../components/states';

export default function ComparePage({ role }: { role: Role }) {
  return (
    <>
      <PageHeader
        title="Compare"
        lead="Predicted common-mode rejection next to what was measured on the bench, frequency by frequency, so you can see where a board departs from its design."
      />
      <EmptyState title="Nothing to compare yet" icon={<CompareIcon />}>
        <p>
          A comparison needs two things: a design with a prediction, and at least one bench session measured on a board
          of that design. Neither exists in Rejectra yet.
        </p>
        <p>
          {role === 'technician'
            ? 'Designers add designs; the sessions you record supply the measured side.'
            : 'Designers and leads add designs and predictions; technicians record the sessions that supply the measured side.'}
        </p>
      </EmptyState>
    </>
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
