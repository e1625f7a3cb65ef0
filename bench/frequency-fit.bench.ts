// Speed of the sweep analysis against scipy in the same run: a 1,000-point differential and
// common-mode sweep pair → per-frequency CMRR points → first-order fits of |Ad(f)| and CMRR(f)
// in the log domain (with censored floor-limited points). Target (issue 3): ≤ 1 ms from parsed
// arrays; scipy.optimize.least_squares takes about 2 ms here for the same models.
// Run: node --import tsx bench/frequency-fit.bench.ts
import { execFileSync } from 'node:child_process';
import { cpus, loadavg } from 'node:os';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { pairCmrrPoints } from '../shared/engine/cmrr-points';
import { analyzeSweeps, fitCmrrFrequencyResponse } from '../shared/engine/frequency-fit';
import { parseSweepCsv } from '../shared/engine/sweep-file';

const targetMs = 1;
const pointCount = 1000;

/** Seeded uniform generator (mulberry32): the engine and the bench take no global random. */
function uniformSource(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
  };
}

// Invented benchmark data: Ad0 = 10, fp = 150 kHz, CMRR 116 dB with a 4 kHz corner, 0.3 dB scatter,
// a floor that rises below 300 Hz so the points below about 40 Hz are lower bounds.
function makeSweeps(): { differential: string; commonMode: string } {
  const uniform = uniformSource(20261202);
  const gaussian = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  const acm0 = 10 / 10 ** (116 / 20);
  const kPerHz = acm0 / 4e3;
  const differentialRows = ['frequency_hz,vin_v,vout_v,floor_v'];
  const commonModeRows = ['frequency_hz,vin_v,vout_v,floor_v'];
  for (let i = 0; i < pointCount; i++) {
    const frequencyHz = 10 * 1e5 ** (i / (pointCount - 1));
    const pole = Math.sqrt(1 + (frequencyHz / 150e3) ** 2);
    const floorVolts = 1e-6 * Math.sqrt(1 + (300 / frequencyHz) ** 2);
    const ad = (10 / pole) * 10 ** ((0.02 * gaussian()) / 20);
    const acm = (Math.sqrt(acm0 ** 2 + (kPerHz * frequencyHz) ** 2) / pole) * 10 ** ((0.3 * gaussian()) / 20);
    differentialRows.push(`${frequencyHz},0.1,${0.1 * ad},1e-6`);
    commonModeRows.push(`${frequencyHz},1,${acm},${floorVolts}`);
  }
  return { differential: `${differentialRows.join('\n')}\n`, commonMode: `${commonModeRows.join('\n')}\n` };
}

/** Median and fastest batch of the time per call, in milliseconds. */
function timeMs(action: () => unknown, batches = 25, perBatch = 40): { median: number; best: number } {
  for (let i = 0; i < 100; i++) action();
  const samples: number[] = [];
  for (let batch = 0; batch < batches; batch++) {
    const start = performance.now();
    for (let i = 0; i < perBatch; i++) action();
    samples.push((performance.now() - start) / perBatch);
  }
  samples.sort((a, b) => a - b);
  return { median: samples[samples.length >> 1], best: samples[0] };
}

const { differential, commonMode } = makeSweeps();
const differentialSweep = parseSweepCsv(differential);
const commonModeSweep = parseSweepCsv(commonMode);
const points = pairCmrrPoints(differentialSweep, commonModeSweep).points;
const result = fitCmrrFrequencyResponse(points);

const fromArraysMs = timeMs(() => fitCmrrFrequencyResponse(pairCmrrPoints(differentialSweep, commonModeSweep).points));
const fitOnlyMs = timeMs(() => fitCmrrFrequencyResponse(points));
const withParsingMs = timeMs(() => analyzeSweeps(differential, commonMode), 15, 20);

// The general-purpose package on the CMRR model alone (resolved points, analytic Jacobian), for
// the record of why frequency-fit.ts has its own iteration.
const resolved = points.filter((point) => !point.lowerBound);
const resolvedLog10Hz = resolved.map((point) => Math.log10(point.frequencyHz));
const resolvedCmrrDb = resolved.map((point) => point.cmrrDb);
const packageFit = () =>
  levenbergMarquardt(
    { x: resolvedLog10Hz, y: resolvedCmrrDb },
    ([levelDb, log10CornerHz]) => (x) => levelDb - 10 * Math.log10(1 + 10 ** (2 * (x - log10CornerHz))),
    {
      initialValues: [Math.max(...resolvedCmrrDb), 3],
      jacobianFunction: ([, log10CornerHz]) => (x) => {
        const u = 10 ** (2 * (x - log10CornerHz));
        return [1, (20 * u) / (1 + u)];
      },
      errorTolerance: 1e-12,
    },
  );
const packageMs = timeMs(packageFit, 5, 2);
const packageResult = packageFit();

