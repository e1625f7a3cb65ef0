import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { User } from '../../server/models';
import { startTestApp, type TestApp } from '../helpers/test-app';

// Demo password from server/seed.ts; link lifetimes from server/auth/link-tokens.ts
// (invitation 7 days, reset 1 hour: common practice, no source).
const demoPassword = 'bench-demo';
const dayMs = 24 * 3600_000;
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

async function signedIn(email: string, password = demoPassword) {
  const session = agent();
  await session.post('/api/auth/sign-in').send({ email, password }).expect(200);
  return session;
}

const tokenOf = (link: string) => link.slice(link.lastIndexOf('/') + 1);

describe('invitations', () => {
  it('lets a lead invite a technician who then sets a password from the e-mailed link and signs in', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const invited = await lead.post('/api/users/invitations').send({ email: 'Petra.Lunde@Rejectra.test', name: 'Petra Lunde', role: 'technician' });
    expect(invited.status).toBe(201);
    expect(invited.body.user).toMatchObject({ email: 'petra.lunde@rejectra.test', status: 'invited', role: 'technician' });

    const link = await app.linkSentTo('petra.lunde@rejectra.test');
    expect(link.startsWith(`${app.url}/link/`)).toBe(true);
    const info = await request(app.url).get(`/api/auth/links/${tokenOf(link)}`);
    expect(info.status).toBe(200);
    expect(info.body).toMatchObject({ purpose: 'invite', email: 'petra.lunde@rejectra.test', name: 'Petra Lunde' });

    const invitee = agent();
    const accepted = await invitee.post('/api/auth/links/accept').send({ token: tokenOf(link), password: 'shunt-resistor-42' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user.status).toBe('active');
    expect((await invitee.get('/api/auth/me')).body.user.email).toBe('petra.lunde@rejectra.test');
    expect((await invitee.get('/api/users')).status).toBe(403);

    await signedIn('petra.lunde@rejectra.test', 'shunt-resistor-42');
  });

  it('refuses a reused link with 410 and says what to do', async () => {
    const lead = await signedIn('lead@rejectra.test');
    await lead.post('/api/users/invitations').send({ email: 'once@rejectra.test', name: 'Once Only', role: 'designer' }).expect(201);
    const token = tokenOf(await app.linkSentTo('once@rejectra.test'));
    await agent().post('/api/auth/links/accept').send({ token, password: 'gain-error-0.1pct' }).expect(200);
    const again = await agent().post('/api/auth/links/accept').send({ token, password: 'another-password-9' });
    expect(again.status).toBe(410);
    expect(again.body.error).toMatch(/already used/);
  });

  it('refuses a weak password, naming the field, and leaves the link usable', async () => {
    const lead = await signedIn('lead@rejectra.test');
    await lead.post('/api/users/invitations').send({ email: 'weak@rejectra.test', name: 'Weak Choice', role: 'technician' }).expect(201);
    const token = tokenOf(await app.linkSentTo('weak@rejectra.test'));
    const short = await agent().post('/api/auth/links/accept').send({ token, password: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.fields.password).toBe('Password must be at least 10 characters');
    const common = await agent().post('/api/auth/links/accept').send({ token, password: 'password123' });
    expect(common.body.fields.password).toBe('This password is too common; choose another');
    await agent().post('/api/auth/links/accept').send({ token, password: 'a-long-enough-one' }).expect(200);
  });

  it('refuses an expired invitation with 410', async () => {
    const lead = await signedIn('lead@rejectra.test');
    await lead.post('/api/users/invitations').send({ email: 'late@rejectra.test', name: 'Late Arrival', role: 'technician' }).expect(201);
    const token = tokenOf(await app.linkSentTo('late@rejectra.test'));
    app.advanceClock(8 * dayMs);
    try {
      const response = await request(app.url).get(`/api/auth/links/${token}`);
      expect(response.status).toBe(410);
      expect(response.body.error).toMatch(/expired/);
      expect((await agent().post('/api/auth/links/accept').send({ token, password: 'too-late-now-1' })).status).toBe(410);
    } finally {
      app.advanceClock(-8 * dayMs);
    }
  });

  it('answers 404 for a link token nobody issued', async () => {
    const response = await request(app.url).get(`/api/auth/links/${'x'.repeat(43)}`);
    expect(response.status).toBe(404);
    expect(response.body.error).toMatch(/not known/);
  });

  it('refuses a duplicate invitation with 409 and writes nothing', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const before = await User.count();
    const duplicate = await lead.post('/api/users/invitations').send({ email: 'tech@rejectra.test', name: 'Again', role: 'technician' });
    expect(duplicate.status).toBe(409);
    expect(duplicate.body.error).toBe('tech@rejectra.test already has an account');
    expect(duplicate.body.fields.email).toBeDefined();
    expect(await User.count()).toBe(before);
  });

  it('names an unknown role and a missing name', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const response = await lead.post('/api/users/invitations').send({ email: 'r@rejectra.test', role: 'admin' });
    expect(response.status).toBe(400);
    expect(Object.keys(response.body.fields).sort()).toEqual(['name', 'role']);
  });

  it('resends an invitation, invalidating the earlier link', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const created = await lead.post('/api/users/invitations').send({ email: 'resend@rejectra.test', name: 'Re Send', role: 'technician' });
    const firstToken = tokenOf(await app.linkSentTo('resend@rejectra.test'));
    await lead.post(`/api/users/${created.body.user.id}/invitations/resend`).expect(202);
    const secondToken = tokenOf(await app.linkSentTo('resend@rejectra.test'));
    expect(secondToken).not.toBe(firstToken);
    expect((await request(app.url).get(`/api/auth/links/${firstToken}`)).status).toBe(410);
    expect((await request(app.url).get(`/api/auth/links/${secondToken}`)).status).toBe(200);
  });
});

