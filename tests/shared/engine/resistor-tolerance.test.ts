import { describe, expect, it } from 'vitest';
import { EngineInputError } from '../../../shared/engine/errors';
import {
  approximateWorstCaseCmrrDb,
  commonModeToDifferentialRatio,
  MAXIMUM_MONTE_CARLO_TRIALS,
  monteCarloCmrr,
  monteCarloCmrrRatios,
  selectInPlace,
  toleranceForTargetCmrr,
  worstCaseCmrrDb,
  worstCaseNetworkCmrrDb,
  type ToleranceNetwork,
} from '../../../shared/engine/resistor-tolerance';
import { predictDifferenceAmplifier } from '../../../shared/engine/difference-amplifier';
import { createSeededRandom } from '../../../shared/engine/seeded-random';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

/** DOMAIN.md quotes the check values to 0.01 dB. */
const QUOTED_TO_HUNDREDTHS_DB = 0.005;
/** The agreement between our Monte Carlo and numpy's (different generators, 1,000,000 trials each). */
const MONTE_CARLO_AGREEMENT_DB = 0.3;
/** Yields from two independent 1,000,000-trial runs: binomial σ ≈ 3e-4 each, so 0.003 is about 7σ of the difference. */
const YIELD_AGREEMENT = 0.003;

/** numpy percentile with the default 'linear' method, on CMRR in dB, written out for the exactness check. */
function linearPercentileDb(ratios: Float64Array, percent: number): number {
  const cmrrDb = Array.from(ratios, (ratio) => -20 * Math.log10(ratio)).sort((a, b) => a - b);
  const position = (percent / 100) * (cmrrDb.length - 1);
  const lower = Math.floor(position);
  const upper = Math.min(lower + 1, cmrrDb.length - 1);
  const fraction = position - lower;
  return fraction === 0 ? cmrrDb[lower] : cmrrDb[lower] + fraction * (cmrrDb[upper] - cmrrDb[lower]);
}

const NUMPY_MONTE_CARLO = `
import json, sys, numpy as np
d = json.load(sys.stdin)
rng = np.random.default_rng(d['seed'])
n, g, tol = d['trials'], d['gain'], d['tolerance']
if d['distribution'] == 'uniform':
    e = rng.uniform(-tol, tol, size=(n, 4))
else:
    e = rng.normal(0.0, tol / 3, size=(n, 4))
r1 = 1 + e[:, 0]; r2 = g * (1 + e[:, 1]); r3 = 1 + e[:, 2]; r4 = g * (1 + e[:, 3])
# DOMAIN.md textbook relations, ideal op-amp
acm = (r1 * r4 - r2 * r3) / (r1 * (r3 + r4))
ad = (r4 * (r1 + r2) + r2 * (r3 + r4)) / (2 * r1 * (r3 + r4))
cmrr = 20 * np.log10(np.abs(ad / acm))
print(json.dumps({'percentiles': np.percentile(cmrr, [5, 50, 95]).tolist(), 'yield': float(np.mean(cmrr >= d['limit']))}))
`;

