import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

const controlClasses =
  'block w-full rounded-md border bg-white px-3 py-2 text-base text-ink-900 placeholder:text-ink-500 ' +
  'focus-visible:border-trace-600';

function describedBy(...ids: unknown[]): string | undefined {
  const present = ids.filter((id): id is string => typeof id === 'string' && id !== '');
  return present.length > 0 ? present.join(' ') : undefined;
}

type FieldFrameProps = {
  id: string;
  label: string;
  hint?: ReactNode;
  hintId: string;
  error?: string;
  errorId: string;
  children: ReactNode;
};

function FieldFrame({ id, label, hint, hintId, error, errorId, children }: FieldFrameProps) {
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block font-medium text-ink-900">
        {label}
      </label>
      {children}
      {hint && !error && (
        <p id={hintId} className="text-[0.9375rem] text-ink-600">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="flex items-start gap-1.5 text-[0.9375rem] font-medium text-fault-600">
          <span aria-hidden="true">▲</span>
          <span>{error}</span>
        </p>
      )}
    </div>
  );
}

export type TextFieldProps = Omit<InputHTMLAttributes<HTMLInputElement>, 'id'> & {
  label: string;
  hint?: ReactNode;
  error?: string;
};

/** A labelled input; its hint or error is linked with aria-describedby. */
export function TextField({ label, hint, error, className = '', ...inputProps }: TextFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <FieldFrame id={id} label={label} hint={hint} hintId={hintId} error={error} errorId={errorId}>
      <input
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hint && !error ? hintId : null, error ? errorId : null)}
        className={`${controlClasses} ${error ? 'border-fault-600' : 'border-ink-300'} ${className}`}
        {...inputProps}
      />
    </FieldFrame>
  );
}

export type SelectFieldProps = Omit<SelectHTMLAttributes<HTMLSelectElement>, 'id'> & {
  label: string;
  hint?: ReactNode;
  error?: string;
};

export function SelectField({ label, hint, error, className = '', children, ...selectProps }: SelectFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <FieldFrame id={id} label={label} hint={hint} hintId={hintId} error={error} errorId={errorId}>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hint && !error ? hintId : null, error ? errorId : null)}
        className={`${controlClasses} ${error ? 'border-fault-600' : 'border-ink-300'} ${className}`}
        {...selectProps}
      >
        {children}
      </select>
    </FieldFrame>
  );
}

export type TextAreaFieldProps = Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'id'> & {
  label: string;
  hint?: ReactNode;
  error?: string;
};

export function TextAreaField({ label, hint, error, className = '', ...areaProps }: TextAreaFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <FieldFrame id={id} label={label} hint={hint} hintId={hintId} error={error} errorId={errorId}>
      <textarea
        id={id}
        rows={3}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hint && !error ? hintId : null, error ? errorId : null)}
        className={`${controlClasses} ${error ? 'border-fault-600' : 'border-ink-300'} ${className}`}
        {...areaProps}
      />
    </FieldFrame>
  );
}
