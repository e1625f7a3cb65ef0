import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AccountLink, User } from '../../server/models';
import { freePort } from '../../scripts/lib/postgres-cluster';
import { startTestApp, type TestApp } from '../helpers/test-app';

// Mail configured to a real SMTP server that does not answer: nothing may be half-written.
let app: TestApp;

beforeAll(async () => {
  app = await startTestApp({ env: { SMTP_URL: `smtp://127.0.0.1:${await freePort()}` } });
});
afterAll(async () => {
  await app?.close();
});

describe('an invitation whose e-mail cannot be sent', () => {
  it('answers 502 and leaves neither the person nor the link behind', async () => {
    const lead = request.agent(app.url).set('Origin', app.origin);
    await lead.post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password: 'bench-demo' }).expect(200);
    const [usersBefore, linksBefore] = [await User.count(), await AccountLink.count()];
    const response = await lead.post('/api/users/invitations').send({ email: 'unlucky@rejectra.test', name: 'Un Lucky', role: 'technician' });
    expect(response.status).toBe(502);
    expect(response.body.error).toMatch(/could not be sent.*nothing was changed/);
    expect(await User.count()).toBe(usersBefore);
    expect(await AccountLink.count()).toBe(linksBefore);
  });

  it('reports real SMTP in the health check and hides the local mailbox', async () => {
    expect((await request(app.url).get('/api/health')).body.mail).toBe('smtp');
    const lead = request.agent(app.url).set('Origin', app.origin);
    await lead.post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password: 'bench-demo' }).expect(200);
    expect((await lead.get('/api/dev/mail')).status).toBe(404);
  });
});