describe('worstCaseCmrrDb and approximateWorstCaseCmrrDb', () => {
  it('give the DOMAIN.md check values: G = 1, ε = 1 % → 33.98 dB; G = 10, ε = 0.1 % → 68.79 dB', () => {
    // DOMAIN.md, (1 + G)/(4ε) (textbook approximation, from memory).
    expect(Math.abs(approximateWorstCaseCmrrDb(1, 0.01) - 33.98)).toBeLessThan(QUOTED_TO_HUNDREDTHS_DB);
    expect(Math.abs(approximateWorstCaseCmrrDb(10, 0.001) - 68.79)).toBeLessThan(QUOTED_TO_HUNDREDTHS_DB);
    // The exact worst case sits within 0.01 dB of the approximation at these small tolerances.
    expect(Math.abs(worstCaseCmrrDb(1, 0.01) - 33.98)).toBeLessThan(QUOTED_TO_HUNDREDTHS_DB);
    expect(Math.abs(worstCaseCmrrDb(10, 0.001) - 68.79)).toBeLessThan(QUOTED_TO_HUNDREDTHS_DB);
  });

  it.skipIf(!hasNumpy)('equals numpy’s minimum over the 16 corners with the textbook Acm and Ad', () => {
    const cases = [
      [1, 0.01],
      [10, 0.001],
      [0.5, 0.05],
      [100, 0.0001],
      [3.3, 0.2],
    ];
    const expected = runPython<number[]>(
      `
import json, sys, itertools, numpy as np
out = []
for g, tol in json.load(sys.stdin):
    worst = np.inf
    for s in itertools.product([-1, 1], repeat=4):
        r1, r2, r3, r4 = 1 + s[0] * tol, g * (1 + s[1] * tol), 1 + s[2] * tol, g * (1 + s[3] * tol)
        acm = (r1 * r4 - r2 * r3) / (r1 * (r3 + r4))
        ad = (r4 * (r1 + r2) + r2 * (r3 + r4)) / (2 * r1 * (r3 + r4))
        if acm != 0:
            worst = min(worst, 20 * np.log10(abs(ad / acm)))
    out.append(worst)
print(json.dumps(out))
`,
      cases,
    );
    cases.forEach(([gain, tolerance], index) => {
      // Same rational function evaluated two ways: 1e-9 dB covers the rounding.
      expect(Math.abs(worstCaseCmrrDb(gain, tolerance) - expected[index])).toBeLessThan(1e-9);
    });
  });

  it('is never above the CMRR of any random draw within the tolerance', () => {
    // Definition of a worst case (common practice, no source).
    const ratios = monteCarloCmrrRatios({ gain: 4.7, toleranceFraction: 0.005, trials: 20_000, seed: 3 });
    const worstDb = worstCaseCmrrDb(4.7, 0.005);
    for (const ratio of ratios) expect(-20 * Math.log10(ratio)).toBeGreaterThanOrEqual(worstDb - 1e-9);
  });
});

describe('commonModeToDifferentialRatio', () => {
  it('matches the textbook Acm/Ad for R4 1 % high with unity gain', () => {
    // DOMAIN.md: Acm = 0.01/2.01, Ad = 4.03/4.02 → |Acm/Ad| = 0.004962779.
    expect(commonModeToDifferentialRatio(1, 1, 1, 1.01)).toBeCloseTo(0.01 / 2.01 / (4.03 / 4.02), 15);
    expect(commonModeToDifferentialRatio(1e3, 1e4, 2e3, 2e4)).toBe(0);
  });
});

