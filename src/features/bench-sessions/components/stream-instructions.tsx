import { Link } from 'react-router-dom';

/** How a bench program streams points into this session live. */
export function StreamInstructions({ sessionId }: { sessionId: string }) {
  const origin = typeof window === 'undefined' ? 'http://127.0.0.1:5480' : window.location.origin;
  const command = `npm run --silent cli -- stream --url ${origin} --token rjt_… --session ${sessionId} --mode common-mode --file sweep.csv`;
  return (
    <div className="space-y-3 text-ink-800">
      <p>
        A bench program can send points while the instrument produces them; they appear on this page within a fraction of a second, and the
        analysis refits as they arrive. The program signs in with a <strong className="font-semibold">personal access token</strong>, not your
        password.
      </p>
      <ol className="list-decimal space-y-2 pl-5">
        <li>
          Create a token in{' '}
          <Link to="/settings#tokens" className="font-medium text-trace-700 underline underline-offset-2">
            Settings → Access tokens
          </Link>{' '}
          and copy it (it is shown once).
        </li>
        <li>
          On the bench computer, in a checkout of Rejectra, run the bench client with this session&apos;s id:
          <pre className="mt-2 overflow-x-auto rounded-md bg-ink-950 px-4 py-3 text-[0.875rem] leading-relaxed text-ink-100">
            <code>{command}</code>
          </pre>
        </li>
        <li>
          Use <code className="rounded bg-ink-100 px-1">--mode differential</code> or <code className="rounded bg-ink-100 px-1">--mode common-mode</code>;
          replace <code className="rounded bg-ink-100 px-1">--file sweep.csv</code> with <code className="rounded bg-ink-100 px-1">--simulate</code> to
          try it with the simulated instrument. A dropped connection is resumed without losing or repeating points.
        </li>
      </ol>
      <p className="text-[0.9375rem] text-ink-700">
        Session id: <code className="tabular rounded bg-ink-100 px-1 select-all">{sessionId}</code> · The protocol is described in docs/STREAMING.md.
      </p>
    </div>
  );
}
