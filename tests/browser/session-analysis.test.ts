import { execFileSync } from 'node:child_process';
import path from 'node:path';
import type { Browser } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { summariseSession } from '../../shared/analysis';
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { DesignDetail, DesignSummary } from '../../shared/schemas/designs';
import { artifactsDir, launchJourneyBrowser, screenshot, signInPage } from '../helpers/browser';
import { runCli } from '../helpers/cli-runner';
import { startTestApp, type TestApp } from '../helpers/test-app';

// Issue 5's session journeys through the built client in Chromium, on the demo lab: the designer
// watches a streamed session arrive and reads its verdict and diagnosis, exports the PDF report
// from the page, and compares two demo sessions at a chosen frequency.
const shots = artifactsDir('session-analysis');
const designName = 'LC-Bridge front-end board HRB-204';
const unitSerial = 'HRB204-0101';
// Under a loaded machine a stream, a refit or a page can take seconds; polls wait up to this long.
const patient = { timeout: 30_000 };
let app: TestApp;
let browser: Browser;
let sessionId: string;
let token: string;
let designer: ReturnType<typeof request.agent>;

/** `rejectra stream --simulate` of 30 points into the journey's session: its exit code and everything it wrote. */
async function stream(mode: 'differential' | 'common-mode'): Promise<{ code: number | null; output: string }> {
  const args = ['--url', app.url, '--token', token, '--session', sessionId, '--mode', mode, '--simulate', '--points', '30', '--rate', '500'];
  const run = await runCli('stream', args);
  return { code: run.status, output: run.stdout + run.stderr };
}

const squash = (text: string) => text.replace(/\s+/g, ' ').trim();

