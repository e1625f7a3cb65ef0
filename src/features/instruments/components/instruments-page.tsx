import { PageHeader } from '../../../components/page-header';
import { EmptyState } from '../../../components/states';

export default function InstrumentsPage() {
  return (
    <>
      <PageHeader
        title="Instruments"
        lead="The signal generators, oscilloscopes, differential and isolated probes used on the bench, with serial numbers and calibration dates, so every measurement says what it was taken with."
      />
      <EmptyState title="No instruments registered yet" icon={<ScopeIcon />}>
        <p>
          Instruments are added by the people who use them at the bench. Once registered, they are listed here with their
          calibration state and can be named in a bench session.
        </p>
      </EmptyState>
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
