import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchJourneyBrowser, screenshot } from '../helpers/browser';
import { startTestApp, type TestApp } from '../helpers/test-app';

// The onboarding journey from the foundation issue, through the built client in Chromium.
const shots = artifactsDir('onboarding');
let app: TestApp;
let browser: Browser;

beforeAll(async () => {
  browser = await launchJourneyBrowser();
  app = await startTestApp();
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

describe('onboarding a technician', () => {
  it('lets a lead invite a technician who sets a password from the e-mailed link and sees only technician areas', async () => {
    const leadContext = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const lead = await leadContext.newPage();
    await lead.goto(`${app.url}/sign-in`);
    await lead.getByLabel('E-mail').fill('lead@rejectra.test');
    await lead.getByLabel('Password').fill('bench-demo');
    await screenshot(lead, shots, '01-sign-in');
    await lead.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => lead.getByRole('heading', { name: /Maren Okafor/ }).count()).toBe(1);
    await screenshot(lead, shots, '02-lead-overview');

    await lead.getByRole('link', { name: 'People', exact: true }).click();
    await lead.getByLabel('Name', { exact: true }).fill('Sander Vik');
    await lead.getByLabel('E-mail', { exact: true }).fill('sander.vik@rejectra.test');
    await lead.getByLabel('Role', { exact: true }).selectOption('technician');
    await lead.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => lead.getByRole('cell', { name: 'sander.vik@rejectra.test' }).count()).toBe(1);
    await screenshot(lead, shots, '03-people-after-invite');

    await lead.getByRole('link', { name: 'Mailbox', exact: true }).click();
    await lead.getByRole('link', { name: /Your Rejectra account is ready to set up/ }).first().click();
    const invitationLink = lead.getByRole('link', { name: /\/link\// });
    await expect.poll(() => invitationLink.count()).toBe(1);
    await screenshot(lead, shots, '04-mailbox-invitation');
    const href = await invitationLink.getAttribute('href');
    expect(href).toMatch(new RegExp(`^${app.url}/link/[A-Za-z0-9_-]{43}$`));

    const techContext = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const tech = await techContext.newPage();
    await tech.goto(href!);
    await expect.poll(() => tech.getByText('sander.vik@rejectra.test').count()).toBeGreaterThan(0);
    await tech.getByLabel('New password').fill('short');
    await tech.getByLabel('Repeat password').fill('short');
    await tech.getByRole('button', { name: 'Set password' }).click();
    await expect.poll(() => tech.getByText('Password must be at least 10 characters').count()).toBeGreaterThan(0);
    await screenshot(tech, shots, '05-link-weak-password');
    await tech.getByLabel('New password').fill('probe-ground-first');
    await tech.getByLabel('Repeat password').fill('probe-ground-first');
    await tech.getByRole('button', { name: 'Set password' }).click();
    await expect.poll(() => tech.getByRole('heading', { name: /Sander Vik/ }).count()).toBe(1);
    await screenshot(tech, shots, '06-technician-overview');

    const nav = tech.getByRole('navigation', { name: 'Main' });
    await expect.poll(() => nav.getByRole('link', { name: 'Bench sessions' }).count()).toBe(1);
    expect(await nav.getByRole('link', { name: 'People' }).count()).toBe(0);
    expect(await nav.getByRole('link', { name: 'Mailbox' }).count()).toBe(0);
    await tech.goto(`${app.url}/people`);
    await expect.poll(() => tech.getByText(/needs the lead role/i).count()).toBeGreaterThan(0);
    await screenshot(tech, shots, '07-technician-people-refused');

    await tech.getByRole('button', { name: 'Sign out' }).click();
    await expect.poll(() => tech.getByRole('button', { name: 'Sign in' }).count()).toBe(1);
    await tech.getByLabel('E-mail').fill('sander.vik@rejectra.test');
    await tech.getByLabel('Password').fill('probe-ground-first');
    await tech.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => tech.getByRole('heading', { name: /Sander Vik/ }).count()).toBe(1);

    await tech.goto(href!);
    await expect.poll(() => tech.getByText(/already used/).count()).toBeGreaterThan(0);
    await screenshot(tech, shots, '08-link-reused');
    await techContext.close();
    await leadContext.close();
  });
});
