import type { ReactNode } from 'react';
import { Wordmark } from '../../../components/logo';

/** The frame around signed-out pages: product identity on one side, the task on the other. */
export function AuthFrame({ title, lead, children }: { title: string; lead?: ReactNode; children: ReactNode }) {
  return (
    <div className="grid min-h-screen lg:grid-cols-[minmax(22rem,2fr)_3fr]">
      <aside className="on-dark relative hidden flex-col justify-between overflow-hidden bg-ink-950 p-10 text-ink-200 lg:flex">
        <Wordmark tone="dark" />
        <div className="relative z-10 max-w-md">
          <p className="text-2xl leading-snug font-medium text-white">
            Measured and predicted common-mode rejection, side by side.
          </p>
          <p className="mt-3 text-ink-300">
            For the people who design, build and test precision analog front-ends — from the bench sweep to the
            design review.
          </p>
        </div>
        <TraceBackdrop />
      </aside>
      <main className="flex items-center justify-center px-5 py-10 sm:px-10">
        <div className="w-full max-w-md">
          <div className="mb-8 lg:hidden">
            <Wordmark />
          </div>
          <h1 className="text-[1.75rem] leading-tight font-semibold tracking-tight text-ink-900">{title}</h1>
          {lead && <div className="mt-2 text-ink-700">{lead}</div>}
          <div className="mt-6">{children}</div>
        </div>
      </main>
    </div>
  );
}

/** Faint converging traces behind the brand panel, echoing the logo mark. */
function TraceBackdrop() {
  return (
    <svg
      className="pointer-events-none absolute inset-x-0 top-[30%] h-56 w-full opacity-60"
      viewBox="0 0 400 160"
      preserveAspectRatio="none"
      aria-hidden="true"
    >
      <path
        d="M0 30 C 60 30, 70 70, 120 62 S 180 78, 220 80 L 400 80"
        fill="none"
        stroke="#8fb6dc"
        strokeWidth="1.5"
        strokeOpacity="0.55"
      />
      <path
        d="M0 130 C 60 130, 70 90, 120 98 S 180 82, 220 80 L 400 80"
        fill="none"
        stroke="#f2b544"
        strokeWidth="1.5"
        strokeOpacity="0.55"
      />
      <path d="M0 80 H400" stroke="#33495a" strokeWidth="1" strokeDasharray="2 6" />
    </svg>
  );
}
