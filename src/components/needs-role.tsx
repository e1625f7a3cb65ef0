import { Link } from 'react-router-dom';

/** What a person sees when they open an area their role does not include. */
export function NeedsRole({ area, role, yourRole }: { area: string; role: string; yourRole: string }) {
  return (
    <section
      aria-labelledby="needs-role-title"
      className="max-w-2xl rounded-lg border border-ink-200 bg-white p-6"
    >
      <p className="text-sm font-semibold tracking-wider text-ink-600 uppercase">Access</p>
      <h1 id="needs-role-title" className="mt-1 text-2xl font-semibold text-ink-900">
        {area} needs the {role} role
      </h1>
      <p className="mt-2 text-ink-700">
        You are signed in as a {yourRole.toLowerCase()}. {area} is only open to a {role.toLowerCase()}. If you need it,
        ask a lead on your team to change your role.
      </p>
      <Link
        to="/"
        className="mt-4 inline-block font-medium text-trace-700 underline underline-offset-2 hover:text-trace-800"
      >
        Back to the overview
      </Link>
    </section>
  );
}
