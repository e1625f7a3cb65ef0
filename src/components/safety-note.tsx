import { useId } from 'react';

/**
 * The standing caution about common-mode testing. Shown wherever a person prepares or reviews a
 * measurement; it is deliberately not dismissible.
 */
export function SafetyNote({ className = '' }: { className?: string }) {
  const titleId = useId();
  return (
    <aside
      aria-labelledby={titleId}
      className={`rounded-lg border-l-4 border-amber-500 bg-amber-50 px-5 py-4 text-ink-900 ${className}`}
    >
      <h2 id={titleId} className="flex items-center gap-2 font-semibold text-amber-900">
        <svg viewBox="0 0 20 20" className="h-5 w-5" aria-hidden="true">
          <path d="M10 2 19 18H1Z" fill="#e08e0b" stroke="#5c3a00" strokeWidth="1.2" strokeLinejoin="round" />
          <path d="M10 7.5v5" stroke="#16242e" strokeWidth="1.8" strokeLinecap="round" />
          <circle cx="10" cy="15.2" r="1.1" fill="#16242e" />
        </svg>
        Safety on the bench
      </h2>
      <ul className="mt-2 list-disc space-y-1 pl-5 text-[0.9375rem] leading-relaxed">
        <li>
          Common-mode tests can put tens or hundreds of volts on a board — current-sense stages on supply rails,
          mains-referenced circuits.
        </li>
        <li>
          Above roughly <span className="tabular">30&nbsp;V rms</span> or <span className="tabular">60&nbsp;V dc</span>,
          treat the circuit as hazardous live: use differential or isolated probes, not a ground-referenced probe.
        </li>
        <li>Follow your local electrical codes and licensed practice; they take precedence over anything shown here.</li>
        <li>
          Front-ends that connect to patients fall under the IEC&nbsp;60601 family of medical-equipment standards.
          Rejectra records measurements; it does not certify compliance.
        </li>
      </ul>
    </aside>
  );
}
