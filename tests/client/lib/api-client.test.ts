import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiRequestError, apiRequest, isApiStatus, networkFailureStatus, parseApiError } from '../../../src/lib/api-client';

describe('parseApiError', () => {
  it('keeps the server message and every string field message from an { error, fields } body', () => {
    const error = parseApiError(400, { error: 'Check the marked fields', fields: { email: 'Not a valid e-mail address' } });
    expect(error).toBeInstanceOf(ApiRequestError);
    expect(error.status).toBe(400);
    expect(error.message).toBe('Check the marked fields');
    expect(error.fields).toEqual({ email: 'Not a valid e-mail address' });
  });

  it('ignores field entries that are not strings', () => {
    const error = parseApiError(400, { error: 'Bad', fields: { email: 42, name: 'Name is required' } });
    expect(error.fields).toEqual({ name: 'Name is required' });
  });

  it('falls back to a status-specific sentence when the body has no usable message', () => {
    expect(parseApiError(401, undefined).message).toBe('You are signed out. Sign in again.');
    expect(parseApiError(403, { error: '' }).message).toBe('Your role does not allow this.');
    expect(parseApiError(410, 'not an object').message).toBe('This is no longer available.');
  });

  it('names the status for server failures without a body', () => {
    expect(parseApiError(502, undefined).message).toContain('HTTP 502');
  });

  it('names the status for unexpected client statuses without a body', () => {
    expect(parseApiError(418, null).message).toBe('Unexpected answer from the server (HTTP 418).');
  });
});

describe('apiRequest', () => {
  afterEach(() => {
    vi.unstubAllGlobals();
  });

  it('sends JSON same-origin and returns the parsed body', async () => {
    const fetchMock = vi.fn(async () => new Response(JSON.stringify({ user: { id: 'u1' } }), { status: 200 }));
    vi.stubGlobal('fetch', fetchMock);
    const result = await apiRequest<{ user: { id: string } }>('/api/auth/sign-in', {
      method: 'POST',
      body: { email: 'a@b.test', password: 'x' },
    });
    expect(result).toEqual({ user: { id: 'u1' } });
    const [path, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(path).toBe('/api/auth/sign-in');
    expect(init.method).toBe('POST');
    expect(init.credentials).toBe('same-origin');
    expect((init.headers as Record<string, string>)['Content-Type']).toBe('application/json');
    expect(init.body).toBe('{"email":"a@b.test","password":"x"}');
  });

  it('returns undefined for 204 No Content', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(null, { status: 204 })));
    await expect(apiRequest('/api/auth/sign-out', { method: 'POST' })).resolves.toBeUndefined();
  });

  it('throws ApiRequestError with the server message and fields for an error status', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => new Response(JSON.stringify({ error: 'That e-mail address already has an account' }), { status: 409 })),
    );
    const failure = await apiRequest('/api/users/invitations', { method: 'POST', body: {} }).catch((error: unknown) => error);
    expect(isApiStatus(failure, 409)).toBe(true);
    expect((failure as ApiRequestError).message).toBe('That e-mail address already has an account');
  });

  it('uses the fallback message when an error body is not JSON', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response('<html>Bad gateway</html>', { status: 502 })));
    const failure = await apiRequest('/api/health').catch((error: unknown) => error);
    expect((failure as ApiRequestError).status).toBe(502);
    expect((failure as ApiRequestError).message).toContain('HTTP 502');
  });

  it('reports an unreachable server as status 0 with a readable message', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))));
    const failure = await apiRequest('/api/health').catch((error: unknown) => error);
    expect((failure as ApiRequestError).status).toBe(networkFailureStatus);
    expect((failure as ApiRequestError).message).toContain('Could not reach the Rejectra server');
  });

  it('lets an abort pass through unchanged so cancelled queries stay quiet', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => Promise.reject(new DOMException('aborted', 'AbortError'))));
    const failure = await apiRequest('/api/health').catch((error: unknown) => error);
    expect(failure).toBeInstanceOf(DOMException);
  });
});
