import type { ReactNode } from 'react';
import { Button, Spinner } from './button';

/** Shown while something loads; says what is loading. */
export function LoadingState({ label }: { label: string }) {
  return (
    <div role="status" className="flex items-center gap-3 px-1 py-8 text-ink-600">
      <Spinner className="text-trace-600" />
      <span>{label}</span>
    </div>
  );
}

/** Shown when a read failed: what failed, the server's reason, and a way to try again. */
export function ErrorState({
  title,
  message,
  onRetry,
}: {
  title: string;
  message: string;
  onRetry?: () => void;
}) {
  return (
    <div role="alert" className="rounded-lg border border-fault-600/40 bg-fault-50 p-5">
      <h2 className="flex items-center gap-2 text-lg font-semibold text-fault-700">
        <span aria-hidden="true">▲</span>
        {title}
      </h2>
      <p className="mt-1 text-ink-800">{message}</p>
      {onRetry && (
        <Button variant="secondary" className="mt-4" onClick={onRetry}>
          Try again
        </Button>
      )}
    </div>
  );
}

/** An area with nothing in it yet: what will appear here, and who puts it there. */
export function EmptyState({
  title,
  icon,
  children,
}: {
  title: string;
  icon?: ReactNode;
  children: ReactNode;
}) {
  return (
    <section className="rounded-lg border border-dashed border-ink-300 bg-white px-6 py-10">
      <div className="mx-auto max-w-2xl text-center">
        {icon && <div className="mx-auto mb-4 flex h-14 w-14 items-center justify-center text-ink-500">{icon}</div>}
        <h2 className="text-xl font-semibold text-ink-900">{title}</h2>
        <div className="mt-2 space-y-2 text-ink-700">{children}</div>
      </div>
    </section>
  );
}
