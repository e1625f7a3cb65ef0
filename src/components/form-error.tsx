/** A message about the whole form (the server's answer), announced to screen readers. */
export function FormError({ message, id }: { message?: string | null; id?: string }) {
  if (!message) return null;
  return (
    <div
      id={id}
      role="alert"
      className="flex items-start gap-2 rounded-md border border-fault-600/40 bg-fault-50 px-3 py-2.5 text-fault-700"
    >
      <span aria-hidden="true" className="font-bold">
        ▲
      </span>
      <p className="font-medium">{message}</p>
    </div>
  );
}

/** A confirmation after something succeeded, announced politely. */
export function FormSuccess({ message }: { message?: string | null }) {
  if (!message) return null;
  return (
    <div role="status" className="flex items-start gap-2 rounded-md border border-good-600/40 bg-good-50 px-3 py-2.5 text-good-700">
      <span aria-hidden="true" className="font-bold">
        ✓
      </span>
      <p className="font-medium">{message}</p>
    </div>
  );
}
