// Speed of the computations behind issue 5's views, in Node (the browser runs the same code in a
// worker; the browser figures themselves belong to the client's bench):
// - monteCarloCmrrBand: 10,000 trials × 25 frequencies (target well under 100 ms),
// - monteCarloAtFrequency: 100,000 trials (target ≤ 50 ms in a worker),
// - prepareSessionCharts: 100,000 points, full and decimated to 1200 px (part of the 300 ms render budget),
// side by side with numpy doing the band's work (same trials, complex node solution, percentiles).
// Medians of repeated runs after a warm-up, with CPU time and the load average beside them.
// Run: node --import tsx bench/analysis.bench.ts
import { spawnSync } from 'node:child_process';
import { loadavg } from 'node:os';
import { monteCarloAtFrequency, monteCarloCmrrBand } from '../shared/analysis';
import type { Circuit } from '../shared/schemas/designs';
import { prepareSessionCharts } from '../src/lib/charts/session-chart-data';
import type { CmrrPoint } from '../shared/engine';

const REPEATS = 9;
const OP_AMP = { partNumber: 'HRI-OPA-1', openLoopGainDb: 120, gainBandwidthHz: 1e7, cmrrDb: 110, cmrrCornerHz: 100 };
const part = (ohms: number, tolerance = 0.0005) => ({ ohms, tolerance });
const DIFFERENCE: Circuit = {
  topology: 'difference-amplifier', r1: part(10e3), r2: part(100e3), r3: part(10e3), r4: part(100e3),
  sourceResistance1Ohms: 0, sourceResistance2Ohms: 0, toleranceDistribution: 'uniform', opAmp: OP_AMP,
};
const INSTRUMENTATION: Circuit = {
  topology: 'instrumentation-amplifier', feedback1: part(4500, 0.001), feedback2: part(4500, 0.001), gainResistor: part(1000, 0.001),
  r1: part(10e3), r2: part(10e3), r3: part(10e3), r4: part(10e3), sourceResistance1Ohms: 0, sourceResistance2Ohms: 0,
  toleranceDistribution: 'uniform', opAmp: OP_AMP,
};
const FREQUENCIES = Array.from({ length: 25 }, (_, index) => 10 * 10 ** (index / 6));

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

function time(label: string, run: (repeat: number) => void, targetMs?: number): number {
  for (let warm = 0; warm < 3; warm++) run(1000 + warm);
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let repeat = 0; repeat < REPEATS; repeat++) {
    const cpuStart = process.cpuUsage();
    const start = performance.now();
    run(repeat + 1);
    wall.push(performance.now() - start);
    const used = process.cpuUsage(cpuStart);
    cpu.push((used.user + used.system) / 1000);
  }
  const wallMs = median(wall);
  const target = targetMs === undefined ? '' : `  target ${targetMs} ms: ${wallMs <= targetMs ? 'met' : 'NOT met'}`;
  console.log(`${label.padEnd(58)} median ${wallMs.toFixed(1).padStart(6)} ms wall, ${median(cpu).toFixed(1).padStart(6)} ms CPU, best ${Math.min(...wall).toFixed(1)} ms${target}`);
  return wallMs;
}

const NUMPY_BAND = `
import json, sys, time, numpy as np
d = json.load(sys.stdin)
n, tol, op, freqs = 10000, 0.0005, d['opAmp'], d['frequencies']
nominal = np.array([10e3, 100e3, 10e3, 100e3])
def once(seed):
    rng = np.random.default_rng(seed)
    r = nominal * (1 + rng.uniform(-tol, tol, size=(n, 4)))
    s = rng.choice([-1.0, 1.0], size=n)
    vp = r[:, 3] / (r[:, 2] + r[:, 3]); alpha = r[:, 1] / (r[:, 0] + r[:, 1]); beta = r[:, 0] / (r[:, 0] + r[:, 1])
    out = []
    for f in freqs:
        inv_a = 10 ** (-op['openLoopGainDb'] / 20) + 1j * f / op['gainBandwidthHz']
        h = s * 10 ** (-op['cmrrDb'] / 20) * (1 + 1j * f / op['cmrrCornerHz']) / 2
        den = inv_a + (1 - h) * beta
        ad = ((1 + h) * vp * 0.5 + (1 - h) * alpha * 0.5) / den
        acm = ((1 + h) * vp - (1 - h) * alpha) / den
        out.append(np.percentile(20 * np.log10(np.abs(ad / acm)), [5, 50, 95]))
    return out
once(0)
wall, cpu = [], []
for seed in range(1, d['repeats'] + 1):
    w0, c0 = time.perf_counter(), time.process_time()
    once(seed)
    wall.append((time.perf_counter() - w0) * 1000); cpu.append((time.process_time() - c0) * 1000)
print(json.dumps({'wallMs': float(np.median(wall)), 'cpuMs': float(np.median(cpu)), 'version': np.__version__}))
`;