describe('monteCarloCmrr', () => {
  for (const distribution of ['uniform', 'normal'] as const) {
    it.skipIf(!hasNumpy)(`agrees with a numpy run of 1,000,000 trials within 0.3 dB (${distribution})`, () => {
      const settings = { gain: 10, tolerance: 0.001, trials: 1_000_000, seed: 12345, distribution, limit: 80 };
      const numpy = runPython<{ percentiles: number[]; yield: number }>(NUMPY_MONTE_CARLO, settings);
      const ours = monteCarloCmrr({
        gain: 10,
        toleranceFraction: 0.001,
        trials: 1_000_000,
        seed: 777,
        distribution,
        limitDb: 80,
      });
      expect(Math.abs(ours.p05Db - numpy.percentiles[0])).toBeLessThan(MONTE_CARLO_AGREEMENT_DB);
      expect(Math.abs(ours.p50Db - numpy.percentiles[1])).toBeLessThan(MONTE_CARLO_AGREEMENT_DB);
      expect(Math.abs(ours.p95Db - numpy.percentiles[2])).toBeLessThan(MONTE_CARLO_AGREEMENT_DB);
      expect(Math.abs((ours.yieldFraction ?? NaN) - numpy.yield)).toBeLessThan(YIELD_AGREEMENT);
    });
  }

  it('gives exactly the percentiles of all its trials, sorted, in both the streaming and the small-run path', () => {
    // numpy's default 'linear' percentile definition, written out above (linearPercentileDb).
    for (const trials of [1000, 200_000]) {
      const options = { gain: 2, toleranceFraction: 0.01, trials, seed: 99, limitDb: 50 };
      const result = monteCarloCmrr(options);
      const ratios = monteCarloCmrrRatios(options);
      expect(result.p05Db).toBe(linearPercentileDb(ratios, 5));
      expect(result.p50Db).toBe(linearPercentileDb(ratios, 50));
      expect(result.p95Db).toBe(linearPercentileDb(ratios, 95));
      const passing = Array.from(ratios).filter((ratio) => -20 * Math.log10(ratio) >= 50).length;
      expect(result.yieldFraction).toBe(passing / trials);
    }
  });

  it('repeats its result for a seed and changes it for another seed', () => {
    const first = monteCarloCmrr({ gain: 1, toleranceFraction: 0.01, trials: 100_000, seed: 5 });
    expect(monteCarloCmrr({ gain: 1, toleranceFraction: 0.01, trials: 100_000, seed: 5 })).toEqual(first);
    expect(monteCarloCmrr({ gain: 1, toleranceFraction: 0.01, trials: 100_000, seed: 6 }).p50Db).not.toBe(first.p50Db);
  });

  it('orders its percentiles, keeps them above the worst case, and reports the settings used', () => {
    const result = monteCarloCmrr({ gain: 10, toleranceFraction: 0.001, trials: 50_000 });
    expect(result.p05Db).toBeLessThan(result.p50Db);
    expect(result.p50Db).toBeLessThan(result.p95Db);
    expect(result.p05Db).toBeGreaterThan(worstCaseCmrrDb(10, 0.001));
    expect(result).toMatchObject({ trials: 50_000, seed: 1, distribution: 'uniform' });
    expect(result.yieldFraction).toBeUndefined();
  });

  it('gives one value for all three percentiles from a single trial', () => {
    const result = monteCarloCmrr({ gain: 1, toleranceFraction: 0.01, trials: 1, seed: 8 });
    expect(result.p05Db).toBe(result.p50Db);
    expect(result.p95Db).toBe(result.p50Db);
  });

  it('yields 1 for a limit below every trial and 0 above every trial', () => {
    const options = { gain: 1, toleranceFraction: 0.01, trials: 10_000, seed: 2 };
    expect(monteCarloCmrr({ ...options, limitDb: 0 }).yieldFraction).toBe(1);
    expect(monteCarloCmrr({ ...options, limitDb: 400 }).yieldFraction).toBe(0);
  });

  it('narrows the spread with the normal option (σ = tol/3) compared with uniform within ±tol', () => {
    // σ of uniform ±tol is tol/√3, larger than tol/3: the median CMRR must rise (DOMAIN.md distributions).
    const uniform = monteCarloCmrr({ gain: 1, toleranceFraction: 0.01, trials: 100_000, seed: 4 });
    const normal = monteCarloCmrr({ gain: 1, toleranceFraction: 0.01, trials: 100_000, seed: 4, distribution: 'normal' });
    expect(normal.p50Db).toBeGreaterThan(uniform.p50Db);
  });

  it('names the field for each bad option', () => {
    const good = { gain: 1, toleranceFraction: 0.01, trials: 10 };
    const bad: [Record<string, unknown>, string][] = [
      [{ gain: 0 }, 'gain'],
      [{ gain: Number.NaN }, 'gain'],
      [{ toleranceFraction: 0 }, 'toleranceFraction'],
      [{ toleranceFraction: 0.5 }, 'toleranceFraction'],
      [{ toleranceFraction: -0.01 }, 'toleranceFraction'],
      [{ trials: 0 }, 'trials'],
      [{ trials: 2.5 }, 'trials'],
      [{ trials: MAXIMUM_MONTE_CARLO_TRIALS + 1 }, 'trials'],
      [{ seed: -3 }, 'seed'],
      [{ distribution: 'triangular' }, 'distribution'],
      [{ limitDb: Number.NaN }, 'limitDb'],
    ];
    for (const [change, field] of bad) {
      const call = () => monteCarloCmrr({ ...good, ...change } as Parameters<typeof monteCarloCmrr>[0]);
      expect(call).toThrowError(EngineInputError);
      expect(call).toThrowError(new RegExp(`field "${field}"`));
    }
  });
});

