import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { roleDescriptions, roleLabels, type User } from '../../../../shared/schemas/users';
import { PageHeader } from '../../../components/page-header';
import { formatDateTime } from '../../../lib/format-date';

/** `children`: further sections the app adds below the account (access tokens). */
export default function SettingsPage({ user, children }: { user: User; children?: ReactNode }) {
  return (
    <>
      <PageHeader title="Settings" lead="Your Rejectra account and the tokens your bench programs use." />
      <section aria-labelledby="account-title" className="max-w-3xl rounded-lg border border-ink-200 bg-white">
        <h2 id="account-title" className="border-b border-ink-200 px-5 py-3 text-lg font-semibold text-ink-900">
          Account
        </h2>
        <dl className="divide-y divide-ink-100">
          <Row term="Name">{user.name}</Row>
          <Row term="E-mail">{user.email}</Row>
          <Row term="Role">
            <span className="font-medium">{roleLabels[user.role]}</span>
            <span className="block text-[0.9375rem] text-ink-700">{roleDescriptions[user.role]}</span>
          </Row>
          <Row term="Member since">
            <span className="tabular">{formatDateTime(user.createdAt)}</span>
          </Row>
          <Row term="Last sign-in">
            <span className="tabular">{user.lastSignInAt ? formatDateTime(user.lastSignInAt) : 'not recorded'}</span>
          </Row>
        </dl>
      </section>
      <section aria-labelledby="changes-title" className="mt-6 max-w-3xl text-ink-800">
        <h2 id="changes-title" className="text-lg font-semibold text-ink-900">
          Changing your details
        </h2>
        <ul className="mt-2 list-disc space-y-1.5 pl-5">
          <li>
            <strong className="font-semibold">Password:</strong>{' '}
            <Link to="/forgot-password" state={{ email: user.email }} className="text-trace-700 underline underline-offset-2">
              request a password reset link
            </Link>
            ; Rejectra e-mails you a single-use link to choose a new one.
          </li>
          <li>
            <strong className="font-semibold">Name, e-mail or role:</strong> ask a lead on your team.
          </li>
        </ul>
      </section>
      {children}
    </>
  );
}

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="grid gap-1 px-5 py-3 sm:grid-cols-[12rem_1fr]">
      <dt className="text-ink-600">{term}</dt>
      <dd className="text-ink-900">{children}</dd>
    </div>
  );
}
