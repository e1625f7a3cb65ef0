/**
 * The Rejectra mark: two input traces that converge and cancel into one flat output line —
 * what a good differential stage does to a common-mode signal.
 */
export function LogoMark({ size = 32, title }: { size?: number; title?: string }) {
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 32 32"
      role={title ? 'img' : undefined}
      aria-hidden={title ? undefined : true}
      aria-label={title}
      className="shrink-0"
    >
      <rect width="32" height="32" rx="7" fill="#16242e" />
      <path
        d="M4 8.5c3.2 0 4.4 3.3 6.4 5.2C12 15.2 13.6 16 16 16"
        fill="none"
        stroke="#8fb6dc"
        strokeWidth="2.4"
        strokeLinecap="round"
      />
      <path
        d="M4 23.5c3.2 0 4.4-3.3 6.4-5.2C12 16.8 13.6 16 16 16"
        fill="none"
        stroke="#f2b544"
        strokeWidth="2.4"
        strokeLinecap="round"
      />
      <path d="M16 16h12" stroke="#ffffff" strokeWidth="2.4" strokeLinecap="round" />
    </svg>
  );
}

/** Mark plus product name, for headers. `tone` picks the text colour for light or dark grounds. */
export function Wordmark({ tone = 'light' }: { tone?: 'light' | 'dark' }) {
  return (
    <span className="inline-flex items-center gap-2.5">
      <LogoMark size={30} />
      <span
        className={`text-xl font-semibold tracking-tight ${tone === 'dark' ? 'text-white' : 'text-ink-900'}`}
      >
        Rejectra
      </span>
    </span>
  );
}
