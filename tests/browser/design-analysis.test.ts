import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { artifactsDir, launchJourneyBrowser, screenshot, signInPage } from '../helpers/browser';
import { startTestApp, type TestApp } from '../helpers/test-app';

// The designer's journey of issue 5 through the built client in Chromium, on the demo lab: open
// the HRB-204 design's prediction, tighten the tolerance in the explorer and watch the yield
// rise, ask what tolerance a target needs, then open the rev C lot.
const shots = artifactsDir('design-analysis');
// Under a loaded machine a worker run or a lot analysis can take seconds; polls wait up to this long.
const patient = { timeout: 30_000 };
let app: TestApp;
let browser: Browser;

beforeAll(async () => {
  browser = await launchJourneyBrowser();
  app = await startTestApp({ seed: 'demo' });
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

/** The yield the explorer shows, as a fraction (its text is "63.8 %"). */
async function displayedYield(page: Page): Promise<number> {
  const text = (await page.getByTestId('explorer-yield').textContent()) ?? '';
  const percent = Number.parseFloat(text);
  if (!Number.isFinite(percent)) throw new Error(`The yield reads "${text}"`);
  return percent / 100;
}

describe('the designer at the design and lot views', () => {
  it('tightens the tolerance, sees the yield rise, asks for the tolerance of a target and reads the rev C lot', async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const pageErrors: string[] = [];
    page.on('pageerror', (error) => pageErrors.push(error.message));
    await signInPage(page, app.url, 'designer@rejectra.test');
    await expect.poll(() => page.getByRole('link', { name: 'Designs', exact: true }).count()).toBe(1);

    await page.getByRole('link', { name: 'Designs', exact: true }).click();
    await page.getByRole('link', { name: /LC-Bridge front-end board HRB-204/ }).click();
    const revC = page.getByRole('region', { name: /^Rev C/ });
    await revC.getByRole('link', { name: 'Prediction and tolerance explorer' }).click();
    await expect.poll(() => page.getByTestId('explorer-yield').count(), patient).toBe(1);
    await expect.poll(() => page.getByText('Computing…').count(), patient).toBe(0);
    // The first histogram opens where the worst case is tightest against the mask.
    await expect.poll(() => page.getByRole('heading', { name: 'Monte Carlo at 1 kHz' }).count()).toBe(1);
    const yieldBefore = await displayedYield(page);
    // Demo rev C: 0.1 % resistors at gain 10 against an 80 dB limit; two of its eight units fail it.
    expect(yieldBefore).toBeGreaterThan(0.3);
    expect(yieldBefore).toBeLessThan(0.9);
    await screenshot(page, shots, '01-design-view-rev-c');

    await page.getByLabel('Tolerance of every resistor (%)').fill('0.01');
    await expect.poll(async () => displayedYield(page), patient).toBeGreaterThan(yieldBefore);
    await expect.poll(() => page.getByText('Computing…').count(), patient).toBe(0);
    const yieldAfter = await displayedYield(page);
    expect(yieldAfter).toBeGreaterThan(0.99); // a 0.01 % network clears 80 dB by a wide margin at gain 10
    await expect.poll(() => page.getByText(/Exploring, not saved:/).count()).toBe(1);
    await expect.poll(() => page.getByText('R1 ±0.1 % → ±0.01 %', { exact: false }).count()).toBeGreaterThan(0);
    await screenshot(page, shots, '02-explorer-tolerance-0.01-percent');

    await page.getByLabel('Target CMRR (dB)').fill('90');
    const answer = page.getByTestId('tolerance-answer');
    await expect.poll(() => answer.count()).toBe(1);
    // 90 dB at gain 10: ε = 11/(4·10^(90/20)) ≈ 0.0087 % by the approximation (DOMAIN.md).
    await expect.poll(() => page.getByTestId('tolerance-approximation').textContent()).toContain('0.008696 %');
    expect(await page.getByTestId('tolerance-worst-case').textContent()).toMatch(/^±0\.00\d+ %$/);
    expect(await answer.textContent()).toContain('Exact worst case');
    expect(await answer.textContent()).toContain('Approximation');
    await page.getByRole('region', { name: 'Preferred-value pairs for a gain' }).scrollIntoViewIfNeeded();
    await screenshot(page, shots, '03-tolerance-for-90-dB');

    await page.getByRole('link', { name: '← LC-Bridge front-end board HRB-204' }).click();
    await revC.getByRole('link', { name: /Lot view/ }).click();
    const unitRows = page.getByTestId('lot-unit-rows').locator('tr');
    await expect.poll(() => unitRows.count(), patient).toBe(8);
    expect(await page.getByTestId('lot-spread-rows').locator('tr').count()).toBe(3); // the three mask corners
    expect(await page.getByTestId('lot-verdict-sentence').textContent()).toMatch(/8 units/);
    expect(await page.getByTestId('lot-spread-sentence').textContent()).toMatch(/predicted/);
    await screenshot(page, shots, '04-lot-rev-c');

    await page.getByRole('button', { name: /Verdict/ }).click();
    await expect.poll(() => unitRows.first().textContent()).toContain('Fail');
    expect(page.url()).toContain('sort=verdict');
    expect(await page.getByRole('link', { name: 'Export CSV' }).getAttribute('href')).toMatch(/\/lot\/export\.csv$/);
    await screenshot(page, shots, '05-lot-sorted-by-verdict');
    expect(pageErrors).toEqual([]);
    await context.close();
  });
});
