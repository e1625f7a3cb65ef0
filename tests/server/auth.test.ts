import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/test-app';

// Demo accounts and password come from server/seed.ts (demo only).
const password = 'bench-demo';
let app: TestApp;

beforeAll(async () => {
  app = await startTestApp();
});
afterAll(async () => {
  await app?.close();
});

function agent() {
  return request.agent(app.url).set('Origin', app.origin);
}

describe('GET /api/health', () => {
  it('reports the database as up and the local mail stand-in in use', async () => {
    const response = await request(app.url).get('/api/health');
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ status: 'ok', database: 'up', mail: 'local-stand-in' });
  });
});

describe('POST /api/auth/sign-in', () => {
  it('signs a demo lead in with an HTTP-only, SameSite session cookie', async () => {
    const response = await agent().post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password });
    expect(response.status).toBe(200);
    expect(response.body.user).toMatchObject({ email: 'lead@rejectra.test', role: 'lead', status: 'active' });
    const cookie = String(response.headers['set-cookie']);
    expect(cookie).toMatch(/rejectra_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(response.body.user.passwordHash).toBeUndefined();
  });

  it('accepts the e-mail address in any case and with surrounding spaces', async () => {
    const response = await agent().post('/api/auth/sign-in').send({ email: '  Tech@Rejectra.TEST ', password });
    expect(response.status).toBe(200);
    expect(response.body.user.role).toBe('technician');
  });

  it('says the password is wrong for a known address', async () => {
    const response = await agent().post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password: 'not-the-password' });
    expect(response.status).toBe(401);
    expect(response.body.error).toBe('Wrong password for this account');
    expect(response.headers['set-cookie']).toBeUndefined();
  });

  it('says no account uses an unknown address', async () => {
    const response = await agent().post('/api/auth/sign-in').send({ email: 'nobody@rejectra.test', password });
    expect(response.status).toBe(401);
    expect(response.body.error).toBe('No account uses nobody@rejectra.test');
  });

  it('names each missing or malformed field', async () => {
    const response = await agent().post('/api/auth/sign-in').send({ email: 'not-an-address' });
    expect(response.status).toBe(400);
    expect(response.body.fields).toEqual({ email: 'Not a valid e-mail address', password: 'Password is required' });
  });

  it('rejects a body that is not JSON without a stack trace', async () => {
    const response = await agent().post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email":');
    expect(response.status).toBe(400);
    expect(response.body).toEqual({ error: 'The request body is not valid JSON' });
  });
});

describe('GET /api/auth/me and POST /api/auth/sign-out', () => {
  it('answers 401 when signed out', async () => {
    const response = await request(app.url).get('/api/auth/me');
    expect(response.status).toBe(401);
    expect(response.body.error).toBe('Sign in first');
  });

  it('returns the person while signed in and 401 after signing out', async () => {
    const session = agent();
    await session.post('/api/auth/sign-in').send({ email: 'designer@rejectra.test', password }).expect(200);
    const me = await session.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.role).toBe('designer');
    await session.post('/api/auth/sign-out').expect(204);
    expect((await session.get('/api/auth/me')).status).toBe(401);
  });
});

describe('the Origin check', () => {
  it('refuses a state-changing request with a session cookie from a foreign origin', async () => {
    const session = agent();
    await session.post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password }).expect(200);
    const response = await session
      .post('/api/users/invitations')
      .set('Origin', 'http://evil.example')
      .send({ email: 'x@rejectra.test', name: 'X', role: 'technician' });
    expect(response.status).toBe(403);
    expect(response.body.error).toMatch(/did not come from a Rejectra page/);
  });
});

describe('role checks', () => {
  it('answers 403 to a technician and a designer calling a lead-only route, 200 to a lead', async () => {
    for (const [email, status] of [
      ['tech@rejectra.test', 403],
      ['designer@rejectra.test', 403],
      ['lead@rejectra.test', 200],
    ] as const) {
      const session = agent();
      await session.post('/api/auth/sign-in').send({ email, password }).expect(200);
      const response = await session.get('/api/users');
      expect(response.status).toBe(status);
      if (status === 403) expect(response.body.error).toMatch(/needs the lead role/);
    }
  });

  it('answers 404 in JSON for an unknown API route', async () => {
    const response = await request(app.url).get('/api/no-such-thing');
    expect(response.status).toBe(404);
    expect(response.body.error).toBe('No API route GET /api/no-such-thing');
  });
});
