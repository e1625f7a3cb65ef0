import { useEffect, useRef, type FormEvent, type ReactNode } from 'react';
import { Button } from './button';
import { FormError } from './form-error';

/**
 * A modal question before a destructive or lasting action, on the native <dialog> (focus is kept
 * inside, Escape cancels). The body may hold fields (a required reason); Enter confirms.
 */
export function ConfirmDialog({
  open,
  title,
  children,
  confirmLabel,
  busyLabel,
  tone = 'danger',
  busy = false,
  error,
  onConfirm,
  onCancel,
}: {
  open: boolean;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  busyLabel?: string;
  tone?: 'danger' | 'primary';
  busy?: boolean;
  error?: string | null;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const dialog = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const element = dialog.current;
    if (!element) return;
    if (open && !element.open) element.showModal();
    if (!open && element.open) element.close();
  }, [open]);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    onConfirm();
  }

  return (
    <dialog
      ref={dialog}
      aria-labelledby="confirm-dialog-title"
      onCancel={(event) => {
        event.preventDefault();
        onCancel();
      }}
      className="m-auto w-[min(36rem,calc(100vw-2rem))] rounded-lg border border-ink-300 bg-white p-0 text-ink-900 backdrop:bg-ink-950/50"
    >
      {open && (
        <form onSubmit={handleSubmit} className="space-y-4 p-6" noValidate>
          <h2 id="confirm-dialog-title" className="text-xl font-semibold">
            {title}
          </h2>
          <FormError message={error} />
          <div className="space-y-3 text-ink-800">{children}</div>
          <div className="flex justify-end gap-2 pt-2">
            <Button variant="secondary" onClick={onCancel}>
              Cancel
            </Button>
            <Button type="submit" variant={tone} busy={busy} busyLabel={busyLabel}>
              {confirmLabel}
            </Button>
          </div>
        </form>
      )}
    </dialog>
  );
}
