// `rejectra stream` as a child process: argument errors without a server, then streams into a
// whole server on its own database (startTestApp) from a sweep file and from the simulated instrument.
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort } from '../../scripts/lib/postgres-cluster';
import { bridgeFrontEndCircuit } from '../../server/demo/fictional-boards';
import { simulateAmplifierSweep } from '../../shared/engine/simulated-amplifier';
import { parseSweepCsv } from '../../shared/engine/sweep-file';
import { maximumPointsPerMessage as clientLimit } from '../../cli/stream/stream-client';
import { maximumPointsPerMessage } from '../../shared/schemas/stream';
import { runCli, type CliRun } from '../helpers/cli-runner';
import { startTestApp, type TestApp } from '../helpers/test-app';

const root = fileURLToPath(new URL('../..', import.meta.url));
const sampleSweep = path.join(root, 'sample-data', 'sweeps', 'hrb204-0007-common-mode.csv');
// Demo password from server/seed.ts.
const demoPassword = 'bench-demo';

function cli(args: string[], env: NodeJS.ProcessEnv = {}): Promise<CliRun> {
  return runCli('stream', args, { env: { REJECTRA_TOKEN: '', ...env } });
}

const fakeToken = 'rjt_notCheckedBecauseTheArgumentsAreRefusedFirst000000';
const valid = ['--url', 'http://127.0.0.1:9', '--token', fakeToken, '--session', 'S1', '--mode', 'differential'];

// Each case is a child process of its own; they run side by side to keep the file quick.
describe.concurrent('rejectra stream argument errors', () => {
  let folder: string;
  beforeAll(async () => {
    folder = await mkdtemp(path.join(os.tmpdir(), 'rejectra-stream-cli-'));
  });
  afterAll(async () => {
    await rm(folder, { recursive: true, force: true });
  });

  it.each([
    ['a missing --url', ['--token', fakeToken, '--session', 'S1', '--mode', 'differential', '--simulate'], /--url is required/],
    ['a missing token', ['--url', 'http://127.0.0.1:9', '--session', 'S1', '--mode', 'differential', '--simulate'], /--token is required .* or set REJECTRA_TOKEN/],
    ['an unknown mode', [...valid.slice(0, 6), '--mode', 'sideways', '--simulate'], /--mode must be differential or common-mode, got "sideways"/],
    ['neither --file nor --simulate', valid, /give --file SWEEP.csv to replay a sweep, or --simulate/],
    ['both --file and --simulate', [...valid, '--file', sampleSweep, '--simulate'], /either --file or --simulate, not both/],
    ['a simulation option with --file', [...valid, '--file', sampleSweep, '--seed', '3'], /--seed applies to --simulate only/],
    ['a rate of zero', [...valid, '--simulate', '--rate', '0'], /--rate must be a rate above 0 points per second, got "0"/],
    ['a batch above the protocol limit', [...valid, '--simulate', '--batch', '6000'], /--batch must be a whole number from 1 to 5000/],
    ['a stop frequency below the start', [...valid, '--simulate', '--start-hz', '1k', '--stop-hz', '100'], /--stop-hz \(100\) must be above --start-hz \(1000\)/],
    ['a mismatch of 100 %', [...valid, '--simulate', '--mismatch', '1'], /--mismatch must be a fraction between -1 and 1/],
    ['a missing file', [...valid, '--file', '/no/such/sweep.csv'], /cannot read --file \/no\/such\/sweep.csv: no such file/],
  ])('refuses %s with exit 2 and says what is wrong', async (_case, args, message) => {
    const run = await cli(args);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(message);
    expect(run.stdout).toBe('');
  });

  it("keeps the client's batch limit equal to the protocol's", () => {
    // The protocol's limit (docs/STREAMING.md: at most 5,000 points per message).
    expect(clientLimit).toBe(maximumPointsPerMessage);
  });

  it('reports a malformed sweep file with its row and column, exit 1', async () => {
    const file = path.join(folder, 'broken.csv');
    await writeFile(file, 'frequency_hz,vin_v,vout_v\n100,1,0.5\n1000,one,0.5\n');
    const run = await cli([...valid, '--file', file]);
    expect(run.status).toBe(1);
    // Row 3 is the second data line; "one" sits in the vin_v column (the file above).
    expect(run.stderr).toMatch(/broken\.csv, row 3, column "vin_v": parseSweepCsv: "one" is not a number/);
  });

  it('gives up on a server that cannot be reached, saying for how long and why, exit 1', async () => {
    const port = await freePort();
    const run = await cli(['--url', `http://127.0.0.1:${port}`, '--token', fakeToken, '--session', 'S1', '--mode', 'differential', '--simulate', '--retry-for', '1', '--json']);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/gave up after 1 s without a working connection to ws:\/\/127\.0\.0\.1:\d+\/ws: connection lost \(connect ECONNREFUSED/);
    expect(run.stdout).toBe('');
  });
});