describe('password reset', () => {
  it('answers 404 for an unknown address', async () => {
    const response = await agent().post('/api/auth/forgot-password').send({ email: 'ghost@rejectra.test' });
    expect(response.status).toBe(404);
    expect(response.body.error).toBe('No account uses ghost@rejectra.test');
  });

  it('resets by a single-use link and ends the sessions that were open', async () => {
    const lead = await signedIn('lead@rejectra.test');
    await lead.post('/api/users/invitations').send({ email: 'forgetful@rejectra.test', name: 'For Getful', role: 'technician' }).expect(201);
    await agent().post('/api/auth/links/accept').send({ token: tokenOf(await app.linkSentTo('forgetful@rejectra.test')), password: 'first-password-1' }).expect(200);
    const oldSession = await signedIn('forgetful@rejectra.test', 'first-password-1');

    const requested = await agent().post('/api/auth/forgot-password').send({ email: 'forgetful@rejectra.test' });
    expect(requested.status).toBe(202);
    const resetLink = await app.linkSentTo('forgetful@rejectra.test');
    const info = await request(app.url).get(`/api/auth/links/${tokenOf(resetLink)}`);
    expect(info.body.purpose).toBe('reset');

    await agent().post('/api/auth/links/accept').send({ token: tokenOf(resetLink), password: 'second-password-2' }).expect(200);
    expect((await oldSession.get('/api/auth/me')).status).toBe(401);
    expect((await agent().post('/api/auth/sign-in').send({ email: 'forgetful@rejectra.test', password: 'first-password-1' })).status).toBe(401);
    await signedIn('forgetful@rejectra.test', 'second-password-2');
    expect((await agent().post('/api/auth/links/accept').send({ token: tokenOf(resetLink), password: 'third-password-3' })).status).toBe(410);
  });

  it('expires a reset link after an hour', async () => {
    await agent().post('/api/auth/forgot-password').send({ email: 'designer@rejectra.test' }).expect(202);
    const token = tokenOf(await app.linkSentTo('designer@rejectra.test'));
    app.advanceClock(61 * 60_000);
    try {
      const response = await request(app.url).get(`/api/auth/links/${token}`);
      expect(response.status).toBe(410);
      expect(response.body.error).toMatch(/expired/);
    } finally {
      app.advanceClock(-61 * 60_000);
    }
  });
});

