import { Link } from 'react-router-dom';
import type { Role } from '../../../../shared/schemas/users';
import { SafetyNote } from '../../../components/safety-note';

export type OverviewLink = { label: string; path: string; summary: string };

const orientation: Record<Role, { title: string; paragraphs: string[] }> = {
  technician: {
    title: 'You record what the bench measures',
    paragraphs: [
      'As a technician you take the measurements: you open a bench session for a board, note the instruments and probes you used, and record each common-mode sweep or capture as it comes off the bench.',
      'Designers compare what you record against their predictions, so the board serial, the setup and anything unusual you saw matter as much as the numbers.',
    ],
  },
  designer: {
    title: 'You own the designs and what they should achieve',
    paragraphs: [
      'As a designer you keep each front-end design with its component values and tolerances, and the common-mode rejection it should reach.',
      'You review the bench sessions technicians record and compare measured rejection against your prediction to find where the two part ways.',
    ],
  },
  lead: {
    title: 'You run the team and keep the record straight',
    paragraphs: [
      'As a lead you can do everything designers and technicians do: designs, predictions, bench sessions and reviews.',
      'You also manage people — invitations, roles and deactivation — and decide what is archived.',
    ],
  },
};

export default function OverviewPage({
  name,
  role,
  links,
}: {
  name: string;
  role: Role;
  links: readonly OverviewLink[];
}) {
  const text = orientation[role];
  return (
    <div className="space-y-8">
      <header>
        <p className="text-[0.9375rem] font-semibold tracking-wider text-trace-700 uppercase">Overview</p>
        <h1 className="mt-1 text-[2rem] leading-tight font-semibold tracking-tight text-ink-900">
          Hello, {name}
        </h1>
      </header>
      <div className="grid items-start gap-6 xl:grid-cols-[3fr_2fr]">
        <section aria-labelledby="orientation-title" className="rounded-lg border border-ink-200 bg-white p-6">
          <h2 id="orientation-title" className="text-xl font-semibold text-ink-900">
            {text.title}
          </h2>
          {text.paragraphs.map((paragraph) => (
            <p key={paragraph} className="mt-3 max-w-3xl text-ink-800">
              {paragraph}
            </p>
          ))}
        </section>
        <SafetyNote />
      </div>
      <section aria-labelledby="areas-title">
        <h2 id="areas-title" className="text-lg font-semibold text-ink-900">
          Where things are
        </h2>
        <ul className="mt-3 grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
          {links.map((link) => (
            <li key={link.path}>
              <Link
                to={link.path}
                className="block h-full rounded-lg border border-ink-200 bg-white p-4 hover:border-trace-300 hover:bg-trace-50"
              >
                <span className="font-semibold text-trace-700">{link.label}</span>
                <span className="mt-1 block text-[0.9375rem] text-ink-700">{link.summary}</span>
              </Link>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