interface StreamDocument {
  sweepId: string;
  sessionId: string;
  mode: string;
  key: string;
  pointsSent: number;
  pointsAcknowledged: number;
  pointCount: number;
  reconnects: number;
  seconds: number;
}

describe('rejectra stream against a server', () => {
  let app: TestApp;
  let token: string;
  let sessionId: string;
  let tech: ReturnType<typeof request.agent>;

  const storedPoints = async (sweepId: string) => {
    const page = await tech.get(`/api/sessions/${sessionId}/sweeps/${sweepId}/points?pageSize=200&sort=sequence`).expect(200);
    return page.body as { items?: { sequence: number; frequencyHz: number; voutV: number; floorV: number | null }[]; points?: unknown; total: number };
  };

  beforeAll(async () => {
    app = await startTestApp();
    const designer = request.agent(app.url).set('Origin', app.origin);
    await designer.post('/api/auth/sign-in').send({ email: 'designer@rejectra.test', password: demoPassword }).expect(200);
    // Invented demo design of the fictional lab.
    const design = await designer
      .post('/api/designs')
      .send({
        name: 'LC-Bridge front-end board HRB-204 (CLI test)',
        description: '',
        revision: {
          label: 'rev C',
          changeNote: '',
          circuit: bridgeFrontEndCircuit({ sourceOhms: [0, 0], opAmp: null }),
          limitMask: { points: [{ frequencyHz: 10, minimumCmrrDb: 66 }], guardBandDb: 0 },
        },
      })
      .expect(201);
    tech = request.agent(app.url).set('Origin', app.origin);
    await tech.post('/api/auth/sign-in').send({ email: 'tech@rejectra.test', password: demoPassword }).expect(200);
    const session = await tech
      .post('/api/sessions')
      .send({
        designRevisionId: design.body.design.revisions[0].id,
        unitSerial: 'HRB204-0007',
        fixture: 'Bench 2 shielded fixture',
        differentialDrive: { acVolts: 0.1, acConvention: 'rms' },
        commonModeDrive: { acVolts: 1, acConvention: 'rms' },
      })
      .expect(201);
    sessionId = session.body.session.id;
    token = (await tech.post('/api/tokens').send({ name: 'CLI test bench' }).expect(201)).body.token.token;
  });
  afterAll(async () => {
    await app?.close();
  });

  it('replays a sweep file, prints one JSON document, and stores the file point by point', async () => {
    const run = await cli(['--url', app.url, '--token', token, '--session', sessionId, '--mode', 'common-mode', '--file', sampleSweep, '--convention', 'peak', '--batch', '7', '--json']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const document = JSON.parse(run.stdout) as StreamDocument;
    const { readFileSync } = await import('node:fs');
    const sweep = parseSweepCsv(readFileSync(sampleSweep), { file: 'hrb204-0007-common-mode.csv' });
    const count = sweep.frequencyHz.length;
    expect(document).toMatchObject({ sessionId, mode: 'common-mode', pointsSent: count, pointsAcknowledged: count, pointCount: count, reconnects: 0 });
    expect(document.key).toMatch(/^file:hrb204-0007-common-mode\.csv:common-mode:[0-9a-f]{12}$/);
    expect(Object.keys(document).sort()).toEqual(['key', 'mode', 'pointCount', 'pointsAcknowledged', 'pointsSent', 'reconnects', 'seconds', 'sessionId', 'sweepId']);

    const sweeps = (await tech.get(`/api/sessions/${sessionId}/sweeps`).expect(200)).body.sweeps as { id: string; source: string; sourceName: string; state: string; amplitudeConvention?: string }[];
    expect(sweeps.find((entry) => entry.id === document.sweepId)).toMatchObject({ source: 'stream', sourceName: 'hrb204-0007-common-mode.csv', state: 'complete' });
    const stored = await storedPoints(document.sweepId);
    expect(stored.total).toBe(count);
    const rows = (stored.items ?? (stored.points as typeof stored.items))!;
    rows.forEach((row, index) => {
      expect(row.sequence).toBe(index + 1);
      // The file's own numbers, unchanged by the trip (JSON carries doubles exactly).
      expect(row.frequencyHz).toBe(sweep.frequencyHz[index]);
      expect(row.voutV).toBe(sweep.voutVolts[index]);
    });

    // The same command again resumes the same (finished) sweep and sends nothing.
    const again = await cli(['--url', app.url, '--token', token, '--session', sessionId, '--mode', 'common-mode', '--file', sampleSweep, '--convention', 'peak', '--json']);
    expect(again.status).toBe(0);
    expect(JSON.parse(again.stdout)).toMatchObject({ sweepId: document.sweepId, pointsSent: 0, pointsAcknowledged: count, pointCount: count });
  });

  it('runs the simulated instrument at a set rate and stores its readings', async () => {
    const args = ['--simulate', '--points', '60', '--start-hz', '10', '--stop-hz', '100k', '--gain', '10', '--mismatch', '0.0005', '--noise-v', '2e-6', '--seed', '5', '--rate', '300'];
    const run = await cli(['--url', app.url, '--session', sessionId, '--mode', 'differential', ...args, '--json'], { REJECTRA_TOKEN: token });
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const document = JSON.parse(run.stdout) as StreamDocument;
    expect(document).toMatchObject({ sessionId, mode: 'differential', pointsSent: 60, pointsAcknowledged: 60, pointCount: 60, reconnects: 0 });
    // 60 points at 300 points/s take at least 0.2 s by construction (the last one is produced at 60/300 s).
    expect(document.seconds).toBeGreaterThanOrEqual(0.2);
    // The readings are the engine's simulation with the CLI's defaults for what was not given.
    const expected = simulateAmplifierSweep({
      mode: 'differential',
      pointCount: 60,
      startFrequencyHz: 10,
      stopFrequencyHz: 100e3,
      gain: 10,
      mismatchFraction: 0.0005,
      opAmp: { openLoopGainDb: 120, gainBandwidthHz: 8e6, cmrrDb: 110, cmrrCornerHz: 2000 },
      noiseVolts: 2e-6,
      driveVolts: 1,
      seed: 5,
    });
    const stored = await storedPoints(document.sweepId);
    const rows = (stored.items ?? (stored.points as typeof stored.items))!;
    expect(rows.map((row) => row.voutV)).toEqual(expected.map((reading) => reading.voutV));
    expect(rows.every((row) => row.floorV === 2e-6)).toBe(true);
  });

  it('prints progress on stderr and an aligned summary without --json', async () => {
    const run = await cli(['--url', app.url, '--token', token, '--session', sessionId, '--mode', 'common-mode', '--simulate', '--points', '20', '--seed', '9']);
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^sweep\s{2,}\S+$/m);
    expect(run.stdout).toMatch(/^points acknowledged\s{2}20$/m);
    expect(run.stdout).toMatch(/^reconnects\s{2,}0$/m);
  });

  it('stops at once with the server\'s reason when the token is revoked, exit 1', async () => {
    const created = (await tech.post('/api/tokens').send({ name: 'lost laptop' }).expect(201)).body.token as { id: string; token: string };
    await tech.delete(`/api/tokens/${created.id}`).expect(200);
    const run = await cli(['--url', app.url, '--token', created.token, '--session', sessionId, '--mode', 'differential', '--simulate', '--json']);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/refused by the server \(4401, not authenticated\): The access token "lost laptop" was revoked/);
    expect(run.stdout).toBe('');
  });

  it('stops at once when the session does not exist, exit 1', async () => {
    const run = await cli(['--url', app.url, '--token', token, '--session', 'no-such-session', '--mode', 'differential', '--simulate']);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/refused by the server \(4404, not found\): No bench session no-such-session/);
  });

  it('stops at once when the session is archived, exit 1', async () => {
    const lead = request.agent(app.url).set('Origin', app.origin);
    await lead.post('/api/auth/sign-in').send({ email: 'lead@rejectra.test', password: demoPassword }).expect(200);
    const other = await tech
      .post('/api/sessions')
      .send({
        designRevisionId: (await tech.get(`/api/sessions/${sessionId}`).expect(200)).body.session.designRevision.id,
        unitSerial: 'HRB204-0008',
        fixture: 'Bench 2 shielded fixture',
        differentialDrive: { acVolts: 0.1, acConvention: 'rms' },
        commonModeDrive: { acVolts: 1, acConvention: 'rms' },
      })
      .expect(201);
    await lead.post(`/api/sessions/${other.body.session.id}/archive`).expect(200);
    const run = await cli(['--url', app.url, '--token', token, '--session', other.body.session.id, '--mode', 'differential', '--simulate']);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/refused by the server \(4403, not allowed\): This bench session is archived/);
  });
});
