import { useState, type FormEvent } from 'react';
import {
  inviteRequestSchema,
  roleDescriptions,
  roleLabels,
  roles,
  type Role,
} from '../../../../shared/schemas/users';
import { Button } from '../../../components/button';
import { SelectField, TextField } from '../../../components/field';
import { FormError, FormSuccess } from '../../../components/form-error';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { fieldErrorsFromIssues } from '../../../lib/zod-fields';
import { useInviteUser } from '../api/invite-user';

export function InviteForm() {
  const invite = useInviteUser();
  const [name, setName] = useState('');
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<Role>('technician');
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  const [sentTo, setSentTo] = useState<string | null>(null);

  const serverError = invite.error;
  const { formMessage, fields: serverFields } = formErrorsFrom(serverError);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setSentTo(null);
    const parsed = inviteRequestSchema.safeParse({ name, email, role });
    if (!parsed.success) {
      setFieldErrors(fieldErrorsFromIssues(parsed.error.issues));
      focusFirstInvalid(event.currentTarget);
      return;
    }
    setFieldErrors({});
    invite.mutate(parsed.data, {
      onSuccess: ({ user }) => {
        setSentTo(`Invitation sent to ${user.name} <${user.email}> as ${roleLabels[user.role].toLowerCase()}.`);
        setName('');
        setEmail('');
        setRole('technician');
      },
    });
  }

  return (
    <section aria-labelledby="invite-title" className="rounded-lg border border-ink-200 bg-white p-5">
      <h2 id="invite-title" className="text-lg font-semibold text-ink-900">
        Invite a person
      </h2>
      <p className="mt-1 text-[0.9375rem] text-ink-700">
        They receive an e-mail with a link to choose their password. The link works once and expires.
      </p>
      <form noValidate onSubmit={handleSubmit} className="mt-4 space-y-4" aria-label="Invite a person">
        <FormError message={formMessage} />
        <FormSuccess message={sentTo} />
        <div className="grid items-start gap-4 lg:grid-cols-[1fr_1fr_minmax(14rem,0.8fr)]">
          <TextField
            label="Name"
            name="name"
            autoComplete="off"
            value={name}
            onChange={(event) => setName(event.target.value)}
            error={fieldErrors.name ?? serverFields.name}
          />
          <TextField
            label="E-mail"
            type="email"
            name="email"
            autoComplete="off"
            value={email}
            onChange={(event) => setEmail(event.target.value)}
            error={fieldErrors.email ?? serverFields.email}
          />
          <SelectField
            label="Role"
            name="role"
            value={role}
            onChange={(event) => setRole(event.target.value as Role)}
            hint={roleDescriptions[role]}
            error={fieldErrors.role ?? serverFields.role}
          >
            {roles.map((option) => (
              <option key={option} value={option}>
                {roleLabels[option]}
              </option>
            ))}
          </SelectField>
        </div>
        <Button type="submit" busy={invite.isPending} busyLabel="Sending invitation…">
          Send invitation
        </Button>
      </form>
      <details className="mt-5 text-[0.9375rem] text-ink-700">
        <summary className="cursor-pointer font-medium text-ink-900">What each role can do</summary>
        <dl className="mt-2 space-y-1.5">
          {roles.map((option) => (
            <div key={option}>
              <dt className="inline font-semibold text-ink-900">{roleLabels[option]}: </dt>
              <dd className="inline">{roleDescriptions[option]}</dd>
            </div>
          ))}
        </dl>
      </details>
    </section>
  );
}
