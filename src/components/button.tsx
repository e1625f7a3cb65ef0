import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'quiet';

const variantClasses: Record<Variant, string> = {
  primary: 'bg-trace-600 text-white hover:bg-trace-700 active:bg-trace-800 border border-trace-700',
  secondary: 'bg-white text-ink-900 border border-ink-300 hover:bg-ink-50 hover:border-ink-400',
  danger: 'bg-fault-600 text-white border border-fault-700 hover:bg-fault-700',
  quiet: 'bg-transparent text-trace-700 border border-transparent hover:bg-trace-50 underline-offset-2',
};

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: Variant;
  /** While true the button is disabled and says what it is doing. */
  busy?: boolean;
  busyLabel?: string;
  size?: 'md' | 'sm';
};

export function Button({
  variant = 'primary',
  busy = false,
  busyLabel,
  size = 'md',
  className = '',
  disabled,
  children,
  type = 'button',
  ...rest
}: ButtonProps) {
  const sizing = size === 'md' ? 'px-4 py-2 text-base' : 'px-3 py-1 text-[0.9375rem]';
  return (
    <button
      type={type}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={`inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-60 ${sizing} ${variantClasses[variant]} ${className}`}
      {...rest}
    >
      {busy && <Spinner />}
      {busy && busyLabel ? busyLabel : children}
    </button>
  );
}

export function Spinner({ className = '' }: { className?: string }) {
  return (
    <svg viewBox="0 0 16 16" className={`h-4 w-4 animate-spin ${className}`} aria-hidden="true">
      <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeOpacity="0.3" strokeWidth="2" />
      <path d="M14 8a6 6 0 0 0-6-6" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
    </svg>
  );
}