describe('a network with a tolerance per resistor', () => {
  const network: ToleranceNetwork = {
    r1Ohms: 4.99e3,
    r2Ohms: 49.9e3,
    r3Ohms: 4.99e3,
    r4Ohms: 49.9e3,
    toleranceFractions: [0.001, 0.0005, 0.002, 0.001],
    sourceResistance1Ohms: 10,
    sourceResistance2Ohms: 25,
  };

  it('gives the same worst case as the gain form when every resistor has the same tolerance', () => {
    const uniform: ToleranceNetwork = { r1Ohms: 1e3, r2Ohms: 1e4, r3Ohms: 1e3, r4Ohms: 1e4, toleranceFractions: [0.001, 0.001, 0.001, 0.001] };
    expect(Math.abs(worstCaseNetworkCmrrDb(uniform) - worstCaseCmrrDb(10, 0.001))).toBeLessThan(1e-9);
  });

  it('reduces to the nominal prediction when every tolerance is zero', () => {
    // Source imbalance alone, cross-checked with the node-equation model (itself checked against ngspice).
    const exact: ToleranceNetwork = { ...network, toleranceFractions: [0, 0, 0, 0] };
    const [nominal] = predictDifferenceAmplifier([0], {
      r1Ohms: network.r1Ohms,
      r2Ohms: network.r2Ohms,
      r3Ohms: network.r3Ohms,
      r4Ohms: network.r4Ohms,
      sourceResistance1Ohms: 10,
      sourceResistance2Ohms: 25,
    });
    expect(Math.abs(worstCaseNetworkCmrrDb(exact) - nominal.cmrrDb)).toBeLessThan(1e-9);
    const result = monteCarloCmrr({ network: exact, trials: 1000 });
    expect(Math.abs(result.p05Db - nominal.cmrrDb)).toBeLessThan(1e-9);
    expect(Math.abs(result.p95Db - nominal.cmrrDb)).toBeLessThan(1e-9);
  });

  it('matches the gain form to rounding for the same seed when the network is the same design', () => {
    const options = { trials: 100_000, seed: 21 };
    const byGain = monteCarloCmrr({ gain: 10, toleranceFraction: 0.002, ...options });
    const byNetwork = monteCarloCmrr({
      network: { r1Ohms: 2e3, r2Ohms: 2e4, r3Ohms: 2e3, r4Ohms: 2e4, toleranceFractions: [0.002, 0.002, 0.002, 0.002] },
      ...options,
    });
    expect(Math.abs(byNetwork.p50Db - byGain.p50Db)).toBeLessThan(1e-6);
  });

  it.skipIf(!hasNumpy)('agrees with a numpy run within 0.3 dB and never beats the worst case', () => {
    const numpy = runPython<number[]>(
      `
import json, sys, numpy as np
d = json.load(sys.stdin)
rng = np.random.default_rng(2468)
n = 1_000_000
nominal, tol = np.array(d['nominal']), np.array(d['tol'])
r = nominal * (1 + rng.uniform(-1, 1, size=(n, 4)) * tol)
r1 = r[:, 0] + d['rs1']; r2 = r[:, 1]; r3 = r[:, 2] + d['rs2']; r4 = r[:, 3]
acm = (r1 * r4 - r2 * r3) / (r1 * (r3 + r4))
ad = (r4 * (r1 + r2) + r2 * (r3 + r4)) / (2 * r1 * (r3 + r4))
print(json.dumps(np.percentile(20 * np.log10(np.abs(ad / acm)), [5, 50, 95]).tolist()))
`,
      { nominal: [4.99e3, 49.9e3, 4.99e3, 49.9e3], tol: network.toleranceFractions, rs1: 10, rs2: 25 },
    );
    const ours = monteCarloCmrr({ network, trials: 1_000_000, seed: 8642 });
    expect(Math.abs(ours.p05Db - numpy[0])).toBeLessThan(MONTE_CARLO_AGREEMENT_DB);
    expect(Math.abs(ours.p50Db - numpy[1])).toBeLessThan(MONTE_CARLO_AGREEMENT_DB);
    expect(Math.abs(ours.p95Db - numpy[2])).toBeLessThan(MONTE_CARLO_AGREEMENT_DB);
    expect(ours.p05Db).toBeGreaterThan(worstCaseNetworkCmrrDb(network));
  });

  it('names the bad part of a network and refuses a network together with a gain', () => {
    expect(() => worstCaseNetworkCmrrDb({ ...network, r3Ohms: 0 })).toThrowError(/field "r3Ohms"/);
    expect(() => worstCaseNetworkCmrrDb({ ...network, toleranceFractions: [0.1, 0.1, 0.5, 0.1] })).toThrowError(
      /field "toleranceFractions\[2\]"/,
    );
    expect(() => worstCaseNetworkCmrrDb({ ...network, sourceResistance2Ohms: -1 })).toThrowError(/field "sourceResistance2Ohms"/);
    expect(() =>
      worstCaseNetworkCmrrDb({ ...network, toleranceFractions: [0.1, 0.1] as unknown as ToleranceNetwork['toleranceFractions'] }),
    ).toThrowError(/four tolerance fractions/);
    expect(() => monteCarloCmrr({ network, gain: 10, trials: 10 })).toThrowError(/either network or gain/);
  });
});

