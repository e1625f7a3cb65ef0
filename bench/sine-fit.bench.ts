// Speed of the capture sine fits, side by side with numpy/scipy in the same run.
//   node --import tsx bench/sine-fit.bench.ts
// Targets (issue 3): three-parameter sine fit ≥ 150 M samples/s on one core; a 1,000,000-frame
// stereo float WAV read and fitted (frequency given and not given) in ≤ 50 ms.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { parseCaptureWav } from '../shared/engine/capture-file';
import { fitCapture } from '../shared/engine/capture-fit';
import { fitSineFourParameter, fitSineThreeParameter } from '../shared/engine/sine-fit';

const SAMPLES = 1_000_000;
const SAMPLE_RATE_HZ = 48_000;
const FREQUENCY_HZ = 1000.37;
const THREE_PARAMETER_TARGET = 150e6;
const WAV_TARGET_MS = 50;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

/**
 * Best and median wall time (ms) of `runs` calls after `warmup` unmeasured ones, plus the first
 * call's time. The best run is the figure compared with targets and with numpy (as Python's
 * timeit advises: slower runs mostly measure other processes); the median is printed beside it.
 */
interface Timing {
  medianMs: number;
  bestMs: number;
  /** Median CPU time of this process per call (user + system), less sensitive to other load. */
  cpuMs: number;
  firstMs: number;
}

function time(action: () => unknown, runs: number, warmup = 3): Timing {
  let start = performance.now();
  action();
  const firstMs = performance.now() - start;
  for (let k = 1; k < warmup; k++) action();
  const times: number[] = [];
  const cpuTimes: number[] = [];
  for (let k = 0; k < runs; k++) {
    const cpu = process.cpuUsage();
    start = performance.now();
    action();
    times.push(performance.now() - start);
    const used = process.cpuUsage(cpu);
    cpuTimes.push((used.user + used.system) / 1000);
  }
  return { medianMs: median(times), bestMs: Math.min(...times), cpuMs: median(cpuTimes), firstMs };
}

function record(harmonic: number, noiseRms: number, seed: number): Float64Array {
  const rng = xoroshiro128plus(seed);
  return Float64Array.from({ length: SAMPLES }, (_, n) => {
    const angle = (2 * Math.PI * FREQUENCY_HZ * n) / SAMPLE_RATE_HZ + 0.4;
    return 0.8 * Math.cos(angle) + 0.25 + harmonic * Math.cos(3 * angle) + noiseRms * (uniformFloat64(rng) - 0.5);
  });
}

