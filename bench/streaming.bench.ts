// Speed of live streaming (issue 4 targets), on loopback against a throwaway PostgreSQL cluster
// started here and the API server as a child process (`node --import tsx server/main.ts`):
//   (a) one stream's sustained acknowledged points/s (target ≥ 20,000/s);
//   (b) 20 concurrent streams together against plain batched INSERTs of the same rows into the same
//       table from this process with pg, measured in the same run (target ≥ 50 %);
//   (c) point-to-viewer latency, p95 ≤ 200 ms: the sender stamps each batch right after handing it
//       to its socket, the viewer (signed in with a browser session, subscribed to the session, in
//       this same process so one clock serves both) stamps each point on arrival.
// Run: node --import tsx bench/streaming.bench.ts
import { loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import WebSocket from 'ws';
import { streamSweep, type ReadingToStream } from '../cli/stream/stream-client';
import { ensureDatabase } from '../scripts/lib/postgres-cluster';
import { bridgeFrontEndCircuit } from '../server/demo/fictional-boards';
import { createScratchServer } from './lib/scratch-server';
import { simulateAmplifierSweep } from '../shared/engine/simulated-amplifier';

const root = fileURLToPath(new URL('..', import.meta.url));
const SINGLE_STREAM_POINTS = 200_000;
const SINGLE_STREAM_BATCHES = [1000, 2500, 5000];
const CONCURRENT_STREAMS = 20;
const POINTS_PER_CONCURRENT_STREAM = 20_000;
const CONCURRENT_BATCH = 2000;
/** Latency runs: a fast instrument in small batches, and a bench-paced one sending each point alone. */
const LATENCY_RUNS = [
  { rate: 2000, batch: 20, points: 10_000 },
  { rate: 200, batch: 1, points: 2000 },
];
const demoPassword = 'bench-demo';

const targets = { singlePointsPerSecond: 20_000, concurrentRatio: 0.5, latencyP95Ms: 200 };

function percentile(sorted: number[], fraction: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(fraction * sorted.length) - 1))];
}

function readings(count: number, seed: number): ReadingToStream[] {
  // The simulated instrument's readings of an invented demo amplifier (many points: a long sweep).
  return simulateAmplifierSweep({
    mode: 'differential',
    pointCount: count,
    startFrequencyHz: 1,
    stopFrequencyHz: 1e6,
    gain: 10,
    mismatchFraction: 0.001,
    opAmp: { openLoopGainDb: 120, gainBandwidthHz: 8e6, cmrrDb: 110, cmrrCornerHz: 2000 },
    noiseVolts: 1e-6,
    driveVolts: 1,
    seed,
  });
}

// ---- the cluster and the server --------------------------------------------------------------

const scratch = createScratchServer(root);

