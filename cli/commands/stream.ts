// `rejectra stream --url URL --token rjt_… --session ID --mode differential|common-mode
// (--file SWEEP.csv | --simulate …) [--rate N] [--batch N] [--key KEY] [--json]`: the bench client.
// Streams a sweep to a bench session over the live protocol (docs/STREAMING.md), replaying a sweep
// file at a chosen pace or running the simulated instrument; reconnects and resumes on a dropped
// connection, and exits 0 once the server has acknowledged every point and closed the sweep.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { OpAmpModel } from '../../shared/engine/difference-amplifier';
import { EngineInputError } from '../../shared/engine/errors';
import { simulateAmplifierSweep, type SimulatedAmplifierOptions } from '../../shared/engine/simulated-amplifier';
import { parseSweepCsv } from '../../shared/engine/sweep-file';
import { parseCommandArgs } from '../parse-command-args';
import { maximumPointsPerMessage, StreamRefusedError, streamSweep, type ReadingToStream, type StreamProgress } from '../stream/stream-client';

const usage = `usage: rejectra stream --url http://HOST:PORT --token rjt_… --session SESSION_ID
         --mode differential|common-mode (--file SWEEP.csv | --simulate [options])
         [--key KEY] [--rate POINTS_PER_SECOND] [--batch N] [--convention rms|peak]
         [--retry-for SECONDS] [--json]
  The token may also come from the environment variable REJECTRA_TOKEN.
  --file replays a sweep file (frequency_hz, vin_v, vout_v[, phase_deg, floor_v]) point by point.
  --simulate runs the simulated instrument, a fictional four-resistor difference amplifier:
    --points N (41)  --start-hz F (10)  --stop-hz F (100k)  --gain G (10)  --mismatch FRACTION (0.001)
    --opamp-cmrr-db DB (110)  --opamp-cmrr-corner-hz HZ (2000)  --gbw-hz HZ (8M)
    --open-loop-gain-db DB (120)  --noise-v V (1e-6)  --drive-v V (1)  --seed S (1)
  --rate paces the points as an instrument would (default: as fast as the server acknowledges);
  --batch sets points per message (default a tenth of a second's worth at --rate, else 1000).
  --key names the sweep within the session (default derived from the file or the simulation), so
  running the same command again resumes the same sweep. Numbers may end in k, M or G.
`;

const simulationOptions = [
  'points',
  'start-hz',
  'stop-hz',
  'gain',
  'mismatch',
  'opamp-cmrr-db',
  'opamp-cmrr-corner-hz',
  'gbw-hz',
  'open-loop-gain-db',
  'noise-v',
  'drive-v',
  'seed',
] as const;

class ArgumentError extends Error {}

const decimalNumber = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)([kMG]?)$/;
const multipliers: Record<string, number> = { '': 1, k: 1e3, M: 1e6, G: 1e9 };

function numberOption(name: string, text: string | undefined, fallback: number, check: (value: number) => boolean, requirement: string): number {
  if (text === undefined) return fallback;
  const match = decimalNumber.exec(text.trim());
  const value = match ? Number(match[1]) * multipliers[match[2]] : Number.NaN;
  if (!Number.isFinite(value) || !check(value)) throw new ArgumentError(`--${name} must be ${requirement}, got "${text}"`);
  return value;
}

function shortHash(text: string | Buffer): string {
  return createHash('sha256').update(text).digest('hex').slice(0, 12);
}

interface Source {
  points: ReadingToStream[];
  key: string;
  sourceName: string;
  amplitudeConvention: 'rms' | 'peak';
}

function fileSource(file: string, mode: string, convention: 'rms' | 'peak'): Source {
  let bytes: Buffer;
  try {
    bytes = readFileSync(file);
  } catch (error) {
    throw new ArgumentError(`cannot read --file ${file}: ${(error as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : (error as Error).message}`);
  }
  const name = path.basename(file);
  const sweep = parseSweepCsv(bytes, { file: name });
  const points: ReadingToStream[] = Array.from(sweep.frequencyHz, (frequencyHz, index) => ({
    frequencyHz,
    vinV: sweep.vinVolts[index],
    voutV: sweep.voutVolts[index],
    phaseDeg: sweep.phaseDeg ? sweep.phaseDeg[index] : null,
    floorV: sweep.floorVolts ? sweep.floorVolts[index] : null,
  }));
  // The content hash keeps a changed file from resuming (and mixing into) an earlier sweep.
  return { points, key: `file:${name.slice(0, 80)}:${mode}:${shortHash(bytes)}`, sourceName: name, amplitudeConvention: convention };
}