function numpyBand(): { wallMs: number; cpuMs: number; version: string } | null {
  const env = { ...process.env };
  // The project's rule for numpy benchmarks: these two OpenBLAS overrides are unset for this command only.
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  const result = spawnSync('python3', ['-c', NUMPY_BAND], { input: JSON.stringify({ opAmp: OP_AMP, frequencies: FREQUENCIES, repeats: REPEATS }), encoding: 'utf8', env, timeout: 300_000 });
  if (result.status !== 0) return null;
  return JSON.parse(result.stdout) as { wallMs: number; cpuMs: number; version: string };
}

function sessionPoints(count: number): CmrrPoint[] {
  return Array.from({ length: count }, (_, index) => {
    const frequencyHz = 10 * 10 ** ((4 * index) / (count - 1));
    const cmrrDb = 80 - 10 * Math.log10(1 + (frequencyHz / 2000) ** 2) + 0.3 * Math.sin(index);
    return { frequencyHz, ad: 10, acm: 10 / 10 ** (cmrrDb / 20), cmrrDb, lowerBound: index % 97 === 0, interpolated: false, commonModeLine: index + 2 };
  });
}

console.log(`Load average before: ${loadavg().map((value) => value.toFixed(2)).join(', ')} (other work on the machine stretches wall-clock figures)`);
const ours = time('monteCarloCmrrBand, difference amp, 10,000 × 25', (seed) => monteCarloCmrrBand(DIFFERENCE, FREQUENCIES, { trials: 10_000, seed }), 100);
time('monteCarloCmrrBand, instrumentation amp, 10,000 × 25', (seed) => monteCarloCmrrBand(INSTRUMENTATION, FREQUENCIES, { trials: 10_000, seed }), 100);
time('monteCarloAtFrequency, difference amp, 100,000 trials', (seed) => monteCarloAtFrequency(DIFFERENCE, 1000, { trials: 100_000, seed, limitDb: 80 }), 50);
time('monteCarloAtFrequency, instrumentation amp, 100,000 trials', (seed) => monteCarloAtFrequency(INSTRUMENTATION, 1000, { trials: 100_000, seed, limitDb: 100 }), 50);
const points = sessionPoints(100_000);
const mask = { points: [{ frequencyHz: 10, minimumCmrrDb: 75 }, { frequencyHz: 1e5, minimumCmrrDb: 45 }], guardBandDb: 0.5 };
time('prepareSessionCharts, 100,000 points, not decimated', () => prepareSessionCharts({ points, limitMask: mask }));
time('prepareSessionCharts, 100,000 points, decimated to 1200 px', () => prepareSessionCharts({ points, limitMask: mask }, { widthPx: 1200 }));
const numpy = numpyBand();
if (numpy) {
  console.log(`${'numpy ' + numpy.version + ': the same band, 10,000 × 25'.padEnd(52)} median ${numpy.wallMs.toFixed(1).padStart(6)} ms wall, ${numpy.cpuMs.toFixed(1).padStart(6)} ms CPU`);
  console.log(`Ratio ours / numpy for the band: ${(ours / numpy.wallMs).toFixed(2)}`);
} else {
  console.log('numpy not available: no side-by-side figure');
}
console.log(`Load average after: ${loadavg().map((value) => value.toFixed(2)).join(', ')}`);
