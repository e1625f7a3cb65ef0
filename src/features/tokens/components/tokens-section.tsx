import { useEffect, useRef, useState, type FormEvent } from 'react';
import { createTokenSchema, type AccessTokenSummary, type CreatedAccessToken } from '../../../../shared/schemas/tokens';
import { Button } from '../../../components/button';
import { ConfirmDialog } from '../../../components/confirm-dialog';
import { TextField } from '../../../components/field';
import { FormError } from '../../../components/form-error';
import { ErrorState, LoadingState } from '../../../components/states';
import { cellClasses, headCellClasses, headClasses, TableFrame } from '../../../components/table';
import { errorMessage } from '../../../lib/api-client';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { formatDateTime } from '../../../lib/format-date';
import { fieldErrorsFromIssues } from '../../../lib/zod-fields';
import { useCreateToken } from '../api/create-token';
import { useTokens } from '../api/get-tokens';
import { useRevokeToken } from '../api/revoke-token';

/** Personal access tokens: how bench programs (the `rejectra stream` command) sign in as you. */
export function TokensSection() {
  const tokens = useTokens();
  const create = useCreateToken();
  const revoke = useRevokeToken();
  const [name, setName] = useState('');
  const [nameError, setNameError] = useState<string | null>(null);
  const [created, setCreated] = useState<CreatedAccessToken | null>(null);
  const [copied, setCopied] = useState<'copied' | 'failed' | null>(null);
  const [revoking, setRevoking] = useState<AccessTokenSummary | null>(null);
  const { formMessage, fields } = formErrorsFrom(create.error);
  const section = useRef<HTMLElement>(null);

  // Links to Settings → tokens (from a session's "Stream live") land on this section.
  useEffect(() => {
    if (window.location.hash === '#tokens') section.current?.scrollIntoView();
  }, []);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const parsed = createTokenSchema.safeParse({ name });
    if (!parsed.success) {
      setNameError(fieldErrorsFromIssues(parsed.error.issues).name ?? 'Token name is required');
      focusFirstInvalid(form);
      return;
    }
    setNameError(null);
    setCopied(null);
    create.mutate(parsed.data, {
      onSuccess: ({ token }) => {
        setCreated(token);
        setName('');
      },
    });
  }

  async function copy(token: string) {
    try {
      await navigator.clipboard.writeText(token);
      setCopied('copied');
    } catch {
      setCopied('failed');
    }
  }

  return (
    <section ref={section} id="tokens" aria-labelledby="tokens-title" className="mt-6 max-w-5xl rounded-lg border border-ink-200 bg-white">
      <h2 id="tokens-title" className="border-b border-ink-200 px-5 py-3 text-lg font-semibold text-ink-900">
        Access tokens
      </h2>
      <div className="space-y-5 px-5 py-4">
        <p className="max-w-3xl text-ink-800">
          A bench program that streams measurements (<code className="rounded bg-ink-100 px-1">rejectra stream</code>) signs in with a personal access
          token instead of your password. It can do what you can do with bench sessions. Give each computer its own token, and revoke one the
          moment it is no longer needed or may have been seen by someone else.
        </p>
        <form noValidate onSubmit={handleSubmit} aria-label="Create an access token" className="flex flex-wrap items-start gap-3">
          <div className="w-80">
            <TextField label="Token name" value={name} onChange={(event) => setName(event.target.value)} error={nameError ?? fields.name} hint="Where it will be used, e.g. “Bench PC 3”." />
          </div>
          <Button type="submit" className="mt-8" busy={create.isPending} busyLabel="Creating…">
            Create token
          </Button>
        </form>
        <FormError message={formMessage} />
        {created && (
          <div role="status" className="space-y-2 rounded-md border-l-4 border-amber-500 bg-amber-50 px-4 py-3">
            <p className="font-semibold text-amber-900">
              Token “{created.name}” created. Copy it now: it won&apos;t be shown again.
            </p>
            <div className="flex flex-wrap items-center gap-2">
              <code data-testid="new-token" className="tabular rounded border border-ink-300 bg-white px-3 py-1.5 break-all select-all">
                {created.token}
              </code>
              <Button size="sm" variant="secondary" onClick={() => void copy(created.token)}>
                Copy
              </Button>
              {copied === 'copied' && <span className="text-good-700">✓ Copied</span>}
              {copied === 'failed' && <span className="text-fault-700">Copying was refused by the browser; select the token and copy it by hand.</span>}
            </div>
            <p className="text-[0.9375rem] text-ink-700">Rejectra stores only a hash of it. If you lose it, revoke it and create another.</p>
            <Button size="sm" variant="quiet" onClick={() => setCreated(null)}>
              I have copied it — hide
            </Button>
          </div>
        )}
        {tokens.isPending && <LoadingState label="Loading your tokens…" />}
        {tokens.isError && <ErrorState title="Your tokens could not be loaded" message={errorMessage(tokens.error)} onRetry={() => tokens.refetch()} />}
        {tokens.isSuccess && tokens.data.tokens.length === 0 && <p className="text-ink-700">You have no tokens yet. Tokens you create are listed here.</p>}
        {tokens.isSuccess && tokens.data.tokens.length > 0 && (
          <TableFrame caption="Your personal access tokens">
            <thead className={headClasses}>
              <tr>
                <th scope="col" className={headCellClasses}>Name</th>
                <th scope="col" className={headCellClasses}>Starts with</th>
                <th scope="col" className={headCellClasses}>Created</th>
                <th scope="col" className={headCellClasses}>Last used</th>
                <th scope="col" className={headCellClasses}>State</th>
                <th scope="col" className={headCellClasses}><span className="sr-only">Actions</span></th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {tokens.data.tokens.map((token) => (
                <tr key={token.id} className={token.revokedAt ? 'bg-ink-50 text-ink-600' : ''}>
                  <th scope="row" className={`${cellClasses} text-left font-medium`}>{token.name}</th>
                  <td className={`${cellClasses} tabular`}>{token.prefix}…</td>
                  <td className={`${cellClasses} tabular whitespace-nowrap`}>{formatDateTime(token.createdAt)}</td>
                  <td className={`${cellClasses} tabular whitespace-nowrap`}>{token.lastUsedAt ? formatDateTime(token.lastUsedAt) : 'never'}</td>
                  <td className={cellClasses}>
                    {token.revokedAt ? (
                      <>
                        Revoked <span className="tabular">{formatDateTime(token.revokedAt)}</span>
                      </>
                    ) : (
                      <span className="font-medium text-good-700">● Active</span>
                    )}
                  </td>
                  <td className={cellClasses}>
                    {!token.revokedAt && (
                      <Button size="sm" variant="secondary" aria-label={`Revoke ${token.name}`} onClick={() => { revoke.reset(); setRevoking(token); }}>
                        Revoke…
                      </Button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </TableFrame>
        )}
      </div>
      <ConfirmDialog
        open={revoking !== null}
        title={`Revoke “${revoking?.name ?? ''}”?`}
        confirmLabel="Revoke token"
        busyLabel="Revoking…"
        busy={revoke.isPending}
        error={revoke.isError ? errorMessage(revoke.error) : null}
        onCancel={() => setRevoking(null)}
        onConfirm={() => revoking && revoke.mutate(revoking.id, { onSuccess: () => setRevoking(null) })}
      >
        <p>Programs using this token are refused from now on, including a stream in progress when it next reconnects. This cannot be undone.</p>
      </ConfirmDialog>
    </section>
  );
}

export default TokensSection;