function simulatedSource(values: Record<string, string | boolean | undefined>, mode: 'differential' | 'common-mode'): Source {
  const text = (name: string) => values[name] as string | undefined;
  const positive = (value: number) => value > 0;
  const opAmp: OpAmpModel = {
    openLoopGainDb: numberOption('open-loop-gain-db', text('open-loop-gain-db'), 120, positive, 'a gain above 0 dB'),
    gainBandwidthHz: numberOption('gbw-hz', text('gbw-hz'), 8e6, positive, 'a frequency above 0 Hz'),
    cmrrDb: numberOption('opamp-cmrr-db', text('opamp-cmrr-db'), 110, () => true, 'a level in dB'),
    cmrrCornerHz: numberOption('opamp-cmrr-corner-hz', text('opamp-cmrr-corner-hz'), 2000, positive, 'a frequency above 0 Hz'),
  };
  const options: SimulatedAmplifierOptions = {
    mode,
    pointCount: numberOption('points', text('points'), 41, (value) => Number.isInteger(value) && value >= 2 && value <= 10_000_000, 'a whole number from 2 to 10,000,000'),
    startFrequencyHz: numberOption('start-hz', text('start-hz'), 10, positive, 'a frequency above 0 Hz'),
    stopFrequencyHz: numberOption('stop-hz', text('stop-hz'), 100e3, positive, 'a frequency above 0 Hz'),
    gain: numberOption('gain', text('gain'), 10, positive, 'a gain above 0'),
    mismatchFraction: numberOption('mismatch', text('mismatch'), 0.001, (value) => Math.abs(value) < 1, 'a fraction between -1 and 1 (0.001 = 0.1 %)'),
    opAmp,
    noiseVolts: numberOption('noise-v', text('noise-v'), 1e-6, (value) => value >= 0, 'at least 0 V'),
    driveVolts: numberOption('drive-v', text('drive-v'), 1, positive, 'above 0 V'),
    seed: numberOption('seed', text('seed'), 1, (value) => Number.isSafeInteger(value) && value >= 0, 'a whole number of at least 0'),
  };
  if (options.stopFrequencyHz <= options.startFrequencyHz) {
    throw new ArgumentError(`--stop-hz (${options.stopFrequencyHz}) must be above --start-hz (${options.startFrequencyHz})`);
  }
  const points = simulateAmplifierSweep(options);
  return {
    points,
    key: `simulated:${mode}:seed-${options.seed}:${shortHash(JSON.stringify(options))}`,
    sourceName: `simulated instrument (gain ${options.gain}, mismatch ${options.mismatchFraction}, seed ${options.seed})`,
    amplitudeConvention: 'rms',
  };
}

function progressLine(progress: StreamProgress): string {
  const rate = progress.seconds > 0 ? Math.round(progress.pointsAcknowledged / progress.seconds) : 0;
  const reconnects = progress.reconnects > 0 ? `, ${progress.reconnects} reconnect${progress.reconnects === 1 ? '' : 's'}` : '';
  return `sent ${progress.pointsSent}, acknowledged ${progress.pointsAcknowledged} of ${progress.total} (${rate} points/s${reconnects})`;
}

