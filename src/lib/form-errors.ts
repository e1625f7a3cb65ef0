import { ApiRequestError, errorMessage } from './api-client';

export type FormErrors = { formMessage: string | null; fields: Record<string, string> };

/**
 * Decide where a failed submission's messages go. A 400 that names fields is shown beside those
 * fields only; anything else (wrong password, 409 conflict, 410 gone, server down) is shown at the
 * top of the form, and field messages that merely repeat it are not shown twice.
 */
export function formErrorsFrom(error: unknown): FormErrors {
  if (!error) return { formMessage: null, fields: {} };
  if (!(error instanceof ApiRequestError)) return { formMessage: errorMessage(error), fields: {} };
  const hasFields = Object.keys(error.fields).length > 0;
  if (error.status === 400 && hasFields) return { formMessage: null, fields: error.fields };
  const fields: Record<string, string> = {};
  for (const [name, message] of Object.entries(error.fields)) {
    if (message !== error.message) fields[name] = message;
  }
  return { formMessage: error.message, fields };
}
