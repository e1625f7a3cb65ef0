import type { ReactNode } from 'react';

export type BadgeTone = 'good' | 'warn' | 'fault' | 'quiet' | 'info';

const toneClasses: Record<BadgeTone, string> = {
  good: 'bg-good-50 text-good-700 border-good-600/40',
  warn: 'bg-amber-50 text-amber-900 border-amber-500/50',
  fault: 'bg-fault-50 text-fault-700 border-fault-600/40',
  quiet: 'bg-ink-100 text-ink-700 border-ink-300',
  info: 'bg-trace-50 text-trace-800 border-trace-300',
};

/** A status in words with a shape beside it, so colour is never the only cue. */
export function Badge({ tone, symbol, children, title }: { tone: BadgeTone; symbol: string; children: ReactNode; title?: string }) {
  return (
    <span
      title={title}
      className={`inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-[0.9375rem] font-medium whitespace-nowrap ${toneClasses[tone]}`}
    >
      <span aria-hidden="true">{symbol}</span>
      {children}
    </span>
  );
}

export type CalibrationState = 'in-calibration' | 'due-soon' | 'overdue' | 'unknown';

const calibration: Record<CalibrationState, { tone: BadgeTone; symbol: string; label: string }> = {
  'in-calibration': { tone: 'good', symbol: '●', label: 'In calibration' },
  'due-soon': { tone: 'warn', symbol: '◐', label: 'Due soon' },
  overdue: { tone: 'fault', symbol: '▲', label: 'Overdue' },
  unknown: { tone: 'quiet', symbol: '○', label: 'Unknown' },
};

/** An instrument's calibration state as the server judged it on its own date. */
export function CalibrationBadge({ state }: { state: string }) {
  const appearance = calibration[state as CalibrationState] ?? calibration.unknown;
  return (
    <Badge tone={appearance.tone} symbol={appearance.symbol}>
      {appearance.label}
    </Badge>
  );
}

/** A small marker for a bench session whose common-mode drive was hazardous live. */
export function HazardMarker({ compact = false }: { compact?: boolean }) {
  return (
    <span
      title="Hazardous live common-mode drive (above about 30 V rms or 60 V dc)"
      className="inline-flex items-center gap-1 rounded border border-amber-500 bg-amber-50 px-1.5 py-0.5 text-sm font-semibold text-amber-900"
    >
      <svg viewBox="0 0 20 20" className="h-4 w-4" aria-hidden="true">
        <path d="M10 2 19 18H1Z" fill="#e08e0b" stroke="#5c3a00" strokeWidth="1.2" strokeLinejoin="round" />
        <path d="M10 7.5v5" stroke="#16242e" strokeWidth="1.8" strokeLinecap="round" />
        <circle cx="10" cy="15.2" r="1.1" fill="#16242e" />
      </svg>
      {compact ? <span className="sr-only">Hazardous drive</span> : 'Hazardous drive'}
    </span>
  );
}
