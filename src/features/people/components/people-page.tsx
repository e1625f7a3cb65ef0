import { PageHeader } from '../../../components/page-header';
import { EmptyState, ErrorState, LoadingState } from '../../../components/states';
import { errorMessage } from '../../../lib/api-client';
import { useUsers } from '../api/get-users';
import { InviteForm } from './invite-form';
import { UserRow } from './user-row';

export default function PeoplePage({ currentUserId }: { currentUserId: string }) {
  const users = useUsers();

  return (
    <>
      <PageHeader
        title="People"
        lead="Who can use Rejectra and in what role. Changes take effect at once; a deactivated person is signed out everywhere."
      />
      <div className="space-y-6">
        <InviteForm />
        <section aria-labelledby="people-table-title" className="min-w-0">
          <h2 id="people-table-title" className="mb-3 text-lg font-semibold text-ink-900">
            Accounts
          </h2>
          {users.isPending && <LoadingState label="Loading people…" />}
          {users.isError && (
            <ErrorState title="People could not be loaded" message={errorMessage(users.error)} onRetry={() => users.refetch()} />
          )}
          {users.isSuccess && users.data.users.length === 0 && (
            <EmptyState title="No accounts yet">
              <p>Invite the first person with the form; they appear here once invited.</p>
            </EmptyState>
          )}
          {users.isSuccess && users.data.users.length > 0 && (
            <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
              <table className="w-full border-collapse text-left">
                <caption className="sr-only">People with a Rejectra account</caption>
                <thead className="border-b border-ink-200 bg-ink-50 text-[0.9375rem] text-ink-700">
                  <tr>
                    <th scope="col" className="px-4 py-2.5 font-semibold">Name</th>
                    <th scope="col" className="px-4 py-2.5 font-semibold">E-mail</th>
                    <th scope="col" className="px-4 py-2.5 font-semibold">Role</th>
                    <th scope="col" className="px-4 py-2.5 font-semibold">Status</th>
                    <th scope="col" className="px-4 py-2.5 font-semibold">Last sign-in</th>
                    <th scope="col" className="px-4 py-2.5 font-semibold">Actions</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink-100">
                  {users.data.users.map((user) => (
                    <UserRow key={user.id} user={user} isYou={user.id === currentUserId} />
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </section>
      </div>
    </>
  );
}
