import type { LiveState } from '../hooks/use-live-session';

/** Whether the page is receiving the session live, in words and a shape. */
export function LiveIndicator({ state }: { state: LiveState }) {
  const appearance = {
    connecting: { symbol: '◌', text: 'Connecting…', classes: 'border-ink-300 bg-ink-50 text-ink-700' },
    live: { symbol: '●', text: 'Live', classes: 'border-good-600/40 bg-good-50 text-good-700' },
    reconnecting: { symbol: '◌', text: 'Reconnecting…', classes: 'border-amber-500/50 bg-amber-50 text-amber-900' },
    stopped: { symbol: '○', text: 'Not live', classes: 'border-fault-600/40 bg-fault-50 text-fault-700' },
  }[state.status];
  const title =
    state.status === 'live'
      ? 'New points and refits appear without reloading'
      : state.status === 'reconnecting'
        ? `The live connection dropped; trying again in ${state.retryInSeconds} s`
        : state.status === 'stopped'
          ? state.message
          : undefined;
  return (
    <span role="status" title={title} data-live-status={state.status} className={`inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-[0.9375rem] font-medium ${appearance.classes}`}>
      <span aria-hidden="true" className={state.status === 'live' ? 'animate-pulse' : ''}>
        {appearance.symbol}
      </span>
      {appearance.text}
      {state.status === 'stopped' && <span className="sr-only">: {state.message}</span>}
    </span>
  );
}
