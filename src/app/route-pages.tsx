import { lazy, useEffect, type ReactNode } from 'react';
import { Link, useParams, useRouteError } from 'react-router-dom';
import { NeedsRole } from '../components/needs-role';
import { PageHeader } from '../components/page-header';
import { ErrorState, LoadingState } from '../components/states';
import { useHealth } from '../features/system/api/get-health';
import { errorMessage } from '../lib/api-client';
import { areaById, roleMayOpen, visibleAreas, type AreaId } from './navigation';
import { roleName } from './role-name';
import { useSignedInUser } from './signed-in-user';

// Every page is its own download, fetched the first time it is opened.
const OverviewPage = lazy(() => import('../features/overview/components/overview-page'));
const DesignsPage = lazy(() => import('../features/designs/components/designs-page'));
const DesignDetailPage = lazy(() => import('../features/designs/components/design-detail-page'));
const DesignAnalysisPage = lazy(() => import('../features/design-analysis/components/design-analysis-page'));
const LotPage = lazy(() => import('../features/lots/components/lot-page'));
const SessionsPage = lazy(() => import('../features/bench-sessions/components/sessions-page'));
const StartSessionPage = lazy(() => import('../features/bench-sessions/components/start-session-page'));
const SessionDetailPage = lazy(() => import('../features/bench-sessions/components/session-detail-page'));
const loadSessionAnalysisView = () => import('../features/session-analysis/components/session-analysis-view');
const SessionAnalysisView = lazy(loadSessionAnalysisView);
const ComparePage = lazy(() => import('../features/compare/components/compare-page'));
const InstrumentsPage = lazy(() => import('../features/instruments/components/instruments-page'));
const PeoplePage = lazy(() => import('../features/people/components/people-page'));
const MailboxPage = lazy(() => import('../features/mailbox/components/mailbox-page'));
const SettingsPage = lazy(() => import('../features/settings/components/settings-page'));
const TokensSection = lazy(() => import('../features/tokens/components/tokens-section'));
export const SignInPage = lazy(() => import('../features/auth/components/sign-in-page'));
export const ForgotPasswordPage = lazy(() => import('../features/auth/components/forgot-password-page'));
export const LinkPage = lazy(() => import('../features/auth/components/link-page'));

function Title({ area }: { area: string }) {
  return <title>{`${area} · Rejectra`}</title>;
}

/** Areas closed to the person's role show why instead of the page (the API refuses them too). */
function RoleGate({ id, children }: { id: AreaId; children: ReactNode }) {
  const user = useSignedInUser();
  const area = areaById(id);
  if (!roleMayOpen(area, user.role)) {
    const needed = area.roles?.map(roleName).join(' or ') ?? '';
    return (
      <>
        <Title area={area.label} />
        <NeedsRole area={area.label} role={needed.toLowerCase()} yourRole={roleName(user.role)} />
      </>
    );
  }
  return (
    <>
      <Title area={area.label} />
      {children}
    </>
  );
}

export function OverviewRoute() {
  const user = useSignedInUser();
  const health = useHealth();
  const links = visibleAreas(user.role, health.data?.mail).filter((area) => area.id !== 'overview');
  return (
    <RoleGate id="overview">
      <OverviewPage name={user.name} role={user.role} links={links} />
    </RoleGate>
  );
}

export function DesignsRoute() {
  const user = useSignedInUser();
  return (
    <RoleGate id="designs">
      <DesignsPage role={user.role} />
    </RoleGate>
  );
}

export function DesignDetailRoute() {
  const user = useSignedInUser();
  const { designId = '' } = useParams();
  return (
    <RoleGate id="designs">
      <DesignDetailPage key={designId} designId={designId} role={user.role} />
    </RoleGate>
  );
}

export function DesignAnalysisRoute() {
  const user = useSignedInUser();
  const { designId = '', revisionId = '' } = useParams();
  return (
    <RoleGate id="designs">
      <DesignAnalysisPage key={`${designId}/${revisionId}`} designId={designId} revisionId={revisionId} role={user.role} />
    </RoleGate>
  );
}

export function LotRoute() {
  const { designId = '', revisionId = '' } = useParams();
  return (
    <RoleGate id="designs">
      <LotPage key={`${designId}/${revisionId}`} designId={designId} revisionId={revisionId} />
    </RoleGate>
  );
}

export function SessionsRoute() {
  const user = useSignedInUser();
  return (
    <RoleGate id="sessions">
      <SessionsPage role={user.role} />
    </RoleGate>
  );
}

export function StartSessionRoute() {
  return (
    <RoleGate id="sessions">
      <StartSessionPage />
    </RoleGate>
  );
}

export function SessionDetailRoute() {
  const user = useSignedInUser();
  const { sessionId = '' } = useParams();
  // The analysis view downloads alongside the page rather than once the analysis has arrived.
  useEffect(() => {
    void loadSessionAnalysisView();
  }, []);
  return (
    <RoleGate id="sessions">
      <SessionDetailPage key={sessionId} sessionId={sessionId} user={user} analysisView={SessionAnalysisView} />
    </RoleGate>
  );
}

export function CompareRoute() {
  const user = useSignedInUser();
  return (
    <RoleGate id="compare">
      <ComparePage role={user.role} />
    </RoleGate>
  );
}

export function InstrumentsRoute() {
  const user = useSignedInUser();
  return (
    <RoleGate id="instruments">
      <InstrumentsPage role={user.role} />
    </RoleGate>
  );
}

export function PeopleRoute() {
  const user = useSignedInUser();
  return (
    <RoleGate id="people">
      <PeoplePage currentUserId={user.id} />
    </RoleGate>
  );
}

export function MailboxRoute() {
  return (
    <RoleGate id="mailbox">
      <MailboxWhenStandIn />
    </RoleGate>
  );
}

/** The mailbox only exists while the server keeps mail locally instead of sending it. */
function MailboxWhenStandIn() {
  const health = useHealth();
  if (health.isPending) return <LoadingState label="Checking how this server sends mail…" />;
  if (health.isError) {
    return (
      <ErrorState
        title="Could not ask the server how it sends mail"
        message={errorMessage(health.error)}
        onRetry={() => health.refetch()}
      />
    );
  }
  if (health.data.mail !== 'local-stand-in') {
    return (
      <>
        <PageHeader title="Mailbox" />
        <p className="max-w-2xl text-ink-800">
          This server sends e-mail through a real SMTP server, so messages go to people&apos;s own inboxes and no copy is
          kept here. The mailbox is only available when Rejectra runs with its local mail stand-in (development and
          tests).
        </p>
      </>
    );
  }
  return <MailboxPage />;
}

export function SettingsRoute() {
  const user = useSignedInUser();
  return (
    <RoleGate id="settings">
      <SettingsPage user={user}>
        <TokensSection />
      </SettingsPage>
    </RoleGate>
  );
}

export function NotFoundRoute() {
  return (
    <>
      <Title area="Not found" />
      <PageHeader title="No page at this address" lead="The address may be mistyped, or the page was moved." />
      <Link to="/" className="font-medium text-trace-700 underline underline-offset-2">
        Go to the overview
      </Link>
    </>
  );
}

/** Last resort when a page itself fails (a bug, or a page download that did not arrive). */
export function RouteErrorPage() {
  const error = useRouteError();
  return (
    <div className="mx-auto max-w-xl px-6 py-16">
      <title>Problem · Rejectra</title>
      <ErrorState
        title="This page failed to open"
        message={`${errorMessage(error)} Reloading usually helps; if it keeps happening, tell whoever runs this Rejectra server.`}
        onRetry={() => window.location.reload()}
      />
    </div>
  );
}
