// Speed of the resistor-tolerance Monte Carlo (issue 3 target: 1,000,000 trials of the
// four-resistor CMRR in ≤ 40 ms on one core), side by side with numpy doing the same work in the
// same run: draw 4 uniform resistor errors per trial, exact textbook |Acm/Ad|, 5th/50th/95th
// percentiles. Reports wall-clock and CPU time (medians of repeated runs after a warm-up) and the
// load average, since other work on the machine stretches wall-clock figures.
// Run: node --import tsx bench/monte-carlo.bench.ts
import { spawnSync } from 'node:child_process';
import { loadavg } from 'node:os';
import { monteCarloCmrr, type ToleranceDistribution } from '../shared/engine/resistor-tolerance';

const TRIALS = 1_000_000;
const REPEATS = 9;
const TARGET_MS = 40;

interface Timing {
  wallMs: number;
  cpuMs: number;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

function timeOnce(distribution: ToleranceDistribution, seed: number): Timing & { p50Db: number } {
  const cpuStart = process.cpuUsage();
  const wallStart = performance.now();
  const result = monteCarloCmrr({ gain: 10, toleranceFraction: 0.001, trials: TRIALS, seed, distribution });
  const wallMs = performance.now() - wallStart;
  const cpu = process.cpuUsage(cpuStart);
  return { wallMs, cpuMs: (cpu.user + cpu.system) / 1000, p50Db: result.p50Db };
}

function timeOurs(distribution: ToleranceDistribution): { cold: Timing; wallMs: number; cpuMs: number; bestWallMs: number } {
  const cold = timeOnce(distribution, 1000);
  for (let warm = 0; warm < 3; warm++) timeOnce(distribution, 2000 + warm);
  const runs = Array.from({ length: REPEATS }, (_, index) => timeOnce(distribution, index + 1));
  return {
    cold,
    wallMs: median(runs.map((run) => run.wallMs)),
    cpuMs: median(runs.map((run) => run.cpuMs)),
    bestWallMs: Math.min(...runs.map((run) => run.wallMs)),
  };
}

const NUMPY = `
import json, sys, time, numpy as np
d = json.load(sys.stdin)
n, g, tol, repeats = d['trials'], 10.0, 0.001, d['repeats']
def once(seed):
    rng = np.random.default_rng(seed)
    if d['distribution'] == 'uniform':
        e = rng.uniform(-tol, tol, size=(n, 4))
    else:
        e = rng.normal(0.0, tol / 3, size=(n, 4))
    r1 = 1 + e[:, 0]; r2 = g * (1 + e[:, 1]); r3 = 1 + e[:, 2]; r4 = g * (1 + e[:, 3])
    ratio = np.abs(2 * (r1 * r4 - r2 * r3) / (r4 * (r1 + r2) + r2 * (r3 + r4)))
    return -20 * np.log10(np.percentile(ratio, [95, 50, 5]))
once(0)
wall, cpu = [], []
for seed in range(1, repeats + 1):
    w0, c0 = time.perf_counter(), time.process_time()
    once(seed)
    wall.append((time.perf_counter() - w0) * 1000); cpu.append((time.process_time() - c0) * 1000)
print(json.dumps({'wallMs': float(np.median(wall)), 'cpuMs': float(np.median(cpu)), 'bestWallMs': min(wall), 'version': np.__version__}))
`;

function timeNumpy(distribution: ToleranceDistribution): { wallMs: number; cpuMs: number; bestWallMs: number; version: string } | null {
  const env = { ...process.env };
  // The project's rule for numpy benchmarks: these two OpenBLAS overrides are unset for this command only.
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  const result = spawnSync('python3', ['-c', NUMPY], {
    input: JSON.stringify({ trials: TRIALS, repeats: REPEATS, distribution }),
    encoding: 'utf8',
    env,
    timeout: 300_000,
  });
  if (result.status !== 0) {
    process.stdout.write(`numpy baseline unavailable: ${result.stderr || result.error?.message || 'python3 failed'}\n`);
    return null;
  }
  return JSON.parse(result.stdout) as { wallMs: number; cpuMs: number; bestWallMs: number; version: string };
}

function format(value: number): string {
  return `${value.toFixed(1).padStart(7)} ms`;
}

process.stdout.write(
  `Monte Carlo of the four-resistor CMRR, ${TRIALS.toLocaleString('en-US')} trials (gain 10, ±0.1 %), median of ${REPEATS} runs after warm-up\n` +
    `load average at start: ${loadavg().map((value) => value.toFixed(2)).join(', ')}\n\n`,
);
let slowest = 0;
for (const distribution of ['uniform', 'normal'] as const) {
  const ours = timeOurs(distribution);
  const numpy = timeNumpy(distribution);
  process.stdout.write(`${distribution}:\n`);
  process.stdout.write(`  rejectra  wall ${format(ours.wallMs)} (best ${format(ours.bestWallMs).trim()}), cpu ${format(ours.cpuMs)}, first call ${format(ours.cold.wallMs).trim()}\n`);
  if (numpy) {
    process.stdout.write(`  numpy ${numpy.version.padEnd(6)} wall ${format(numpy.wallMs)} (best ${format(numpy.bestWallMs).trim()}), cpu ${format(numpy.cpuMs)}\n`);
    process.stdout.write(
      `  ratio (numpy / rejectra): wall ${(numpy.wallMs / ours.wallMs).toFixed(2)}×, cpu ${(numpy.cpuMs / ours.cpuMs).toFixed(2)}×\n`,
    );
  }
  if (distribution === 'uniform') {
    slowest = ours.cpuMs;
    const verdict = ours.cpuMs <= TARGET_MS ? 'meets' : 'MISSES';
    process.stdout.write(`  target ≤ ${TARGET_MS} ms (uniform, CPU time of one core): ${verdict} it at ${ours.cpuMs.toFixed(1)} ms\n`);
  }
  process.stdout.write('\n');
}
process.exitCode = slowest <= TARGET_MS ? 0 : 1;
