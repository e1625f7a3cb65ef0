import { describe, expect, it } from 'vitest';
import { inviteRequestSchema } from '../../../shared/schemas/users';
import { fieldErrorsFromIssues } from '../../../src/lib/zod-fields';

describe('fieldErrorsFromIssues', () => {
  it('gives one message per field, the first issue winning', () => {
    expect(
      fieldErrorsFromIssues([
        { path: ['email'], message: 'first' },
        { path: ['email'], message: 'second' },
        { path: ['name'], message: 'Name is required' },
      ]),
    ).toEqual({ email: 'first', name: 'Name is required' });
  });

  it('files issues without a path under "form"', () => {
    expect(fieldErrorsFromIssues([{ path: [], message: 'Whole request is wrong' }])).toEqual({
      form: 'Whole request is wrong',
    });
  });

  it('maps the shared invite schema to the messages the server would give', () => {
    const parsed = inviteRequestSchema.safeParse({ name: '  ', email: 'not-an-address', role: 'technician' });
    expect(parsed.success).toBe(false);
    if (parsed.success) return;
    expect(fieldErrorsFromIssues(parsed.error.issues)).toEqual({
      name: 'Name is required',
      email: 'Not a valid e-mail address',
    });
  });
});
