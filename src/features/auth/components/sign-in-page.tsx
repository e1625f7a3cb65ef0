import { useState, type FormEvent } from 'react';
import { Link, useLocation, useNavigate } from 'react-router-dom';
import { signInRequestSchema } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/button';
import { TextField } from '../../../components/field';
import { FormError } from '../../../components/form-error';
import { returnPath } from '../../../lib/return-path';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { fieldErrorsFromIssues } from '../../../lib/zod-fields';
import { useSignIn } from '../api/sign-in';
import { AuthFrame } from './auth-frame';

export default function SignInPage() {
  const navigate = useNavigate();
  const location = useLocation();
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});

  const serverError = signIn.error;
  const { formMessage, fields: serverFields } = formErrorsFrom(serverError);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = signInRequestSchema.safeParse({ email, password });
    if (!parsed.success) {
      setFieldErrors(fieldErrorsFromIssues(parsed.error.issues));
      focusFirstInvalid(event.currentTarget);
      return;
    }
    setFieldErrors({});
    signIn.mutate(parsed.data, {
      onSuccess: () => navigate(returnPath(location.state), { replace: true }),
    });
  }

  return (
    <AuthFrame title="Sign in" lead="Use the e-mail address your lead invited.">
      <form noValidate onSubmit={handleSubmit} className="space-y-5" aria-label="Sign in">
        <FormError message={formMessage} />
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
        <TextField
          label="Password"
          type="password"
          name="password"
          autoComplete="current-password"
          value={password}
          onChange={(event) => setPassword(event.target.value)}
          error={fieldErrors.password ?? serverFields.password}
        />
        <div className="flex flex-wrap items-center justify-between gap-3 pt-1">
          <Button type="submit" busy={signIn.isPending} busyLabel="Signing in…" className="min-w-32">
            Sign in
          </Button>
          <Link
            to="/forgot-password"
            state={{ email }}
            className="font-medium text-trace-700 underline underline-offset-2 hover:text-trace-800"
          >
            Forgot password?
          </Link>
        </div>
      </form>
    </AuthFrame>
  );
}
