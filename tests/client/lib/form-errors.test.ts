import { describe, expect, it } from 'vitest';
import { ApiRequestError } from '../../../src/lib/api-client';
import { formErrorsFrom } from '../../../src/lib/form-errors';

describe('formErrorsFrom', () => {
  it('has nothing to show without an error', () => {
    expect(formErrorsFrom(null)).toEqual({ formMessage: null, fields: {} });
  });

  it('puts a 400 with named fields beside the fields only', () => {
    const error = new ApiRequestError(400, 'Check the marked fields', { email: 'Not a valid e-mail address' });
    expect(formErrorsFrom(error)).toEqual({ formMessage: null, fields: { email: 'Not a valid e-mail address' } });
  });

  it('shows a 400 without fields at the form', () => {
    expect(formErrorsFrom(new ApiRequestError(400, 'Malformed JSON'))).toEqual({ formMessage: 'Malformed JSON', fields: {} });
  });

  it('shows a 409 at the form and does not repeat the same words beside the field', () => {
    const error = new ApiRequestError(409, 'x@rejectra.test already has an account', {
      email: 'x@rejectra.test already has an account',
    });
    expect(formErrorsFrom(error)).toEqual({ formMessage: 'x@rejectra.test already has an account', fields: {} });
  });

  it('keeps a field message that adds something to a form-level message', () => {
    const error = new ApiRequestError(409, 'Cannot invite', { email: 'Address already in use' });
    expect(formErrorsFrom(error)).toEqual({ formMessage: 'Cannot invite', fields: { email: 'Address already in use' } });
  });

  it('shows the message of a thrown non-API error at the form', () => {
    expect(formErrorsFrom(new Error('boom'))).toEqual({ formMessage: 'boom', fields: {} });
  });
});
