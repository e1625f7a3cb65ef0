import type { Role } from '../../../../shared/schemas/users';
import { PageHeader } from '../../../components/page-header';
import { EmptyState } from '../../../components/states';

export default function DesignsPage({ role }: { role: Role }) {
  const canCreate = role === 'designer' || role === 'lead';
  return (
    <>
      <PageHeader
        title="Designs"
        lead="A design is one analog front-end: its amplifier topology, resistor network, gains and tolerances, and the common-mode rejection it is predicted to reach."
      />
      <EmptyState title="No designs in Rejectra yet" icon={<BoardIcon />}>
        {canCreate ? (
          <p>
            Designs are created by designers and leads — that includes you. Each design you add will be listed here with
            its board name, revision and predicted rejection, ready for technicians to measure against.
          </p>
        ) : (
          <p>
            Designs are created by designers and leads. Once one exists it is listed here, and you can choose it when you
            record a bench session on that board.
          </p>
        )}
      </EmptyState>
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
