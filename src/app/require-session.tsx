import type { ReactNode } from 'react';
import { Navigate, Outlet, useLocation } from 'react-router-dom';
import { Wordmark } from '../components/logo';
import { ErrorState, LoadingState } from '../components/states';
import { useSession } from '../features/auth/api/get-session';
import { errorMessage } from '../lib/api-client';
import { returnPath } from '../lib/return-path';
import { SignedInUserContext } from './signed-in-user';

function FullPage({ children }: { children: ReactNode }) {
  return (
    <div className="mx-auto max-w-xl px-6 py-16">
      <Wordmark />
      <div className="mt-8">{children}</div>
    </div>
  );
}

/** Everything below needs a signed-in person; others are sent to sign in and brought back after. */
export function RequireSession() {
  const session = useSession();
  const location = useLocation();

  if (session.isPending) {
    return (
      <FullPage>
        <LoadingState label="Checking your session…" />
      </FullPage>
    );
  }
  if (session.isError) {
    return (
      <FullPage>
        <ErrorState
          title="Rejectra could not check your session"
          message={errorMessage(session.error)}
          onRetry={() => session.refetch()}
        />
      </FullPage>
    );
  }
  if (!session.data) {
    return <Navigate to="/sign-in" replace state={{ from: `${location.pathname}${location.search}` }} />;
  }
  return (
    <SignedInUserContext.Provider value={session.data}>
      <Outlet />
    </SignedInUserContext.Provider>
  );
}

/** The sign-in page is pointless when already signed in: go to the app instead. */
export function RedirectIfSignedIn({ children }: { children: ReactNode }) {
  const session = useSession();
  const location = useLocation();
  if (session.isPending) {
    return (
      <FullPage>
        <LoadingState label="Checking your session…" />
      </FullPage>
    );
  }
  if (session.data) return <Navigate to={returnPath(location.state)} replace />;
  return <>{children}</>;
}
