// Speed of the session view's charts (issue 5 target): a session with 100,000 points renders its
// charts in ≤ 300 ms after its analysis reaches the page, in headless Chromium on this machine.
// A throwaway PostgreSQL cluster and the API server (a child process serving a fresh production
// build of the client; bench/lib/scratch-server.ts) hold a session with a differential and a
// common-mode sweep of 100,000 points each, written directly with the server's own operation.
// The page marks `analysis-data-arrived` (TanStack Query's dataUpdatedAt of the analysis, after
// the JSON is parsed) and `charts-drawn` (after uPlot's draw hook of both charts) and measures
// `session-charts` between them; this reads it. The server's analysis of the 100,000 points comes
// before data arrival (the first time; later opens read the kept analysis): printed, not the target.
// Run: node --import tsx bench/session-chart.bench.ts [--client-dir dist/client]
import { loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { simulatedSweepRows } from '../tests/helpers/bench-fixtures';
import { launchBrowser } from '../tests/helpers/browser';
import { ensureDatabase } from '../scripts/lib/postgres-cluster';
import { openDatabase } from '../server/db';
import { initializeModels, User } from '../server/models';
import { addCompleteSweeps } from '../server/operations/bench-sessions';
import { createScratchServer } from './lib/scratch-server';

const root = fileURLToPath(new URL('..', import.meta.url));
const POINTS_PER_SWEEP = 100_000;
const MEASURED_LOADS = 5;
const TARGET_MS = 300;
const demoPassword = 'bench-demo';
const { values: options } = parseArgs({ options: { 'client-dir': { type: 'string' } } });
const scratch = createScratchServer(root);

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
};

async function signIn(url: string, email: string) {
  const response = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: JSON.stringify({ email, password: demoPassword }),
  });
  if (!response.ok) throw new Error(`sign-in as ${email} failed: ${response.status}`);
  const cookie = response.headers.getSetCookie().map((entry) => entry.split(';')[0]).join('; ');
  return (method: string, route: string, body?: unknown) =>
    fetch(`${url}${route}`, { method, headers: { 'content-type': 'application/json', origin: url, cookie }, body: body === undefined ? undefined : JSON.stringify(body) });
}

/** The simulated instrument's readings of an invented demo amplifier, 100,000 log-spaced frequencies. */
const sweepPoints = (mode: 'differential' | 'common-mode') => simulatedSweepRows(mode, POINTS_PER_SWEEP, mode === 'differential' ? 11 : 12);