function stereoFloatWav(left: Float32Array, right: Float32Array): Uint8Array {
  const dataLength = left.length * 8;
  const bytes = new Uint8Array(44 + dataLength);
  const view = new DataView(bytes.buffer);
  const ascii = (offset: number, text: string): void => text.split('').forEach((ch, k) => (bytes[offset + k] = ch.charCodeAt(0)));
  ascii(0, 'RIFF');
  view.setUint32(4, 36 + dataLength, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  view.setUint32(16, 16, true);
  view.setUint16(20, 3, true);
  view.setUint16(22, 2, true);
  view.setUint32(24, SAMPLE_RATE_HZ, true);
  view.setUint32(28, SAMPLE_RATE_HZ * 8, true);
  view.setUint16(32, 8, true);
  view.setUint16(34, 32, true);
  ascii(36, 'data');
  view.setUint32(40, dataLength, true);
  const interleaved = new Float32Array(bytes.buffer, 44, left.length * 2);
  for (let frame = 0; frame < left.length; frame++) {
    interleaved[2 * frame] = left[frame];
    interleaved[2 * frame + 1] = right[frame];
  }
  return bytes;
}

// numpy/scipy side: the same sizes, timed the same way (median after warm-up).
const PYTHON = `
import sys, json, time
import numpy as np
from scipy.io import wavfile
from scipy.optimize import least_squares
d = json.load(sys.stdin)
n, fs, f = d['samples'], d['sampleRateHz'], d['frequencyHz']
rng = np.random.default_rng(1)
t = np.arange(n) / fs
y = 0.8 * np.cos(2 * np.pi * f * t + 0.4) + 0.25 + 0.01 * np.cos(3 * (2 * np.pi * f * t + 0.4)) + 1e-3 * (rng.random(n) - 0.5)

def timed(action, runs, warmup=2):
    for _ in range(warmup):
        action()
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        action()
        times.append((time.perf_counter() - start) * 1000)
    return float(np.min(times))

def normal_equations(samples):
    # Vectorised three-parameter fit: design matrix, normal equations, 3x3 solve, residual.
    w = 2 * np.pi * f * t
    X = np.column_stack([np.cos(w), np.sin(w), np.ones(n)])
    beta = np.linalg.solve(X.T @ X, X.T @ samples)
    r = samples - X @ beta
    return beta, np.sqrt(np.mean(r * r))

def three(samples, tt, freq):
    w = 2 * np.pi * freq * tt
    X = np.column_stack([np.cos(w), np.sin(w), np.ones(tt.size)])
    beta = np.linalg.solve(X.T @ X, X.T @ samples)
    return beta

def read_and_fit_given():
    rate, data = wavfile.read(d['wavPath'])
    x, z = data[:, 0].astype(np.float64), data[:, 1].astype(np.float64)
    tt = np.arange(x.size) / rate
    return three(x, tt, f), three(z, tt, f)

def read_and_fit_estimated():
    rate, data = wavfile.read(d['wavPath'])
    x, z = data[:, 0].astype(np.float64), data[:, 1].astype(np.float64)
    tt = np.arange(x.size) / rate
    seg = x[:16384]
    win = np.hanning(seg.size)
    p = np.abs(np.fft.rfft(win * (seg - np.sum(win * seg) / np.sum(win)), 32768)) ** 2
    k = 2 + int(np.argmax(p[2:-1]))
    a, b, c = np.log(p[k - 1]), np.log(p[k]), np.log(p[k + 1])
    f0 = (k + 0.5 * (a - c) / (a - 2 * b + c)) * rate / 32768
    tc = tt - tt.mean()
    b0 = three(x, tc, f0)
    def res(q):
        return q[0] * np.cos(q[3] * tc) + q[1] * np.sin(q[3] * tc) + q[2] - x
    def jac(q):
        cc, ss = np.cos(q[3] * tc), np.sin(q[3] * tc)
        return np.column_stack([cc, ss, np.ones(tc.size), tc * (q[1] * cc - q[0] * ss)])
    sol = least_squares(res, [b0[0], b0[1], b0[2], 2 * np.pi * f0], jac=jac, method='lm', x_scale='jac')
    freq = sol.x[3] / (2 * np.pi)
    return three(x, tt, freq), three(z, tt, freq)

out = {
    'threeParameterMs': timed(lambda: normal_equations(y), 5),
    'lstsqMs': timed(lambda: np.linalg.lstsq(np.column_stack([np.cos(2*np.pi*f*t), np.sin(2*np.pi*f*t), np.ones(n)]), y, rcond=None), 3),
    'wavGivenMs': timed(read_and_fit_given, 5),
    'wavEstimatedMs': timed(read_and_fit_estimated, 3, 1),
}
print(json.dumps(out))
`;

function runNumpy(wavPath: string): Record<string, number> | null {
  const env = { ...process.env };
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  try {
    const output = execFileSync('python3', ['-c', PYTHON], {
      input: JSON.stringify({ samples: SAMPLES, sampleRateHz: SAMPLE_RATE_HZ, frequencyHz: FREQUENCY_HZ, wavPath }),
      env,
      maxBuffer: 16 * 1024 * 1024,
    });
    return JSON.parse(output.toString('utf8'));
  } catch (error) {
    process.stdout.write(`numpy side skipped: ${(error as Error).message.split('\n')[0]}\n`);
    return null;
  }
}

function line(label: string, value: string, reference?: string, ratio?: string): void {
  process.stdout.write(`${label.padEnd(54)}${value.padStart(22)}${(reference ?? '').padStart(14)}${(ratio ?? '').padStart(9)}\n`);
}

function main(): number {
  const moderate = record(0.01, 1e-3, 1); // residual 1 % of the signal: one pass
  const clean = record(0, 1e-7, 2); // residual ~1e-7 of the signal: the refinement pass runs too
  const moderate32 = Float32Array.from(moderate);
  const options = { sampleRateHz: SAMPLE_RATE_HZ, frequencyHz: FREQUENCY_HZ };

  const three64 = time(() => fitSineThreeParameter(moderate, options), 15);
  const three32 = time(() => fitSineThreeParameter(moderate32, options), 15);
  const threeRefined = time(() => fitSineThreeParameter(clean, options), 15);
  const four = time(() => fitSineFourParameter(moderate, { sampleRateHz: SAMPLE_RATE_HZ, initialFrequencyHz: FREQUENCY_HZ * (1 + 2e-5) }), 7);

  const output32 = Float32Array.from(moderate, (value) => 0.001 * value);
  const wav = stereoFloatWav(moderate32, output32);
  const directory = mkdtempSync(join(tmpdir(), 'sine-fit-bench-'));
  const wavPath = join(directory, 'capture.wav');
  writeFileSync(wavPath, wav);
  const readOnly = time(() => parseCaptureWav(wav), 9);
  const readGiven = time(() => {
    const capture = parseCaptureWav(wav);
    return fitCapture(capture, { frequencyHz: FREQUENCY_HZ });
  }, 9);
  const readEstimated = time(() => fitCapture(parseCaptureWav(wav)), 9);

  const numpy = runNumpy(wavPath);
  rmSync(directory, { recursive: true, force: true });

  const rate = (timing: Timing): string =>
    `${(SAMPLES / timing.bestMs / 1e3).toFixed(0)} (median ${(SAMPLES / timing.medianMs / 1e3).toFixed(0)}) M/s`;
  const ms = (timing: Timing): string => `${timing.bestMs.toFixed(1)} (median ${timing.medianMs.toFixed(1)}) ms`;
  const [load1] = loadavg();
  process.stdout.write(
    `sine fits, ${SAMPLES.toLocaleString('en')} samples per channel, wall time: best of repeated runs (median); ` +
      `load average ${load1.toFixed(2)}\n`,
  );
  line('', 'rejectra', 'numpy/scipy', 'ratio');
  const numpyRate = numpy ? SAMPLES / numpy.threeParameterMs / 1e3 : Number.NaN;
  const speedup = (timing: Timing): string =>
    numpy ? `${(SAMPLES / timing.bestMs / 1e3 / numpyRate).toFixed(1)}×` : '';
  line('3-parameter fit, Float64Array (one pass)', rate(three64), numpy ? `${numpyRate.toFixed(1)} M/s` : '', speedup(three64));
  line('3-parameter fit, Float32Array (one pass)', rate(three32), '', speedup(three32));
  line('3-parameter fit, residual 1e-7 (refined: 2 passes)', rate(threeRefined), '', speedup(threeRefined));
  if (numpy) line('  numpy.linalg.lstsq on [cos, sin, 1] (SVD)', '', `${(SAMPLES / numpy.lstsqMs / 1e3).toFixed(1)} M/s`);
  line('4-parameter fit, start 0.4 bin off', ms(four));
  line('1M-frame stereo float WAV: read only', ms(readOnly));
  const versus = (timing: Timing, referenceMs: number | undefined): [string, string] =>
    numpy && referenceMs !== undefined ? [`${referenceMs.toFixed(1)} ms`, `${(referenceMs / timing.bestMs).toFixed(1)}×`] : ['', ''];
  line('1M-frame stereo float WAV: read + fit, f given', ms(readGiven), ...versus(readGiven, numpy?.wavGivenMs));
  line('1M-frame stereo float WAV: read + fit, f estimated', ms(readEstimated), ...versus(readEstimated, numpy?.wavEstimatedMs));
  process.stdout.write(
    `CPU time per call (median): 3-param ${three64.cpuMs.toFixed(1)} ms, 4-param ${four.cpuMs.toFixed(1)} ms, ` +
      `WAV+given ${readGiven.cpuMs.toFixed(1)} ms, WAV+estimated ${readEstimated.cpuMs.toFixed(1)} ms\n`,
  );
  process.stdout.write(
    `first (cold) calls: 3-param ${three64.firstMs.toFixed(1)} ms, WAV+given ${readGiven.firstMs.toFixed(1)} ms, ` +
      `WAV+estimated ${readEstimated.firstMs.toFixed(1)} ms (includes JIT warm-up)\n`,
  );
  process.stdout.write(
    'numpy side (best of runs): vectorised normal equations; scipy.io.wavfile + the same fits, ' +
      'scipy least_squares for the estimate\n',
  );

  const threeRate = (SAMPLES / three64.bestMs) * 1e3;
  const checks = [
    [`3-parameter fit ≥ ${THREE_PARAMETER_TARGET / 1e6} M samples/s`, threeRate >= THREE_PARAMETER_TARGET],
    [`WAV read + fit (given) ≤ ${WAV_TARGET_MS} ms`, readGiven.bestMs <= WAV_TARGET_MS],
    [`WAV read + fit (estimated) ≤ ${WAV_TARGET_MS} ms`, readEstimated.bestMs <= WAV_TARGET_MS],
  ] as const;
  for (const [name, ok] of checks) process.stdout.write(`${ok ? 'PASS' : 'FAIL'}  ${name} (best wall time)\n`);
  if (load1 > 1.5) process.stdout.write(`note: load average ${load1.toFixed(2)}: other processes share the CPU; medians are inflated\n`);
  return checks.every(([, ok]) => ok) ? 0 : 1;
}

process.exitCode = main();
