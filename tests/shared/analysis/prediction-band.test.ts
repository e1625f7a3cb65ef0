import { describe, expect, it } from 'vitest';
import { EngineInputError, monteCarloCmrr, worstCaseNetworkCmrrDb } from '../../../shared/engine';
import { monteCarloAtFrequency, monteCarloCmrrBand, worstCaseCmrrAtFrequency } from '../../../shared/analysis';
import { hasNumpy, runPython } from '../../helpers/reference-tools';
import { differenceCircuit, OP_AMP } from './fixtures';

/** The same trials through two algebraically equal formulas: rounding only. */
const SAME_TRIALS_DB = 1e-7;
/** The agreement with numpy for the same formula and distribution (different generators). */
const NUMPY_AGREEMENT_DB = 0.3;
const NETWORK_0_05 = { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100e3, toleranceFractions: [0.0005, 0.0005, 0.0005, 0.0005] as const };

// numpy: the same model written independently as the complex node equations of DOMAIN.md, with
// numpy's own generator. Output law: vout·(1/A) = k+·v+ − k−·v−, k± = 1 ± s/(2·CMRRoa(f)).
const NUMPY_BAND = `
import json, sys, numpy as np
d = json.load(sys.stdin)
rng = np.random.default_rng(d['seed'])
n, tol = d['trials'], d['tol']
nominal = np.array([10e3, 100e3, 10e3, 100e3])
if d['distribution'] == 'uniform':
    r = nominal * (1 + rng.uniform(-tol, tol, size=(n, 4)))
else:
    r = nominal * (1 + rng.normal(0.0, tol / 3, size=(n, 4)))
s = rng.choice([-1.0, 1.0], size=n)
op = d['opAmp']
out = []
for f in d['frequencies']:
    inv_a = 10 ** (-op['openLoopGainDb'] / 20) + 1j * f / op['gainBandwidthHz']
    inv_cmrr = 10 ** (-op['cmrrDb'] / 20) * (1 + 1j * f / op['cmrrCornerHz'])
    kp = 1 + s * inv_cmrr / 2
    km = 1 - s * inv_cmrr / 2
    def vout(v1, v2):
        vp = v2 * r[:, 3] / (r[:, 2] + r[:, 3])
        alpha = r[:, 1] / (r[:, 0] + r[:, 1]); beta = r[:, 0] / (r[:, 0] + r[:, 1])
        return (kp * vp - km * alpha * v1) / (inv_a + km * beta)
    cmrr = 20 * np.log10(np.abs(vout(-0.5, 0.5)) / np.abs(vout(1.0, 1.0)))
    out.append(np.percentile(cmrr, [5, 50, 95]).tolist())
print(json.dumps(out))
`;

describe('monteCarloCmrrBand', () => {
  it('equals the engine’s monteCarloCmrr at every frequency when the op-amp is ideal', () => {
    const band = monteCarloCmrrBand(differenceCircuit(0.0005, null), [0, 1e3, 1e5], { trials: 20_000, seed: 4 });
    // Reference: shared/engine/resistor-tolerance.ts, same network and seed (ideal op-amp: no frequency dependence).
    const engine = monteCarloCmrr({ network: NETWORK_0_05, trials: 20_000, seed: 4 });
    for (const point of band.points) {
      expect(Math.abs(point.p05Db - engine.p05Db)).toBeLessThan(SAME_TRIALS_DB);
      expect(Math.abs(point.p50Db - engine.p50Db)).toBeLessThan(SAME_TRIALS_DB);
      expect(Math.abs(point.p95Db - engine.p95Db)).toBeLessThan(SAME_TRIALS_DB);
    }
  });

  it.skipIf(!hasNumpy).each(['uniform', 'normal'] as const)(
    'agrees with numpy’s complex node solution within 0.3 dB at every percentile and frequency (%s)',
    (distribution) => {
      const frequencies = [10, 100, 1e3, 1e4, 1e5];
      const band = monteCarloCmrrBand(differenceCircuit(0.0005), frequencies, { trials: 200_000, seed: 9, distribution });
      const expected = runPython<number[][]>(NUMPY_BAND, { seed: 9, trials: 200_000, tol: 0.0005, distribution, opAmp: OP_AMP, frequencies });
      band.points.forEach((point, index) => {
        expect(Math.abs(point.p05Db - expected[index][0])).toBeLessThan(NUMPY_AGREEMENT_DB);
        expect(Math.abs(point.p50Db - expected[index][1])).toBeLessThan(NUMPY_AGREEMENT_DB);
        expect(Math.abs(point.p95Db - expected[index][2])).toBeLessThan(NUMPY_AGREEMENT_DB);
      });
    },
  );

  it('narrows towards the op-amp’s own rejection where the op-amp term dominates', () => {
    const band = monteCarloCmrrBand(differenceCircuit(0.0005), [10, 1e5]);
    // At 100 kHz the op-amp term of the fixture's data is 120 dB − 20·log10(1e5/30) ≈ 49.5 dB, far below the resistors' ≈ 80 dB.
    expect(band.points[1].p95Db - band.points[1].p05Db).toBeLessThan(0.1);
    expect(Math.abs(band.points[1].p50Db - 49.5)).toBeLessThan(0.1);
    expect(band.points[0].p95Db - band.points[0].p05Db).toBeGreaterThan(10);
  });

  it('gives the same band for the same seed and a different one for another seed', () => {
    const first = monteCarloCmrrBand(differenceCircuit(), [100], { trials: 2000, seed: 1 });
    expect(monteCarloCmrrBand(differenceCircuit(), [100], { trials: 2000, seed: 1 })).toEqual(first);
    expect(monteCarloCmrrBand(differenceCircuit(), [100], { trials: 2000, seed: 2 }).points[0].p05Db).not.toBe(first.points[0].p05Db);
  });

  it('refuses an empty frequency list and a negative frequency, naming the entry', () => {
    expect(() => monteCarloCmrrBand(differenceCircuit(), [])).toThrow(/at least one frequency/);
    try {
      monteCarloCmrrBand(differenceCircuit(), [10, -1]);
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(EngineInputError);
      expect((error as EngineInputError).location).toEqual({ field: 'frequencyHz', column: 2 });
    }
  });

  it('refuses incomplete op-amp data', () => {
    const circuit = differenceCircuit();
    circuit.opAmp = { ...OP_AMP, gainBandwidthHz: -1 };
    expect(() => monteCarloCmrrBand(circuit, [10])).toThrow(/gainBandwidthHz/);
  });
});