describe('toleranceForTargetCmrr', () => {
  it('inverts the approximation: 68.79 dB at G = 10 needs 0.1 %', () => {
    // DOMAIN.md check value, read backwards; 68.79 is rounded, so 1e-3 relative.
    const result = toleranceForTargetCmrr(10, 68.79);
    expect(Math.abs(result.approximationToleranceFraction / 0.001 - 1)).toBeLessThan(1e-3);
  });

  it('returns a tolerance whose exact worst case meets the target', () => {
    for (const [gain, target] of [
      [1, 60],
      [10, 80],
      [0.2, 45],
    ]) {
      const { worstCaseToleranceFraction } = toleranceForTargetCmrr(gain, target);
      expect(worstCaseCmrrDb(gain, worstCaseToleranceFraction)).toBeGreaterThanOrEqual(target);
      expect(worstCaseCmrrDb(gain, worstCaseToleranceFraction * (1 + 1e-9))).toBeLessThan(target + 1e-6);
    }
  });

  it('caps the tolerance just below 0.5 when even that meets a low target', () => {
    expect(toleranceForTargetCmrr(100, 1).worstCaseToleranceFraction).toBeLessThan(0.5);
    expect(toleranceForTargetCmrr(100, 1).worstCaseToleranceFraction).toBeGreaterThan(0.4999);
  });

  it('rejects a target at or below 0 dB and a bad gain', () => {
    expect(() => toleranceForTargetCmrr(1, 0)).toThrowError(/field "targetCmrrDb"/);
    expect(() => toleranceForTargetCmrr(-1, 60)).toThrowError(/field "gain"/);
  });
});

describe('selectInPlace', () => {
  it('finds every rank of a shuffled array with ties as a full sort would', () => {
    const generator = createSeededRandom(11);
    const values = Float64Array.from({ length: 2001 }, () => Math.floor(generator.nextUnit() * 300));
    const sorted = values.slice().sort();
    for (const rank of [0, 1, 500, 1000, 1999, 2000]) {
      expect(selectInPlace(values.slice(), rank)).toBe(sorted[rank]);
    }
  });

  it('refuses a rank outside the range', () => {
    expect(() => selectInPlace(Float64Array.of(1, 2), 2)).toThrowError(/outside/);
  });
});
