import { Suspense } from 'react';
import { createBrowserRouter, Outlet } from 'react-router-dom';
import { LoadingState } from '../components/states';
import { AppShell } from './app-shell';
import { RedirectIfSignedIn, RequireSession } from './require-session';
import {
  CompareRoute,
  DesignAnalysisRoute,
  DesignDetailRoute,
  DesignsRoute,
  ForgotPasswordPage,
  InstrumentsRoute,
  LinkPage,
  LotRoute,
  MailboxRoute,
  NotFoundRoute,
  OverviewRoute,
  PeopleRoute,
  RouteErrorPage,
  SessionDetailRoute,
  SessionsRoute,
  SettingsRoute,
  SignInPage,
  StartSessionRoute,
} from './route-pages';

function Root() {
  return (
    <Suspense
      fallback={
        <div className="mx-auto max-w-xl px-6 py-16">
          <LoadingState label="Opening Rejectra…" />
        </div>
      }
    >
      <Outlet />
    </Suspense>
  );
}

export const router = createBrowserRouter([
  {
    element: <Root />,
    errorElement: <RouteErrorPage />,
    children: [
      {
        path: '/sign-in',
        element: (
          <RedirectIfSignedIn>
            <title>Sign in · Rejectra</title>
            <SignInPage />
          </RedirectIfSignedIn>
        ),
      },
      {
        // Open to signed-in people too: it is how they change their password.
        path: '/forgot-password',
        element: (
          <>
            <title>Reset password · Rejectra</title>
            <ForgotPasswordPage />
          </>
        ),
      },
      {
        // Open whatever the session: an invitee may follow their link in a browser someone else used.
        path: '/link/:token',
        element: (
          <>
            <title>Set password · Rejectra</title>
            <LinkPage />
          </>
        ),
      },
      {
        element: <RequireSession />,
        children: [
          {
            element: <AppShell />,
            children: [
              { index: true, element: <OverviewRoute /> },
              { path: 'designs', element: <DesignsRoute /> },
              { path: 'designs/:designId', element: <DesignDetailRoute /> },
              { path: 'designs/:designId/revisions/:revisionId', element: <DesignAnalysisRoute /> },
              { path: 'designs/:designId/revisions/:revisionId/lot', element: <LotRoute /> },
              { path: 'sessions', element: <SessionsRoute /> },
              { path: 'sessions/new', element: <StartSessionRoute /> },
              { path: 'sessions/:sessionId', element: <SessionDetailRoute /> },
              { path: 'compare', element: <CompareRoute /> },
              { path: 'instruments', element: <InstrumentsRoute /> },
              { path: 'people', element: <PeopleRoute /> },
              { path: 'mailbox', element: <MailboxRoute /> },
              { path: 'mailbox/:messageId', element: <MailboxRoute /> },
              { path: 'settings', element: <SettingsRoute /> },
              { path: '*', element: <NotFoundRoute /> },
            ],
          },
        ],
      },
    ],
  },
]);