describe('monteCarloAtFrequency', () => {
  it('gives the engine’s percentiles and yield for an ideal op-amp', () => {
    const result = monteCarloAtFrequency(differenceCircuit(0.0005, null), 1000, { trials: 100_000, seed: 6, limitDb: 85 });
    // Reference: the engine's monteCarloCmrr (same trials, same numpy-linear percentiles).
    const engine = monteCarloCmrr({ network: NETWORK_0_05, trials: 100_000, seed: 6, limitDb: 85 });
    expect(Math.abs(result.p05Db - engine.p05Db)).toBeLessThan(SAME_TRIALS_DB);
    expect(Math.abs(result.p95Db - engine.p95Db)).toBeLessThan(SAME_TRIALS_DB);
    expect(result.yieldFraction).toBe(engine.yieldFraction);
  });

  it('matches the band at the same frequency and seed', () => {
    const band = monteCarloCmrrBand(differenceCircuit(), [2000], { trials: 5000, seed: 3 });
    const single = monteCarloAtFrequency(differenceCircuit(), 2000, { trials: 5000, seed: 3 });
    expect(single.p50Db).toBe(band.points[0].p50Db);
  });

  it('counts every trial once in the histogram, with rising edges in a 1-2-5 step', () => {
    const result = monteCarloAtFrequency(differenceCircuit(), 100, { trials: 20_000, histogramBins: 30 });
    const { edgesDb, counts, belowCount, aboveCount } = result.histogram;
    expect(counts.reduce((sum, count) => sum + count, 0) + belowCount + aboveCount).toBe(20_000);
    expect(edgesDb.length).toBe(counts.length + 1);
    const step = edgesDb[1] - edgesDb[0];
    expect([1, 2, 5].some((mantissa) => Math.abs(step / 10 ** Math.floor(Math.log10(step)) - mantissa) < 1e-9)).toBe(true);
    // The histogram spans the 0.5th … 99.5th percentiles, so about 0.5 % of trials fall each side (by construction).
    expect(belowCount).toBeLessThanOrEqual(0.005 * 20_000 + 1);
  });

  it('reports a worst case at or below every trial’s CMRR', () => {
    const result = monteCarloAtFrequency(differenceCircuit(), 1000, { trials: 20_000, histogramBins: 5 });
    expect(result.worstCaseDb).toBeLessThanOrEqual(result.histogram.edgesDb[0]);
  });

  it('refuses a non-finite limit and a histogram of too few bins', () => {
    expect(() => monteCarloAtFrequency(differenceCircuit(), 100, { limitDb: Number.NaN })).toThrow(/limitDb|limit in dB/);
    expect(() => monteCarloAtFrequency(differenceCircuit(), 100, { histogramBins: 2 })).toThrow(/histogramBins/);
  });
});

describe('worstCaseCmrrAtFrequency', () => {
  it('equals the engine’s 16-corner worst case for an ideal op-amp', () => {
    // Reference: worstCaseNetworkCmrrDb (shared/engine/resistor-tolerance.ts); DOMAIN.md check value G = 10, 0.1 % → 68.79 dB.
    const circuit = differenceCircuit(0.001, null);
    expect(Math.abs(worstCaseCmrrAtFrequency(circuit, 0) - worstCaseNetworkCmrrDb({ ...NETWORK_0_05, toleranceFractions: [0.001, 0.001, 0.001, 0.001] }))).toBeLessThan(SAME_TRIALS_DB);
    expect(Math.abs(worstCaseCmrrAtFrequency(circuit, 0) - 68.79)).toBeLessThan(0.005);
  });

  it('refuses a negative frequency', () => {
    expect(() => worstCaseCmrrAtFrequency(differenceCircuit(), -5)).toThrow(EngineInputError);
  });
});
