import { useState, type FormEvent } from 'react';
import { Link, useLocation } from 'react-router-dom';
import { forgotPasswordRequestSchema } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/button';
import { TextField } from '../../../components/field';
import { FormError, FormSuccess } from '../../../components/form-error';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { fieldErrorsFromIssues } from '../../../lib/zod-fields';
import { useRequestPasswordReset } from '../api/forgot-password';
import { AuthFrame } from './auth-frame';

export default function ForgotPasswordPage() {
  const location = useLocation();
  const initialEmail = (location.state as { email?: unknown } | null)?.email;
  const [email, setEmail] = useState(typeof initialEmail === 'string' ? initialEmail : '');
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  const reset = useRequestPasswordReset();

  const serverError = reset.error;
  const { formMessage, fields: serverFields } = formErrorsFrom(serverError);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = forgotPasswordRequestSchema.safeParse({ email });
    if (!parsed.success) {
      setFieldErrors(fieldErrorsFromIssues(parsed.error.issues));
      focusFirstInvalid(event.currentTarget);
      return;
    }
    setFieldErrors({});
    reset.mutate(parsed.data);
  }

  return (
    <AuthFrame
      title="Reset your password"
      lead="Give the e-mail address of your Rejectra account. We will send it a link to choose a new password; the link works once and expires."
    >
      <form noValidate onSubmit={handleSubmit} className="space-y-5" aria-label="Reset your password">
        <FormError message={formMessage} />
        <FormSuccess message={reset.isSuccess ? reset.data.message : null} />
        <TextField
          label="E-mail"
          type="email"
          name="email"
          autoComplete="username"
          autoFocus
          value={email}
          onChange={(event) => setEmail(event.target.value)}
          error={fieldErrors.email ?? serverFields.email}
        />
        <div className="flex flex-wrap items-center justify-between gap-3 pt-1">
          <Button type="submit" busy={reset.isPending} busyLabel="Sending…">
            Send reset link
          </Button>
          <Link to="/sign-in" className="font-medium text-trace-700 underline underline-offset-2 hover:text-trace-800">
            Back to sign in
          </Link>
        </div>
      </form>
    </AuthFrame>
  );
}