describe('roles and deactivation', () => {
  it('ends a deactivated person\'s sessions at once and refuses their sign-in until reactivated', async () => {
    const lead = await signedIn('lead@rejectra.test');
    await lead.post('/api/users/invitations').send({ email: 'leaving@rejectra.test', name: 'Leav Ing', role: 'technician' }).expect(201);
    const accepted = await agent().post('/api/auth/links/accept').send({ token: tokenOf(await app.linkSentTo('leaving@rejectra.test')), password: 'soon-gone-pass' });
    const id = accepted.body.user.id as string;
    const theirSession = await signedIn('leaving@rejectra.test', 'soon-gone-pass');

    const deactivated = await lead.patch(`/api/users/${id}`).send({ active: false });
    expect(deactivated.status).toBe(200);
    expect(deactivated.body.user.status).toBe('deactivated');
    expect((await theirSession.get('/api/auth/me')).status).toBe(401);
    const refused = await agent().post('/api/auth/sign-in').send({ email: 'leaving@rejectra.test', password: 'soon-gone-pass' });
    expect(refused.status).toBe(403);
    expect(refused.body.error).toMatch(/deactivated/);

    await lead.patch(`/api/users/${id}`).send({ active: true }).expect(200);
    await signedIn('leaving@rejectra.test', 'soon-gone-pass');
  });

  it('changes a role, which takes effect on the next request', async () => {
    const lead = await signedIn('lead@rejectra.test');
    await lead.post('/api/users/invitations').send({ email: 'promoted@rejectra.test', name: 'Pro Moted', role: 'technician' }).expect(201);
    const accepted = await agent().post('/api/auth/links/accept').send({ token: tokenOf(await app.linkSentTo('promoted@rejectra.test')), password: 'moving-up-now' });
    const theirSession = await signedIn('promoted@rejectra.test', 'moving-up-now');
    expect((await theirSession.get('/api/users')).status).toBe(403);
    await lead.patch(`/api/users/${accepted.body.user.id}`).send({ role: 'lead' }).expect(200);
    expect((await theirSession.get('/api/users')).status).toBe(200);
  });

  it('refuses to let a lead deactivate or demote themselves', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const me = (await lead.get('/api/auth/me')).body.user;
    const deactivate = await lead.patch(`/api/users/${me.id}`).send({ active: false });
    expect(deactivate.status).toBe(409);
    expect(deactivate.body.error).toBe('You cannot deactivate your own account');
    expect((await lead.patch(`/api/users/${me.id}`).send({ role: 'designer' })).status).toBe(409);
  });

  it('names a missing change and answers 404 for an unknown person', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const empty = await lead.patch('/api/users/00000000-0000-4000-8000-000000000000').send({});
    expect(empty.status).toBe(400);
    expect(empty.body.fields.role).toBe('Give a new role or an active flag');
    expect((await lead.patch('/api/users/00000000-0000-4000-8000-000000000000').send({ active: false })).status).toBe(404);
  });
});

describe('GET /api/dev/mail', () => {
  it('shows a lead what the local stand-in received, and no one else', async () => {
    const lead = await signedIn('lead@rejectra.test');
    const list = await lead.get('/api/dev/mail');
    expect(list.status).toBe(200);
    expect(list.body.messages.length).toBeGreaterThan(0);
    const message = await lead.get(`/api/dev/mail/${list.body.messages[0].id}`);
    expect(message.status).toBe(200);
    expect(message.body.text).toMatch(/\/link\//);
    expect((await lead.get('/api/dev/mail/../../etc/passwd')).status).toBe(404);
    const tech = await signedIn('tech@rejectra.test');
    expect((await tech.get('/api/dev/mail')).status).toBe(403);
  });
});