// The same work in numpy/scipy: gains, CMRR, lower bounds, then the two log-domain fits with
// analytic Jacobians and the one-sided residual for bounds, and the same 95 % half-widths.
const python = String.raw`
import io, json, sys, time
import numpy as np
from scipy.optimize import least_squares
from scipy import stats
d = json.load(sys.stdin)

def load(text):
    return np.loadtxt(io.StringIO(text), delimiter=",", comments="#", skiprows=1)

def rolloff(x, y, bound, start):
    def residuals(p):
        r = y - (p[0] - 10 * np.log10(1 + 10 ** (2 * (x - p[1]))))
        r[bound] = np.maximum(r[bound], 0)
        return r
    def jacobian(p):
        u = 10 ** (2 * (x - p[1]))
        J = -np.column_stack([np.ones_like(x), 20 * u / (1 + u)])
        J[bound & (residuals(p) <= 0)] = 0
        return J
    s = least_squares(residuals, start, jac=jacobian, method="lm")
    r = residuals(s.x); active = (~bound) | (r > 0); J = jacobian(s.x)[active]
    dof = int(active.sum()) - 2
    cov = np.sum(r ** 2) / dof * np.linalg.inv(J.T @ J)
    return s.x, stats.t.ppf(0.975, dof) * np.sqrt(np.diag(cov))

def analyse(dif, cm):
    f = cm[:, 0]; x = np.log10(f)
    ad = dif[:, 2] / dif[:, 1]
    bound = cm[:, 2] < 2 * cm[:, 3]
    acm = np.where(bound, 2 * cm[:, 3], cm[:, 2]) / cm[:, 1]
    cmrr = 20 * np.log10(ad / acm)
    adfit = rolloff(x, 20 * np.log10(ad), np.zeros_like(bound), [20.0, x[-1]])
    cmrrfit = rolloff(x, cmrr, bound, [float(np.max(cmrr[~bound])), float(np.mean(x))])
    return adfit, cmrrfit

def median_ms(action, batches=15, per_batch=20):
    for _ in range(10): action()
    samples = []
    for _ in range(batches):
        t = time.perf_counter()
        for _ in range(per_batch): action()
        samples.append((time.perf_counter() - t) / per_batch * 1e3)
    return float(np.median(samples))

dif = load(d["differential"]); cm = load(d["commonMode"])
(_, _), (cmrr_params, cmrr_half) = analyse(dif, cm)
print(json.dumps({
    "fromArraysMs": median_ms(lambda: analyse(dif, cm)),
    "withParsingMs": median_ms(lambda: analyse(load(d["differential"]), load(d["commonMode"])), 10, 5),
    "cmrrDcDb": float(cmrr_params[0]), "cornerHz": float(10 ** cmrr_params[1]), "levelHalfWidth": float(cmrr_half[0]),
}))
`;

const env = { ...process.env };
delete env.OPENBLAS_CORETYPE;
delete env.OPENBLAS_L2_SIZE;
let scipy: { fromArraysMs: number; withParsingMs: number; cmrrDcDb: number; cornerHz: number; levelHalfWidth: number } | null = null;
try {
  const output = execFileSync('python3', ['-c', python], { input: JSON.stringify({ differential, commonMode }), env, maxBuffer: 64 << 20 });
  scipy = JSON.parse(output.toString('utf8'));
} catch (error) {
  process.stdout.write(`scipy baseline unavailable (${(error as Error).message.split('\n')[0]}); printing our figures only\n`);
}

const format = (ms: number) => `${(ms * 1000).toFixed(0).padStart(6)} µs`;
const ratio = (ours: number, theirs: number | undefined) => (theirs ? `${(theirs / ours).toFixed(1)}× scipy's speed` : '');
const lines = [
  `sweep pair: ${pointCount} points each, ${points.filter((point) => point.lowerBound).length} lower bounds; model ${result.model}`,
  `machine: ${cpus().length} cores, load average ${loadavg()[0].toFixed(1)} (other work slows both sides alike)`,
  '                                   ours median (best batch)    scipy median   ratio',
  `  pair + fit from parsed arrays   ${format(fromArraysMs.median)} (${format(fromArraysMs.best)})   ${scipy ? format(scipy.fromArraysMs) : '   n/a'}   ${ratio(fromArraysMs.median, scipy?.fromArraysMs)}`,
  `  fit only (from points)          ${format(fitOnlyMs.median)} (${format(fitOnlyMs.best)})`,
  `  with CSV parsing (both files)   ${format(withParsingMs.median)} (${format(withParsingMs.best)})   ${scipy ? format(scipy.withParsingMs) : '   n/a'}   ${ratio(withParsingMs.median, scipy?.withParsingMs)} (numpy.loadtxt + scipy)`,
  `  ml-levenberg-marquardt (CMRR)  ${format(packageMs.median)} (${packageResult.iterations} iterations; ` +
    `dc CMRR ${packageResult.parameterValues[0].toFixed(6)} dB without the bounds)`,
  `  same answer: dc CMRR ours ${result.cmrrDcDb?.toFixed(6)} dB, scipy ${scipy?.cmrrDcDb.toFixed(6) ?? 'n/a'} dB; ` +
    `corner ours ${result.cmrrCornerHz?.toFixed(3)} Hz, scipy ${scipy?.cornerHz.toFixed(3) ?? 'n/a'} Hz`,
];
const met = fromArraysMs.median <= targetMs;
lines.push(
  `  target ≤ ${targetMs} ms from parsed arrays (median): ${met ? 'met' : 'MISSED'} (${(fromArraysMs.median / targetMs).toFixed(2)} of the budget)`,
);
process.stdout.write(`${lines.join('\n')}\n`);
process.exitCode = met ? 0 : 1;