async function main(): Promise<void> {
  const started = performance.now();
  const clientDir = scratch.buildClient(options['client-dir']);
  const cluster = await scratch.startCluster();
  await ensureDatabase(cluster.url('postgres'), 'rejectra_bench');
  const databaseUrl = cluster.url('rejectra_bench');
  const url = await scratch.startServer(databaseUrl, { env: { CLIENT_DIR: clientDir, AUTH_RATE_LIMIT: '100000' } });
  // The points go in through this process's own connection, with the server's operation.
  const database = openDatabase(databaseUrl);
  initializeModels(database.sequelize);
  const sequelize = database.sequelize;

  const designer = await signIn(url, 'designer@rejectra.test');
  const technician = await signIn(url, 'tech@rejectra.test');
  const designs = (await (await designer('GET', '/api/designs')).json()) as { designs: { name: string; latestRevision: { id: string } }[] };
  const design = designs.designs.find((candidate) => candidate.name.includes('HRB-204')) ?? designs.designs[0];
  const created = await technician('POST', '/api/sessions', {
    designRevisionId: design.latestRevision.id,
    unitSerial: 'HRB204-9100',
    fixture: 'Bridge fixture BF-2',
    ambientTemperatureC: 23,
    differentialDrive: { acVolts: 0.1, acConvention: 'rms', dcVolts: 0 },
    commonModeDrive: { acVolts: 1, acConvention: 'rms', dcVolts: 0 },
  });
  if (created.status !== 201) throw new Error(`creating the session failed: ${created.status} ${await created.text()}`);
  const sessionId = ((await created.json()) as { session: { id: string } }).session.id;
  const tech = await User.findOne({ where: { email: 'tech@rejectra.test' } });
  const insertStarted = performance.now();
  await addCompleteSweeps(sequelize, {
    sessionId,
    sweeps: [
      { mode: 'differential', source: 'upload', sourceName: 'bench-100k-differential.csv', points: sweepPoints('differential') },
      { mode: 'common-mode', source: 'upload', sourceName: 'bench-100k-common-mode.csv', points: sweepPoints('common-mode') },
    ],
    createdBy: { id: tech!.id },
  });
  console.log(`session chart bench: ${(2 * POINTS_PER_SWEEP).toLocaleString('en')} points stored in ${((performance.now() - insertStarted) / 1000).toFixed(1)} s (set-up ${((performance.now() - started) / 1000).toFixed(1)} s), load ${loadavg()[0].toFixed(2)}`);

  await database.close();

  // The server's side, before data arrival: the analysis as the page asks for it (thinned to four
  // points per pixel column of a 1440 px screen's charts), first fitted, then read again while kept.
  const serverTimes: number[] = [];
  let pointCount = 0;
  let thinnedCount = 0;
  for (let run = 0; run < 2; run++) {
    const before = performance.now();
    const response = await designer('GET', `/api/sessions/${sessionId}/analysis?maxPoints=2816`);
    const body = (await response.json()) as { analysis: { points: unknown[]; thinnedFrom?: number } };
    serverTimes.push(performance.now() - before);
    pointCount = body.analysis.thinnedFrom ?? body.analysis.points.length;
    thinnedCount = body.analysis.points.length;
  }
  console.log(
    `server: GET /analysis of ${pointCount.toLocaleString('en')} CMRR points (sent thinned to ${thinnedCount.toLocaleString('en')}) took ${(serverTimes[0] / 1000).toFixed(2)} s to fit, ${(serverTimes[1] / 1000).toFixed(2)} s once kept — before data arrival, not part of the target`,
  );

  const browser = await launchBrowser();
  try {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    await page.goto(`${url}/sign-in`);
    await page.getByLabel('E-mail').fill('designer@rejectra.test');
    await page.getByLabel('Password').fill(demoPassword);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((address) => !address.pathname.startsWith('/sign-in'));
    const loads: { renderMs: number; pageMs: number }[] = [];
    for (let load = 0; load <= MEASURED_LOADS; load++) {
      const before = performance.now();
      await page.goto(`${url}/sessions/${sessionId}`);
      await page.waitForFunction(() => performance.getEntriesByName('session-charts').length > 0, undefined, { timeout: 120_000, polling: 50 });
      const renderMs = await page.evaluate(() => performance.getEntriesByName('session-charts').at(-1)!.duration);
      loads.push({ renderMs, pageMs: performance.now() - before });
      console.log(`  load ${load}${load === 0 ? ' (first, chunks not cached; not counted)' : ''}: charts drawn ${renderMs.toFixed(0)} ms after the analysis arrived; page opened to charts drawn ${(loads[load].pageMs / 1000).toFixed(2)} s`);
    }
    const kept = await page.evaluate(() => document.body.innerText.match(/Drawn from ([\d,]+) of ([\d,]+) points/)?.slice(1) ?? null);
    if (kept) console.log(`  decimation: drawn from ${kept[0]} of ${kept[1]} points (per pixel column: first, last, lowest, highest, failing)`);
    const renderMedian = median(loads.slice(1).map((entry) => entry.renderMs));
    console.log(
      `session charts, ${(2 * POINTS_PER_SWEEP).toLocaleString('en')} points (${pointCount.toLocaleString('en')} CMRR points): median ${renderMedian.toFixed(0)} ms over ${MEASURED_LOADS} loads (min ${Math.min(...loads.slice(1).map((entry) => entry.renderMs)).toFixed(0)}, max ${Math.max(...loads.slice(1).map((entry) => entry.renderMs)).toFixed(0)}); target ≤ ${TARGET_MS} ms; ratio ${(renderMedian / TARGET_MS).toFixed(2)} of the target — ${renderMedian <= TARGET_MS ? 'met' : 'NOT met'}`,
    );
  } finally {
    await browser.close();
  }
}

main()
  .then(() => scratch.cleanUp())
  .catch((error) => {
    console.error(error);
    scratch.cleanUp();
    process.exit(1);
  });