beforeAll(async () => {
  browser = await launchJourneyBrowser();
  app = await startTestApp({ seed: 'demo' });
  designer = await app.signedIn('designer@rejectra.test');
  const technician = await app.signedIn('tech@rejectra.test');
  const designs = (await designer.get('/api/designs').expect(200)).body.designs as DesignSummary[];
  const design = designs.find((candidate) => candidate.name === designName)!;
  const created = await technician
    .post('/api/sessions')
    .send({
      designRevisionId: design.latestRevision.id,
      unitSerial,
      fixture: 'Bridge fixture BF-2',
      ambientTemperatureC: 23.4,
      differentialDrive: { acVolts: 0.1, acConvention: 'rms', dcVolts: 0 },
      commonModeDrive: { acVolts: 1, acConvention: 'rms', dcVolts: 0 },
    })
    .expect(201);
  sessionId = created.body.session.id;
  token = (await technician.post('/api/tokens').send({ name: 'Journey bench PC' }).expect(201)).body.token.token;
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

describe('session analysis in the browser', () => {
  it('shows a streamed session filling in live, then its verdict and diagnosis, and exports the PDF report from the page', { timeout: 180_000 }, async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 }, acceptDownloads: true });
    const page = await context.newPage();
    await signInPage(page, app.url, 'designer@rejectra.test');
    await page.goto(`${app.url}/sessions/${sessionId}`);
    await expect.poll(() => page.locator('[data-live-status="live"]').count(), patient).toBe(1);
    await page.evaluate(() => ((window as unknown as { journeyMarker: string }).journeyMarker = 'not reloaded'));

    const differential = await stream('differential');
    expect(differential.code, differential.output).toBe(0);
    await expect.poll(() => page.getByTestId('analysis-incomplete').textContent(), patient).toMatch(/Only a differential sweep so far \(30 points\)/);
    await screenshot(page, shots, '01-only-differential-so-far');

    const commonMode = await stream('common-mode');
    expect(commonMode.code, commonMode.output).toBe(0);
    await expect.poll(() => page.getByText('Analysis complete').count(), patient).toBe(1);
    await expect.poll(() => page.locator('.u-over').count(), patient).toBeGreaterThanOrEqual(2);
    expect(await page.evaluate(() => (window as unknown as { journeyMarker?: string }).journeyMarker)).toBe('not reloaded');

    // The page says what the shared summary says about this analysis and design.
    const analysis = (await designer.get(`/api/sessions/${sessionId}/analysis`).expect(200)).body.analysis as SessionAnalysis;
    const session = (await designer.get(`/api/sessions/${sessionId}`).expect(200)).body.session;
    const design = (await designer.get(`/api/designs/${session.design.id}`).expect(200)).body.design as DesignDetail;
    const circuit = design.revisions.find((revision) => revision.id === session.designRevision.id)!.circuit;
    const expected = summariseSession(analysis, circuit);
    const verdict = page.getByTestId('verdict-sentence');
    await expect.poll(async () => squash((await verdict.textContent()) ?? ''), patient).toBe(expected.sentence.charAt(0).toUpperCase() + expected.sentence.slice(1));
    const diagnosis = expected.diagnosis!.sentences;
    expect(diagnosis.length).toBeGreaterThan(0);
    await expect.poll(async () => (await page.getByTestId('diagnosis').locator('li').allTextContents()).map(squash), patient).toEqual(diagnosis.map(squash));
    expect(await page.getByTestId('regime-sentence').textContent()).toBe(analysis.fit!.regimeSentence);
    expect(await page.getByTestId('dc-cmrr').textContent()).toMatch(/^\d+\.\d dB$/);
    await expect.poll(() => page.locator('[data-band-state="ready"]').count(), patient).toBe(1);

    // Hover readout: the frequency and every visible trace with its unit; a toggle hides a trace.
    const plot = page.locator('.u-over').first();
    await plot.scrollIntoViewIfNeeded();
    const box = (await plot.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    const readout = page.getByTestId('chart-readout').first();
    await expect.poll(() => readout.textContent(), patient).toMatch(/(Hz|kHz).*Measured CMRR.*dB/);
    await page.getByRole('checkbox', { name: 'Monte Carlo 5–95 %' }).uncheck();
    await expect.poll(() => readout.textContent(), patient).not.toMatch(/Monte Carlo/);
    await page.getByRole('checkbox', { name: 'Monte Carlo 5–95 %' }).check();
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    await screenshot(page, shots, '02-streamed-session-verdict-and-diagnosis');

    // The PDF report from the page's own link holds the unit, the design and the verdict shown.
    const shown = squash((await verdict.textContent()) ?? '');
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'PDF report' }).click()]);
    const pdfPath = path.join(shots, 'report.pdf');
    await download.saveAs(pdfPath);
    const text = squash(execFileSync('pdftotext', ['-layout', pdfPath, '-'], { encoding: 'utf8' }));
    expect(text).toContain(unitSerial);
    expect(text).toContain(designName);
    expect(text).toContain(shown);
    await context.close();
  });

  it('lays the charts out while the analysis is computed and fills them when it arrives, asking for no more points than the screen shows', { timeout: 120_000 }, async () => {
    const listed = (await designer.get('/api/sessions').query({ search: 'HRB204-0003' }).expect(200)).body.items as { id: string; unitSerial: string }[];
    const demo = listed.find((candidate) => candidate.unitSerial === 'HRB204-0003')!;
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    await signInPage(page, app.url, 'designer@rejectra.test');
    // Hold the analysis back, as a long session's would be while the server fits it.
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    const asked: string[] = [];
    await page.route(/\/api\/sessions\/[^/]+\/analysis(\?|$)/, async (route) => {
      asked.push(route.request().url());
      await held;
      await route.continue();
    });
    await page.goto(`${app.url}/sessions/${demo.id}`);
    await expect.poll(() => page.getByTestId('analysis-pending').count(), patient).toBe(1);
    await expect.poll(() => page.locator('.u-over').count(), patient).toBe(2);
    expect(await page.getByRole('status').filter({ hasText: 'Analysing the sweeps…' }).count()).toBe(2);
    expect(await page.getByText('The verdict follows the analysis.').count()).toBe(1);
    expect(await page.evaluate(() => performance.getEntriesByName('session-charts').length)).toBe(0);
    // 1440 px wide: 1440 − 264 (navigation) − 64 (margins) − 384 − 24 (side column) = 704 px of plot, four points per pixel column.
    expect(asked.map((address) => new URL(address).searchParams.get('maxPoints'))).toEqual(['2816']);
    // The budget assumed a plot at least as wide as the one laid out: one column of thinning per pixel or finer.
    const plotWidths = await page.locator('.u-over').evaluateAll((plots) => plots.map((plot) => plot.getBoundingClientRect().width));
    for (const width of plotWidths) expect(width).toBeLessThanOrEqual(704);
    await screenshot(page, shots, '00-charts-laid-out-while-analysing');

    release();
    await expect.poll(() => page.getByText('Analysis complete').count(), patient).toBe(1);
    await expect.poll(() => page.getByTestId('verdict-sentence').count(), patient).toBe(1);
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Analysing the sweeps…' }).count(), patient).toBe(0);
    expect(await page.locator('.u-over').count()).toBeGreaterThanOrEqual(2);
    expect(await page.evaluate(() => performance.getEntriesByName('session-charts').length)).toBe(1);
    expect(await page.getByRole('checkbox', { name: 'Measured values' }).count()).toBe(1);
    // Every analysed point, worst margin first: the first row is the tightest frequency named beside the charts.
    const table = page.getByTestId('analysis-points');
    await table.locator('summary').click();
    await table.getByRole('button', { name: /Margin/ }).click();
    await expect.poll(() => new URL(page.url()).searchParams.get('cmrrSort'), patient).toBe('marginDb');
    await expect.poll(() => table.locator('tbody tr').count(), patient).toBe(25);
    // "+6.2 dB above the 80.0 dB limit at 85 Hz (…)": the margin and the frequency.
    const tightest = squash((await page.getByTestId('tightest-margin').textContent()) ?? '');
    const [, tightestMargin, tightestFrequency] = tightest.match(/^(\S+ dB) (?:above|below) the .* limit at (\S+ k?Hz) /)!;
    const firstRow = table.locator('tbody tr').first().locator('td');
    await expect.poll(async () => (await firstRow.allTextContents()).filter((_, column) => column === 0 || column === 6), patient).toEqual([tightestFrequency, tightestMargin]);
    await screenshot(page, shots, '00b-points-by-margin');
    // HRB204-0003 is archived in the demo: it takes no more points, so no "Live" marker.
    expect(await page.getByText(/^Archived by /).count()).toBe(1);
    expect(await page.locator('[data-live-status]').count()).toBe(0);
    await context.close();
  });

  it('compares two demo sessions overlaid, with the difference at a typed and then a clicked frequency', { timeout: 120_000 }, async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    await signInPage(page, app.url, 'designer@rejectra.test');
    await page.getByRole('link', { name: 'Compare', exact: true }).click();
    await expect.poll(() => page.getByText('Choose sessions to compare').count(), patient).toBe(1);
    const search = page.getByLabel('Search sessions');
    for (const serial of ['HRB204-0003', 'HRB204-0012']) {
      await search.fill(serial);
      await expect.poll(() => page.getByRole('button', { name: `Add ${serial}` }).count(), patient).toBe(1);
      await page.getByRole('button', { name: `Add ${serial}` }).click();
    }
    await expect.poll(() => new URL(page.url()).searchParams.get('sessions')?.split(',').length, patient).toBe(2);
    await expect.poll(() => page.getByTestId('compare-row').count(), patient).toBe(2);
    await page.getByRole('textbox', { name: 'Comparison frequency' }).fill('20k');
    await page.getByRole('button', { name: 'Compare here' }).click();
    await expect.poll(() => new URL(page.url()).searchParams.get('f'), patient).toBe('20000');
    await expect.poll(() => page.getByTestId('compare-sentence').textContent(), patient).toMatch(/^At 20 kHz, against HRB204-0003 \(\d+\.\d dB\): HRB204-0012 .*\d+\.\d dB (above|below)\.$/);
    await screenshot(page, shots, '03-compare-two-demo-sessions');

    // The view is its address: reopening it shows the same comparison.
    const shared = page.url();
    const second = await context.newPage();
    await second.goto(shared);
    await expect.poll(() => second.getByTestId('compare-row').count(), patient).toBe(2);
    await second.close();

    // A click on the chart picks the frequency.
    const plot = page.locator('.u-over').first();
    const box = (await plot.boundingBox())!;
    await page.mouse.click(box.x + box.width * 0.3, box.y + box.height * 0.5);
    await expect.poll(() => new URL(page.url()).searchParams.get('f'), patient).not.toBe('20000');
    await expect.poll(() => page.getByTestId('compare-sentence').textContent(), patient).not.toMatch(/^At 20 kHz/);
    await screenshot(page, shots, '04-compare-clicked-frequency');
    await context.close();
  });
});