/** Signs in and returns a fetch that carries the session cookie and the Origin header. */
async function signIn(url: string, email: string): Promise<{ cookie: string; call: (method: string, route: string, body?: unknown) => Promise<Record<string, unknown>> }> {
  const response = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: JSON.stringify({ email, password: demoPassword }),
  });
  if (!response.ok) throw new Error(`sign-in as ${email} failed: ${response.status}`);
  const cookie = response.headers.getSetCookie().map((entry) => entry.split(';')[0]).join('; ');
  const call = async (method: string, route: string, body?: unknown) => {
    const answer = await fetch(`${url}${route}`, {
      method,
      headers: { 'content-type': 'application/json', origin: url, cookie },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const json = (await answer.json()) as Record<string, unknown>;
    if (!answer.ok) throw new Error(`${method} ${route} → ${answer.status} ${JSON.stringify(json)}`);
    return json;
  };
  return { cookie, call };
}

// ---- measurements ------------------------------------------------------------------------------

interface StreamTarget {
  url: string;
  token: string;
  sessionId: string;
}

async function oneStream(target: StreamTarget, key: string, points: ReadingToStream[], batchSize: number, onBatchSent?: (first: number, last: number) => void, rate: number | null = null) {
  const started = performance.now();
  const stream = streamSweep({
    url: target.url,
    token: target.token,
    sessionId: target.sessionId,
    mode: 'differential',
    key,
    sourceName: 'streaming bench',
    amplitudeConvention: 'rms',
    points,
    ratePointsPerSecond: rate,
    batchSize,
    onBatchSent,
  });
  const result = await stream.done;
  if (result.pointCount !== points.length) throw new Error(`stream ${key} closed with ${result.pointCount} of ${points.length} points`);
  return { seconds: (performance.now() - started) / 1000, result };
}

async function baselineInserts(databaseUrl: string, sweepIds: string[], points: ReadingToStream[], style: 'values' | 'unnest'): Promise<number> {
  // Same pool size as the server's (server/db.ts: 10), one writer per stream.
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 10 });
  const started = performance.now();
  await Promise.all(
    sweepIds.map(async (sweepId) => {
      for (let start = 0; start < points.length; start += CONCURRENT_BATCH) {
        const batch = points.slice(start, start + CONCURRENT_BATCH);
        if (style === 'values') {
          const parameters: unknown[] = [];
          const rows = batch.map((point, index) => {
            const offset = parameters.length;
            parameters.push(sweepId, start + index + 1, point.frequencyHz, point.vinV, point.voutV, point.phaseDeg ?? null, point.floorV ?? null);
            return `($${offset + 1}, $${offset + 2}, $${offset + 3}, $${offset + 4}, $${offset + 5}, $${offset + 6}, $${offset + 7})`;
          });
          await pool.query(`INSERT INTO sweep_points (sweep_id, sequence, frequency_hz, vin_v, vout_v, phase_deg, floor_v) VALUES ${rows.join(', ')}`, parameters);
        } else {
          await pool.query(
            `INSERT INTO sweep_points (sweep_id, sequence, frequency_hz, vin_v, vout_v, phase_deg, floor_v)
             SELECT $1, * FROM unnest($2::int[], $3::float8[], $4::float8[], $5::float8[], $6::float8[], $7::float8[])`,
            [
              sweepId,
              batch.map((_, index) => start + index + 1),
              batch.map((point) => point.frequencyHz),
              batch.map((point) => point.vinV),
              batch.map((point) => point.voutV),
              batch.map((point) => point.phaseDeg ?? null),
              batch.map((point) => point.floorV ?? null),
            ],
          );
        }
      }
    }),
  );
  const seconds = (performance.now() - started) / 1000;
  await pool.end();
  return (sweepIds.length * points.length) / seconds;
}

/** Empty sweeps for the baseline: copies of a streamed sweep's row under new ids and keys. */
async function baselineSweeps(databaseUrl: string, templateSweepId: string, count: number, label: string): Promise<string[]> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  const ids: string[] = [];
  for (let index = 0; index < count; index++) {
    const { rows } = await client.query(
      `INSERT INTO sweeps (id, bench_session_id, mode, source, source_name, client_key, amplitude_convention, state, created_by_id, created_at, updated_at)
       SELECT gen_random_uuid()::text, bench_session_id, mode, source, 'baseline', $2, amplitude_convention, 'complete', created_by_id, now(), now()
         FROM sweeps WHERE id = $1 RETURNING id`,
      [templateSweepId, `baseline-${label}-${index}`],
    );
    ids.push(rows[0].id as string);
  }
  await client.end();
  return ids;
}

async function latency(target: StreamTarget, cookie: string, run: (typeof LATENCY_RUNS)[number]): Promise<{ samples: number[]; seconds: number }> {
  const viewer = new WebSocket(`${target.url.replace('http', 'ws')}/ws`, { headers: { cookie, origin: target.url } });
  const arrivals = new Map<number, number>();
  let subscribed!: () => void;
  const ready = new Promise<void>((resolve) => (subscribed = resolve));
  viewer.on('message', (data) => {
    const now = performance.now();
    const message = JSON.parse(data.toString()) as { type: string; points?: { seq: number }[] };
    if (message.type === 'ready') viewer.send(JSON.stringify({ type: 'subscribe', sessionId: target.sessionId }));
    else if (message.type === 'subscribed') subscribed();
    else if (message.type === 'session-points') for (const point of message.points!) if (!arrivals.has(point.seq)) arrivals.set(point.seq, now);
  });
  await ready;
  const sentAt = new Float64Array(run.points + 1);
  const { seconds } = await oneStream(
    target,
    'latency',
    readings(run.points, 99),
    run.batch,
    (first, last) => {
      const now = performance.now();
      for (let seq = first; seq <= last; seq++) if (sentAt[seq] === 0) sentAt[seq] = now;
    },
    run.rate,
  );
  await new Promise((resolve) => setTimeout(resolve, 300));
  viewer.close();
  const samples: number[] = [];
  for (let seq = 1; seq <= run.points; seq++) {
    const arrived = arrivals.get(seq);
    if (arrived === undefined) throw new Error(`the viewer never received point ${seq}`);
    samples.push(arrived - sentAt[seq]);
  }
  return { samples: samples.sort((a, b) => a - b), seconds };
}

