import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { predictDifferenceAmplifier } from '../../shared/engine';
import { artifactsDir, launchJourneyBrowser, screenshot, signInPage } from '../helpers/browser';
import { runCli } from '../helpers/cli-runner';
import { logSpacedHz, testDesignInput } from '../helpers/bench-fixtures';
import { startTestApp, type TestApp } from '../helpers/test-app';

// The bench-data journey of issue 4, through the built client in Chromium: start a session,
// upload a differential sweep with a foreign header through the mapping step, create an access
// token, and watch the stream client's common-mode sweep arrive live.
const shots = artifactsDir('bench-data');
const designName = 'Journey bridge HRB-990';
const instrumentName = 'Journey scope JS-1';
const unitSerial = 'HRB990-0001';
// Points in the uploaded sweep (30, log-spaced over the simulated instrument's 10 Hz – 100 kHz).
const differentialPointCount = 30;
const commonModePointCount = 40;
// Under a loaded machine an upload or a refit can take seconds; polls wait up to this long.
const patient = { timeout: 30_000 };
let app: TestApp;
let browser: Browser;

beforeAll(async () => {
  browser = await launchJourneyBrowser();
  app = await startTestApp();

  const designer = await app.signedIn('designer@rejectra.test');
  await designer.post('/api/designs').send(testDesignInput(designName)).expect(201);
  const lead = await app.signedIn('lead@rejectra.test');
  await lead
    .post('/api/instruments')
    .send({ name: instrumentName, kind: 'oscilloscope', manufacturer: 'Halden Ridge', model: 'DS-4', serialNumber: 'JS1-0001', calibratedOn: '2026-01-05', calibrationDueOn: '2099-01-05' })
    .expect(201);
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

/**
 * The differential sweep of the test design (gain-10 difference amplifier, 8 MHz op-amp) as a
 * bench program in a decimal-comma locale might write it: semicolons, kHz and mV peak.
 */
function foreignDifferentialCsv(): string {
  const frequenciesHz = logSpacedHz(differentialPointCount, 10, 100_000);
  const predicted = predictDifferenceAmplifier(frequenciesHz, { r1Ohms: 1000, r2Ohms: 10_000, r3Ohms: 1000, r4Ohms: 10_000 }, {
    openLoopGainDb: 120,
    gainBandwidthHz: 8e6,
    cmrrDb: 110,
    cmrrCornerHz: 2000,
  });
  const driveMillivoltsPeak = 100;
  const rows = predicted.map((point) =>
    [(point.frequencyHz / 1000).toPrecision(10), driveMillivoltsPeak.toFixed(3), (driveMillivoltsPeak * 10 ** (point.adDb / 20)).toPrecision(10)].join(';'),
  );
  return ['# HRB990-0001 differential, bench PC 3', 'Freq (kHz);Drive (mV pk);Out (mV pk)', ...rows].join('\n') + '\n';
}

/** `rejectra stream …` to its end: its exit code and everything it wrote. */
async function runStreamClient(args: string[]): Promise<{ code: number | null; output: string }> {
  const run = await runCli('stream', args);
  return { code: run.status, output: run.stdout + run.stderr };
}

describe('bench data in', () => {
  it('lets a technician start a session, map and upload a foreign sweep file, and watch a streamed sweep arrive live', { timeout: 180_000 }, async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const tech = await context.newPage();
    await signInPage(tech, app.url, 'tech@rejectra.test');
    await tech.getByRole('link', { name: 'Bench sessions', exact: true }).click();
    await tech.getByRole('link', { name: 'Start a bench session' }).click();
    // The list page has a "Design" filter of its own: act only once the form has replaced it.
    await tech.waitForURL(/\/sessions\/new$/);
    await expect.poll(() => tech.getByRole('form', { name: 'Start a bench session' }).count(), patient).toBe(1);

    // The form: design and revision, unit, instruments, drives; a hazardous drive needs the caution read.
    await tech.getByRole('form', { name: 'Start a bench session' }).getByLabel('Design', { exact: true }).selectOption({ label: designName });
    await expect.poll(() => tech.getByLabel('Design revision').locator('option', { hasText: 'latest' }).count(), patient).toBe(1);
    await tech.getByLabel('Unit serial number').fill(unitSerial);
    await tech.getByLabel('Fixture').fill('Rail fixture RF-48, isolated common-mode injection');
    await tech.getByLabel('Ambient temperature (°C)').fill('23.5');
    await tech.getByRole('checkbox', { name: new RegExp(instrumentName) }).check();
    await tech.getByLabel('Common-mode drive DC level (V)').fill('48');
    await tech.getByLabel('Common-mode drive AC amplitude (V)').fill('20');
    await expect.poll(() => tech.getByRole('checkbox', { name: 'I have read this caution' }).count(), patient).toBe(1);
    await tech.getByRole('button', { name: 'Start bench session' }).click();
    await expect.poll(() => tech.getByText(/hazardous live: confirm the safety caution/).count(), patient).toBeGreaterThan(0);
    await screenshot(tech, shots, '01-start-session-hazard-caution');
    await tech.getByRole('checkbox', { name: 'I have read this caution' }).check();
    await tech.getByRole('button', { name: 'Start bench session' }).click();
    await expect.poll(() => tech.getByRole('heading', { name: `Unit ${unitSerial}` }).count(), patient).toBe(1);
    await expect.poll(() => tech.locator('[data-live-status="live"]').count(), patient).toBe(1);
    const sessionId = new URL(tech.url()).pathname.split('/').pop()!;
    await screenshot(tech, shots, '02-session-started');

    // Upload through the mapping step: the guess reads units and peak from the header.
    await tech.getByLabel('Sweep file (CSV, semicolon or tab separated)').setInputFiles({
      name: 'hrb990-0001-diff.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(foreignDifferentialCsv()),
    });
    await expect.poll(() => tech.getByRole('group', { name: 'Which column is which' }).count(), patient).toBe(1);
    expect(await tech.getByLabel('Frequency unit').inputValue()).toBe('kHz');
    expect(await tech.getByLabel('Drive (vin) unit').inputValue()).toBe('mV');
    expect(await tech.getByLabel('Drive (vin) convention').inputValue()).toBe('peak');
    expect(await tech.getByLabel('Output (vout) column').inputValue()).toBe('Out (mV pk)');
    // A wrong unit choice is caught in the browser, naming the row and column.
    await tech.getByLabel('Frequency column').selectOption('Drive (mV pk)');
    await expect.poll(() => tech.getByText(/does not read as a sweep/).count(), patient).toBe(1);
    await screenshot(tech, shots, '03-mapping-error');
    await tech.getByLabel('Frequency column').selectOption('Freq (kHz)');
    await expect.poll(() => tech.getByText(`${differentialPointCount} previewed rows read as a sweep`, { exact: false }).count(), patient).toBe(1);
    await screenshot(tech, shots, '04-mapping-ready');
    await tech.getByRole('button', { name: 'Upload differential sweep' }).click();
    const differentialCount = tech.locator('tr[data-sweep-mode="differential"] [data-testid="sweep-point-count"]');
    await expect.poll(() => differentialCount.textContent(), patient).toBe(String(differentialPointCount));
    await expect.poll(() => tech.getByText('hrb990-0001-diff.csv added as a differential sweep', { exact: false }).count(), patient).toBe(1);
    await screenshot(tech, shots, '05-differential-uploaded');

    // A token from the Settings page, in a second tab so the session page stays open.
    const settings = await context.newPage();
    await settings.goto(`${app.url}/settings`);
    await settings.getByLabel('Token name').fill('Journey bench PC');
    await settings.getByRole('button', { name: 'Create token' }).click();
    const tokenText = settings.getByTestId('new-token');
    await expect.poll(() => tokenText.count(), patient).toBe(1);
    const token = (await tokenText.textContent())!.trim();
    expect(token).toMatch(/^rjt_/);
    expect(await settings.getByText("won't be shown again", { exact: false }).count()).toBe(1);
    await screenshot(settings, shots, '06-token-created');
    await settings.close();

    // Stream the common-mode sweep with the simulated instrument while the page is open.
    await tech.evaluate(() => ((window as unknown as { journeyMarker: string }).journeyMarker = 'not reloaded'));
    const streamed = runStreamClient(['--url', app.url, '--token', token, '--session', sessionId, '--mode', 'common-mode', '--simulate', '--points', String(commonModePointCount), '--rate', '200']);
    const commonModeCount = tech.locator('tr[data-sweep-mode="common-mode"] [data-testid="sweep-point-count"]');
    await expect.poll(() => commonModeCount.count(), patient).toBe(1);
    await screenshot(tech, shots, '07-common-mode-arriving');
    const { code, output } = await streamed;
    expect(code, output).toBe(0);
    await expect.poll(() => commonModeCount.textContent(), patient).toBe(String(commonModePointCount));
    await expect.poll(() => tech.getByText('Analysis complete').count(), patient).toBe(1);
    await expect.poll(() => tech.getByTestId('dc-cmrr').textContent(), patient).toMatch(/^\d+\.\d dB$/);
    expect(await tech.evaluate(() => (window as unknown as { journeyMarker?: string }).journeyMarker)).toBe('not reloaded');
    await screenshot(tech, shots, '08-analysis-complete-live');

    // The points table of the streamed sweep, from the server, sorted by frequency.
    await tech.getByRole('button', { name: /Show the points of the common-mode sweep/ }).click();
    await expect.poll(() => tech.getByRole('table', { name: /Points of the common-mode sweep/ }).locator('tbody tr').count(), patient).toBe(commonModePointCount);
    await screenshot(tech, shots, '09-common-mode-points');
    await context.close();
  });
});
