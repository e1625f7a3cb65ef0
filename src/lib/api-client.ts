/**
 * The one way the client talks to the API: JSON in and out, cookies sent same-origin, and every
 * non-2xx answer turned into an ApiRequestError carrying the server's own message and field map.
 */

/** An API call that did not succeed: HTTP status, the server's message, and per-field messages. */
export class ApiRequestError extends Error {
  readonly status: number;
  readonly fields: Record<string, string>;

  constructor(status: number, message: string, fields: Record<string, string> = {}) {
    super(message);
    this.name = 'ApiRequestError';
    this.status = status;
    this.fields = fields;
  }
}

/** Status 0 stands for "no answer at all" (network down, server stopped). */
export const networkFailureStatus = 0;

const fallbackMessages: Record<number, string> = {
  400: 'The request was not accepted.',
  401: 'You are signed out. Sign in again.',
  403: 'Your role does not allow this.',
  404: 'Not found.',
  409: 'This conflicts with the current state.',
  410: 'This is no longer available.',
  429: 'Too many attempts. Wait a minute and try again.',
};

/**
 * Turn an error response into an ApiRequestError. `body` is the parsed JSON (or undefined when the
 * body was empty or not JSON); a body of the `{ error, fields }` shape wins over the fallbacks.
 */
export function parseApiError(status: number, body: unknown): ApiRequestError {
  let message: string | undefined;
  const fields: Record<string, string> = {};
  if (typeof body === 'object' && body !== null) {
    const record = body as Record<string, unknown>;
    if (typeof record.error === 'string' && record.error.trim() !== '') message = record.error;
    if (typeof record.fields === 'object' && record.fields !== null) {
      for (const [name, value] of Object.entries(record.fields as Record<string, unknown>)) {
        if (typeof value === 'string') fields[name] = value;
      }
    }
  }
  if (message === undefined) {
    message =
      fallbackMessages[status] ??
      (status >= 500
        ? `The server could not complete this (HTTP ${status}). Try again; if it persists, check the server log.`
        : `Unexpected answer from the server (HTTP ${status}).`);
  }
  return new ApiRequestError(status, message, fields);
}

export type ApiRequestOptions = {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  signal?: AbortSignal;
};

/**
 * Call `/api/...` and return the parsed JSON body (undefined for 204 or an empty body).
 * Throws ApiRequestError for any non-2xx status, and with status 0 when the server is unreachable.
 */
export async function apiRequest<Result>(path: string, options: ApiRequestOptions = {}): Promise<Result> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (options.body !== undefined) headers['Content-Type'] = 'application/json';
  let response: Response;
  try {
    response = await fetch(path, {
      method: options.method ?? 'GET',
      headers,
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      credentials: 'same-origin',
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiRequestError(
      networkFailureStatus,
      'Could not reach the Rejectra server. Check that it is running and the network is up.',
    );
  }
  const text = await response.text();
  let body: unknown = undefined;
  if (text !== '') {
    try {
      body = JSON.parse(text);
    } catch {
      body = undefined;
    }
  }
  if (!response.ok) throw parseApiError(response.status, body);
  return body as Result;
}

/** True when `error` is an API error with one of the given statuses. */
export function isApiStatus(error: unknown, ...statuses: number[]): error is ApiRequestError {
  return error instanceof ApiRequestError && statuses.includes(error.status);
}

/** A readable sentence for any thrown value, for error states. */
export function errorMessage(error: unknown): string {
  if (error instanceof Error && error.message !== '') return error.message;
  return 'Something went wrong.';
}
