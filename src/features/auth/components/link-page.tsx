import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import type { LinkInfoResponse } from '../../../../shared/schemas/auth';
import { minimumPasswordLength } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/button';
import { TextField } from '../../../components/field';
import { FormError } from '../../../components/form-error';
import { ErrorState, LoadingState } from '../../../components/states';
import { ApiRequestError, errorMessage, isApiStatus } from '../../../lib/api-client';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { formatDateTime } from '../../../lib/format-date';
import { useAcceptLink } from '../api/accept-link';
import { useLinkInfo } from '../api/get-link';
import { AuthFrame } from './auth-frame';
import { checkNewPassword, type NewPasswordErrors } from './check-new-password';

export default function LinkPage() {
  const { token = '' } = useParams();
  const link = useLinkInfo(token);

  if (link.isPending) {
    return (
      <AuthFrame title="Checking your link">
        <LoadingState label="Checking the link from your e-mail…" />
      </AuthFrame>
    );
  }
  if (link.isError) {
    if (isApiStatus(link.error, 404, 410)) return <UnusableLink error={link.error} />;
    return (
      <AuthFrame title="Checking your link">
        <ErrorState title="The link could not be checked" message={errorMessage(link.error)} onRetry={() => link.refetch()} />
      </AuthFrame>
    );
  }
  return <ChoosePassword token={token} link={link.data} />;
}

function ChoosePassword({ token, link }: { token: string; link: LinkInfoResponse }) {
  const navigate = useNavigate();
  const accept = useAcceptLink();
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const [errors, setErrors] = useState<NewPasswordErrors>({});

  const serverError = accept.error;
  const { formMessage, fields: serverFields } = formErrorsFrom(serverError);
  const linkGone = isApiStatus(serverError, 404, 410);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const found = checkNewPassword(password, repeat);
    setErrors(found);
    if (found.password || found.repeat) {
      focusFirstInvalid(event.currentTarget);
      return;
    }
    accept.mutate({ token, password }, { onSuccess: () => navigate('/', { replace: true }) });
  }

  const isInvite = link.purpose === 'invite';
  return (
    <AuthFrame
      title={isInvite ? `Welcome to Rejectra, ${link.name}` : 'Choose a new password'}
      lead={
        <p>
          {isInvite ? 'You were invited as ' : 'Resetting the password for '}
          <strong className="font-semibold text-ink-900">{link.email}</strong>.{' '}
          {isInvite ? 'Choose a password to finish setting up your account.' : 'Your old password stops working.'}{' '}
          This link expires <span className="tabular">{formatDateTime(link.expiresAt)}</span>.
        </p>
      }
    >
      <form noValidate onSubmit={handleSubmit} className="space-y-5" aria-label="Set password">
        <FormError message={formMessage} />
        {linkGone && (
          <p className="text-ink-700">
            <Link to="/forgot-password" className="font-medium text-trace-700 underline underline-offset-2">
              Request a new link
            </Link>{' '}
            or ask a lead to resend your invitation.
          </p>
        )}
        {/* Lets password managers store the new password under the right account. */}
        <input type="email" name="username" autoComplete="username" value={link.email} readOnly hidden />
        <TextField
          label="New password"
          type="password"
          name="new-password"
          autoComplete="new-password"
          autoFocus
          value={password}
          onChange={(event) => setPassword(event.target.value)}
          hint={`At least ${minimumPasswordLength} characters. A short sentence is easier to remember than symbols.`}
          error={errors.password ?? serverFields.password}
        />
        <TextField
          label="Repeat password"
          type="password"
          name="repeat-password"
          autoComplete="new-password"
          value={repeat}
          onChange={(event) => setRepeat(event.target.value)}
          error={errors.repeat}
        />
        <Button type="submit" busy={accept.isPending} busyLabel="Setting password…">
          Set password
        </Button>
      </form>
    </AuthFrame>
  );
}

function UnusableLink({ error }: { error: ApiRequestError }) {
  const expiredOrUsed = error.status === 410;
  return (
    <AuthFrame title={expiredOrUsed ? 'This link has expired or was already used' : 'This link is not valid'}>
      <div role="alert" className="rounded-lg border border-fault-600/40 bg-fault-50 px-4 py-3 text-fault-700">
        <p className="font-medium">{error.message}</p>
      </div>
      <div className="mt-6 space-y-3 text-ink-800">
        <p className="font-semibold">What to do now</p>
        <ul className="list-disc space-y-2 pl-5">
          <li>
            <strong className="font-semibold">Resetting a password?</strong> Request a fresh link; each link works once
            and only for a limited time.
          </li>
          <li>
            <strong className="font-semibold">Joining from an invitation?</strong> Ask the lead who invited you to resend
            the invitation from the People page.
          </li>
          {!expiredOrUsed && (
            <li>Copied the link by hand? Check that the whole address from the e-mail was pasted.</li>
          )}
        </ul>
        <div className="flex flex-wrap gap-3 pt-3">
          <Link
            to="/forgot-password"
            className="rounded-md border border-trace-700 bg-trace-600 px-4 py-2 font-medium text-white hover:bg-trace-700"
          >
            Request a new reset link
          </Link>
          <Link
            to="/sign-in"
            className="rounded-md border border-ink-300 bg-white px-4 py-2 font-medium text-ink-900 hover:bg-ink-50"
          >
            Go to sign in
          </Link>
        </div>
      </div>
    </AuthFrame>
  );
}
