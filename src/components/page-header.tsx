import type { ReactNode } from 'react';

export function PageHeader({ title, lead, actions }: { title: string; lead?: ReactNode; actions?: ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-ink-200 pb-4">
      <div>
        <h1 className="text-[1.75rem] leading-tight font-semibold tracking-tight text-ink-900">{title}</h1>
        {lead && <p className="mt-1 max-w-3xl text-ink-700">{lead}</p>}
      </div>
      {actions && <div className="flex items-center gap-2">{actions}</div>}
    </header>
  );
}
