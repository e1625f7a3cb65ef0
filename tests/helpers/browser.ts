// Debian's Chromium driven by playwright-core, with the flags this closed network needs.
import { existsSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

export const chromiumPath = process.env.CHROMIUM_PATH || '/usr/bin/chromium';

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: chromiumPath,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

/** Where screenshots go: test-artifacts/<journey>/ (npm test sets TEST_ARTIFACTS_DIR). */
export function artifactsDir(journey: string): string {
  const dir = path.join(process.env.TEST_ARTIFACTS_DIR || 'test-artifacts', journey);
  mkdirSync(dir, { recursive: true });
  return dir;
}

export async function screenshot(page: Page, dir: string, name: string): Promise<void> {
  await page.screenshot({ path: path.join(dir, `${name}.png`), fullPage: true });
}

/**
 * Chromium for a journey through the built client (`npm test` builds it into CLIENT_DIR), refusing
 * with what to do when the client or Chromium is missing.
 */
export function launchJourneyBrowser(): Promise<Browser> {
  if (!existsSync(path.join(process.env.CLIENT_DIR || 'dist/client', 'index.html'))) {
    throw new Error('The client is not built: run the suite with `npm test`, which builds it');
  }
  if (!existsSync(chromiumPath)) throw new Error(`Chromium is missing at ${chromiumPath}: npm test installs it`);
  return launchBrowser();
}

/** Signs in through the sign-in page (demo password by default) and waits until the page has left it. */
export async function signInPage(page: Page, baseUrl: string, email: string, password = 'bench-demo'): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}
