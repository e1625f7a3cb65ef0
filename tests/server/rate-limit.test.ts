import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/test-app';

let app: TestApp;

beforeAll(async () => {
  app = await startTestApp({ env: { AUTH_RATE_LIMIT: '3' } });
});
afterAll(async () => {
  await app?.close();
});

describe('the sign-in rate limit', () => {
  it('answers 429 with a clear message once an address has used up its attempts', async () => {
    for (let attempt = 0; attempt < 3; attempt += 1) {
      const response = await request(app.url).post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password: 'guess-' + attempt });
      expect(response.status).toBe(401);
    }
    const limited = await request(app.url).post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password: 'bench-demo' });
    expect(limited.status).toBe(429);
    expect(limited.body.error).toMatch(/Too many attempts/);
  });

  it('counts password-reset requests against the same kind of limit', async () => {
    const responses = [];
    for (let attempt = 0; attempt < 4; attempt += 1) {
      responses.push((await request(app.url).post('/api/auth/forgot-password').send({ email: 'nobody@rejectra.test' })).status);
    }
    expect(responses.at(-1)).toBe(429);
  });
});