// ---- run -------------------------------------------------------------------------------------

try {
  const cluster = await scratch.startCluster();
  await ensureDatabase(cluster.url('postgres'), 'bench');
  const databaseUrl = cluster.url('bench');
  const url = await scratch.startServer(databaseUrl);

  const designer = await signIn(url, 'designer@rejectra.test');
  const design = (await designer.call('POST', '/api/designs', {
    name: 'Streaming bench board (demo)',
    description: 'Invented demo design of the Halden Ridge Instruments lab.',
    revision: {
      label: 'rev A',
      changeNote: '',
      circuit: bridgeFrontEndCircuit({ ohms: [10_000, 100_000], sourceOhms: [0, 0], opAmp: null }),
      limitMask: { points: [{ frequencyHz: 10, minimumCmrrDb: 60 }], guardBandDb: 0 },
    },
  })) as { design: { revisions: { id: string }[] } };
  const tech = await signIn(url, 'tech@rejectra.test');
  const newSession = async (unitSerial: string) =>
    ((await tech.call('POST', '/api/sessions', {
      designRevisionId: design.design.revisions[0].id,
      unitSerial,
      fixture: 'bench fixture',
      differentialDrive: { acVolts: 1, acConvention: 'rms' },
      commonModeDrive: { acVolts: 1, acConvention: 'rms' },
    })) as { session: { id: string } }).session.id;
  const token = ((await tech.call('POST', '/api/tokens', { name: 'bench' })) as { token: { token: string } }).token.token;

  process.stdout.write(`streaming bench — loopback, PostgreSQL ${cluster.port}, server child process; ${new Date().toISOString()}\n`);
  process.stdout.write(`load average before: ${loadavg().map((value) => value.toFixed(2)).join(' ')}\n\n`);

  // (a) one stream
  const single: { batch: number; pointsPerSecond: number }[] = [];
  const singlePoints = readings(SINGLE_STREAM_POINTS, 1);
  await oneStream({ url, token, sessionId: await newSession('WARMUP-0001') }, 'warm-up', singlePoints.slice(0, 20_000), 2000);
  for (const batch of SINGLE_STREAM_BATCHES) {
    const target = { url, token, sessionId: await newSession(`SINGLE-${batch}`) };
    const { seconds } = await oneStream(target, `single-${batch}`, singlePoints, batch);
    single.push({ batch, pointsPerSecond: SINGLE_STREAM_POINTS / seconds });
  }

  // (b) 20 concurrent streams against plain batched INSERTs
  const concurrentPoints = readings(POINTS_PER_CONCURRENT_STREAM, 2);
  const concurrentSession = await newSession('CONCURRENT-20');
  const concurrentStarted = performance.now();
  const streams = await Promise.all(
    Array.from({ length: CONCURRENT_STREAMS }, (_, index) => oneStream({ url, token, sessionId: concurrentSession }, `concurrent-${index}`, concurrentPoints, CONCURRENT_BATCH)),
  );
  const concurrentSeconds = (performance.now() - concurrentStarted) / 1000;
  const concurrentPointsPerSecond = (CONCURRENT_STREAMS * POINTS_PER_CONCURRENT_STREAM) / concurrentSeconds;
  const template = streams[0].result.sweepId;
  const baselineValues = await baselineInserts(databaseUrl, await baselineSweeps(databaseUrl, template, CONCURRENT_STREAMS, 'values'), concurrentPoints, 'values');
  const baselineUnnest = await baselineInserts(databaseUrl, await baselineSweeps(databaseUrl, template, CONCURRENT_STREAMS, 'unnest'), concurrentPoints, 'unnest');
  const baseline = Math.max(baselineValues, baselineUnnest);
  const ratio = concurrentPointsPerSecond / baseline;

  // (c) latency to a viewer
  const lead = await signIn(url, 'lead@rejectra.test');
  const latencies: { run: (typeof LATENCY_RUNS)[number]; p50: number; p95: number; p99: number; maximum: number; refitMs: number }[] = [];
  for (const [index, run] of LATENCY_RUNS.entries()) {
    const sessionId = await newSession(`LATENCY-${index + 1}`);
    const { samples } = await latency({ url, token, sessionId }, lead.cookie, run);
    // What one refit of that session costs the server (viewers get one at most every 250 ms while points arrive).
    const refitStarted = performance.now();
    await lead.call('GET', `/api/sessions/${sessionId}/analysis`);
    latencies.push({
      run,
      p50: percentile(samples, 0.5),
      p95: percentile(samples, 0.95),
      p99: percentile(samples, 0.99),
      maximum: samples[samples.length - 1],
      refitMs: performance.now() - refitStarted,
    });
  }

  const bestSingle = Math.max(...single.map((entry) => entry.pointsPerSecond));
  const rows: string[][] = [
    ['measurement', 'figure', 'target', 'ratio to target', 'verdict'],
    ...single.map((entry) => [
      `(a) one stream, ${SINGLE_STREAM_POINTS.toLocaleString('en')} points, batches of ${entry.batch}`,
      `${Math.round(entry.pointsPerSecond).toLocaleString('en')} points/s`,
      `≥ ${targets.singlePointsPerSecond.toLocaleString('en')}/s`,
      (entry.pointsPerSecond / targets.singlePointsPerSecond).toFixed(2),
      entry.pointsPerSecond >= targets.singlePointsPerSecond ? 'met' : 'MISSED',
    ]),
    [
      `(b) ${CONCURRENT_STREAMS} streams × ${POINTS_PER_CONCURRENT_STREAM.toLocaleString('en')} points, batches of ${CONCURRENT_BATCH}`,
      `${Math.round(concurrentPointsPerSecond).toLocaleString('en')} points/s`,
      '',
      '',
      '',
    ],
    [`    baseline: multi-row INSERT … VALUES, ${CONCURRENT_STREAMS} writers, pool of 10`, `${Math.round(baselineValues).toLocaleString('en')} points/s`, '', '', ''],
    [`    baseline: INSERT … SELECT unnest(arrays), same writers`, `${Math.round(baselineUnnest).toLocaleString('en')} points/s`, '', '', ''],
    [
      '    streams / faster baseline',
      `${(ratio * 100).toFixed(1)} %`,
      `≥ ${targets.concurrentRatio * 100} %`,
      (ratio / targets.concurrentRatio).toFixed(2),
      ratio >= targets.concurrentRatio ? 'met' : 'MISSED',
    ],
    ...latencies.flatMap(({ run, p50, p95, p99, maximum, refitMs }) => [
      [
        `(c) point → viewer, ${run.points.toLocaleString('en')} points at ${run.rate}/s in batches of ${run.batch}: p95`,
        `${p95.toFixed(1)} ms`,
        `≤ ${targets.latencyP95Ms} ms`,
        (targets.latencyP95Ms / p95).toFixed(1),
        p95 <= targets.latencyP95Ms ? 'met' : 'MISSED',
      ],
      ['    p50 / p99 / max', `${p50.toFixed(1)} / ${p99.toFixed(1)} / ${maximum.toFixed(1)} ms`, '', '', ''],
      [`    one refit of that session (GET …/analysis, ${run.points.toLocaleString('en')} points)`, `${refitMs.toFixed(1)} ms`, '', '', ''],
    ]),
  ];
  const widths = rows[0].map((_, column) => Math.max(...rows.map((row) => row[column].length)));
  process.stdout.write(`${rows.map((row) => row.map((cell, column) => (column === 0 ? cell.padEnd(widths[column]) : cell.padStart(widths[column]))).join('  ')).join('\n')}\n\n`);
  process.stdout.write(
    [
      `best single stream: ${Math.round(bestSingle).toLocaleString('en')} points/s acknowledged (open-sweep to sweep-closed, every point committed before its ack).`,
      'Latency runs from the moment the sender hands a batch to its socket to the moment the viewer parses the session-points',
      'message: it includes the hop to the server, validation, the committed INSERT, the hub fan-out and the hop to the viewer',
      '(all on loopback, both clients in this process, server and PostgreSQL in their own).',
      'Ratios for targets of "at least" are figure/target; for latency target/figure (above 1 means met).',
      `load average after: ${loadavg().map((value) => value.toFixed(2)).join(' ')} (other work on the machine stretches every figure).`,
    ].join('\n') + '\n',
  );
} finally {
  scratch.cleanUp();
}
