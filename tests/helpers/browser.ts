// Debian's Chromium driven by playwright-core, with the flags this closed network needs.
import { mkdirSync } from 'node:fs';
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
