import { useState } from 'react';
import { roleLabels, roles, type Role, type User } from '../../../../shared/schemas/users';
import { Button } from '../../../components/button';
import { errorMessage } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format-date';
import { useResendInvitation } from '../api/resend-invitation';
import { useUpdateUser } from '../api/update-user';
import { UserStatusBadge } from './user-status-badge';

/** One person in the people table, with their own role, activation and invitation actions. */
export function UserRow({ user, isYou }: { user: User; isYou: boolean }) {
  const update = useUpdateUser();
  const resend = useResendInvitation();
  const [confirming, setConfirming] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);

  const failure = update.error ?? resend.error;
  const deactivating = user.status !== 'deactivated';

  function changeRole(role: Role) {
    setNotice(null);
    resend.reset();
    update.mutate(
      { userId: user.id, changes: { role } },
      { onSuccess: ({ user: changed }) => setNotice(`Role changed to ${roleLabels[changed.role].toLowerCase()}.`) },
    );
  }

  function changeActive() {
    setNotice(null);
    resend.reset();
    update.mutate(
      { userId: user.id, changes: { active: !deactivating } },
      {
        onSuccess: ({ user: changed }) => {
          setConfirming(false);
          setNotice(changed.status === 'deactivated' ? 'Deactivated; their sessions have ended.' : 'Reactivated.');
        },
        onError: () => setConfirming(false),
      },
    );
  }

  function resendInvitation() {
    setNotice(null);
    update.reset();
    resend.mutate(user.id, { onSuccess: ({ message }) => setNotice(message) });
  }

  return (
    <tr className={`align-top ${user.status === 'deactivated' ? 'bg-ink-50 text-ink-600' : ''}`}>
      <th scope="row" className="px-4 py-3 text-left font-medium text-ink-900">
        {user.name}
        {isYou && <span className="ml-2 rounded bg-trace-100 px-1.5 py-0.5 text-sm font-medium text-trace-800">you</span>}
      </th>
      <td className="px-4 py-3 break-words">{user.email}</td>
      <td className="px-4 py-3">
        <label className="sr-only" htmlFor={`role-${user.id}`}>
          Role for {user.name}
        </label>
        <select
          id={`role-${user.id}`}
          value={user.role}
          disabled={update.isPending}
          onChange={(event) => changeRole(event.target.value as Role)}
          className="rounded-md border border-ink-300 bg-white px-2 py-1 text-ink-900"
        >
          {roles.map((option) => (
            <option key={option} value={option}>
              {roleLabels[option]}
            </option>
          ))}
        </select>
      </td>
      <td className="px-4 py-3">
        <UserStatusBadge status={user.status} />
      </td>
      <td className="tabular px-4 py-3 whitespace-nowrap">
        {user.lastSignInAt ? (
          <time dateTime={user.lastSignInAt}>{formatDateTime(user.lastSignInAt)}</time>
        ) : (
          <span className="text-ink-600">never</span>
        )}
      </td>
      <td className="px-4 py-3">
        <div className="flex flex-wrap items-center gap-2">
          {!confirming && (
            <>
              {user.status === 'invited' && (
                <Button
                  size="sm"
                  variant="secondary"
                  busy={resend.isPending}
                  busyLabel="Resending…"
                  onClick={resendInvitation}
                  aria-label={`Resend invitation to ${user.name}`}
                  title="E-mail a fresh invitation link; the earlier one stops working"
                >
                  Resend invitation
                </Button>
              )}
              {!isYou && (
                <Button
                  size="sm"
                  variant="secondary"
                  disabled={update.isPending}
                  onClick={() => {
                    setNotice(null);
                    setConfirming(true);
                  }}
                  aria-label={`${deactivating ? 'Deactivate' : 'Reactivate'} ${user.name}`}
                >
                  {deactivating ? 'Deactivate' : 'Reactivate'}
                </Button>
              )}
            </>
          )}
          {confirming && (
            <div role="group" aria-label={`Confirm ${deactivating ? 'deactivation' : 'reactivation'}`} className="space-y-2">
              <p className="text-[0.9375rem] text-ink-800">
                {deactivating
                  ? `Deactivate ${user.name}? They are signed out everywhere at once and cannot sign in until reactivated.`
                  : `Reactivate ${user.name}? They can sign in again with their existing password.`}
              </p>
              <div className="flex gap-2">
                <Button
                  size="sm"
                  variant={deactivating ? 'danger' : 'primary'}
                  busy={update.isPending}
                  onClick={changeActive}
                  autoFocus
                >
                  {deactivating ? 'Confirm deactivation' : 'Confirm reactivation'}
                </Button>
                <Button size="sm" variant="secondary" onClick={() => setConfirming(false)}>
                  Cancel
                </Button>
              </div>
            </div>
          )}
        </div>
        {failure && (
          <p role="alert" className="mt-2 text-[0.9375rem] font-medium text-fault-600">
            {errorMessage(failure)}
          </p>
        )}
        {notice && !failure && (
          <p role="status" className="mt-2 text-[0.9375rem] text-good-700">
            {notice}
          </p>
        )}
      </td>
    </tr>
  );
}