export async function run(args: string[]): Promise<number> {
  const parsed = parseCommandArgs('stream', usage, {
    args,
    allowPositionals: false,
    options: {
      url: { type: 'string' },
      token: { type: 'string' },
      session: { type: 'string' },
      mode: { type: 'string' },
      key: { type: 'string' },
      file: { type: 'string' },
      simulate: { type: 'boolean', default: false },
      rate: { type: 'string' },
      batch: { type: 'string' },
      convention: { type: 'string' },
      'retry-for': { type: 'string' },
      json: { type: 'boolean', default: false },
      help: { type: 'boolean', short: 'h' },
      ...Object.fromEntries(simulationOptions.map((name) => [name, { type: 'string' as const }])),
    },
  });
  if (typeof parsed === 'number') return parsed;
  const values: Record<string, string | boolean | undefined> = parsed.values;

  let source: Source;
  let settings: { url: string; token: string; sessionId: string; mode: 'differential' | 'common-mode'; rate: number | null; batch: number; retryForMs: number };
  try {
    const url = values.url as string | undefined;
    if (!url) throw new ArgumentError('--url is required (the server address, e.g. http://127.0.0.1:5480)');
    try {
      const parsed = new URL(url);
      if (!['http:', 'https:', 'ws:', 'wss:'].includes(parsed.protocol)) throw new Error();
    } catch {
      throw new ArgumentError(`--url must be an http(s) address such as http://127.0.0.1:5480, got "${url}"`);
    }
    const token = (values.token as string | undefined) ?? process.env.REJECTRA_TOKEN;
    if (!token) throw new ArgumentError('--token is required (a personal access token rjt_… from the Settings page), or set REJECTRA_TOKEN');
    if (!token.startsWith('rjt_')) throw new ArgumentError('--token must be a personal access token starting with rjt_');
    const sessionId = values.session as string | undefined;
    if (!sessionId) throw new ArgumentError('--session is required (the bench session id)');
    const mode = values.mode as string | undefined;
    if (mode !== 'differential' && mode !== 'common-mode') {
      throw new ArgumentError(`--mode must be differential or common-mode, got ${mode === undefined ? 'nothing' : `"${mode}"`}`);
    }
    const file = values.file as string | undefined;
    if (file !== undefined && values.simulate) throw new ArgumentError('give either --file or --simulate, not both');
    if (file === undefined && !values.simulate) throw new ArgumentError('give --file SWEEP.csv to replay a sweep, or --simulate to run the simulated instrument');
    if (file !== undefined) {
      const stray = simulationOptions.find((name) => values[name] !== undefined);
      if (stray) throw new ArgumentError(`--${stray} applies to --simulate only`);
    } else if (values.convention !== undefined) {
      throw new ArgumentError('--convention applies to --file only (the simulated instrument reads RMS)');
    }
    const convention = (values.convention as string | undefined) ?? 'rms';
    if (convention !== 'rms' && convention !== 'peak') throw new ArgumentError(`--convention must be rms or peak, got "${convention}"`);
    const rate = values.rate === undefined ? null : numberOption('rate', values.rate as string, 0, (value) => value > 0, 'a rate above 0 points per second');
    const batch = numberOption(
      'batch',
      values.batch as string | undefined,
      rate === null ? 1000 : Math.min(maximumPointsPerMessage, Math.max(1, Math.round(rate / 10))),
      (value) => Number.isInteger(value) && value >= 1 && value <= maximumPointsPerMessage,
      `a whole number from 1 to ${maximumPointsPerMessage}`,
    );
    const retryForMs = 1000 * numberOption('retry-for', values['retry-for'] as string | undefined, 60, (value) => value > 0, 'a number of seconds above 0');
    source = file !== undefined ? fileSource(file, mode, convention) : simulatedSource(values, mode);
    const key = (values.key as string | undefined) ?? source.key;
    if (key.length === 0 || key.length > 120) throw new ArgumentError(`--key must have 1 to 120 characters, got ${key.length}`);
    source.key = key;
    settings = { url, token, sessionId, mode, rate, batch, retryForMs };
  } catch (error) {
    if (error instanceof ArgumentError) {
      process.stderr.write(`rejectra stream: ${error.message}\n`);
      return 2;
    }
    if (error instanceof EngineInputError) {
      process.stderr.write(`rejectra stream: ${error.message}\n`);
      return 1;
    }
    throw error;
  }

  const json = values.json === true;
  const interactive = !json && process.stderr.isTTY === true;
  const stream = streamSweep({
    url: settings.url,
    token: settings.token,
    sessionId: settings.sessionId,
    mode: settings.mode,
    key: source.key,
    sourceName: source.sourceName,
    amplitudeConvention: source.amplitudeConvention,
    points: source.points,
    ratePointsPerSecond: settings.rate,
    batchSize: settings.batch,
    retryForMs: settings.retryForMs,
    onNotice: (text) => process.stderr.write(`${interactive ? '\r\x1b[K' : ''}rejectra stream: ${text}\n`),
  });
  const ticker = json
    ? null
    : setInterval(
        () => process.stderr.write(interactive ? `\r\x1b[K${progressLine(stream.progress())}` : `${progressLine(stream.progress())}\n`),
        interactive ? 250 : 2000,
      );
  const interrupt = () => {
    const progress = stream.progress();
    process.stderr.write(`\nrejectra stream: interrupted; ${progress.pointsAcknowledged} of ${progress.total} points are stored. Run the same command again to resume.\n`);
    process.exit(130);
  };
  process.once('SIGINT', interrupt);

  try {
    const result = await stream.done;
    if (ticker) clearInterval(ticker);
    if (json) {
      const document = {
        sweepId: result.sweepId,
        sessionId: result.sessionId,
        mode: result.mode,
        key: source.key,
        pointsSent: result.pointsSent,
        pointsAcknowledged: result.pointsAcknowledged,
        pointCount: result.pointCount,
        reconnects: result.reconnects,
        seconds: Number(result.seconds.toFixed(3)),
      };
      process.stdout.write(`${JSON.stringify(document, null, 2)}\n`);
    } else {
      if (interactive) process.stderr.write('\r\x1b[K');
      const rows: [string, string][] = [
        ['sweep', result.sweepId],
        ['session', result.sessionId],
        ['mode', result.mode],
        ['key', source.key],
        ['points sent', String(result.pointsSent)],
        ['points acknowledged', String(result.pointsAcknowledged)],
        ['points in the sweep', String(result.pointCount)],
        ['reconnects', String(result.reconnects)],
        ['seconds', result.seconds.toFixed(2)],
        ['points/s', result.seconds > 0 ? String(Math.round(result.pointsAcknowledged / result.seconds)) : '—'],
      ];
      const width = Math.max(...rows.map(([label]) => label.length));
      process.stdout.write(`${rows.map(([label, value]) => `${label.padEnd(width)}  ${value}`).join('\n')}\n`);
    }
    return 0;
  } catch (error) {
    if (ticker) clearInterval(ticker);
    const progress = stream.progress();
    const message = error instanceof StreamRefusedError || error instanceof Error ? error.message : String(error);
    process.stderr.write(
      `${interactive ? '\r\x1b[K' : ''}rejectra stream: ${message}\n` +
        (progress.pointsAcknowledged > 0 ? `rejectra stream: ${progress.pointsAcknowledged} of ${progress.total} points are stored; the same command resumes the sweep\n` : ''),
    );
    return 1;
  } finally {
    process.off('SIGINT', interrupt);
  }
}
