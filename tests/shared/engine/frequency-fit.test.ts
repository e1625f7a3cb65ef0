import { describe, expect, it } from 'vitest';
import type { CmrrPoint } from '../../../shared/engine/cmrr-points';
import { EngineInputError } from '../../../shared/engine/errors';
import { analyzeSweeps, fitCmrrFrequencyResponse, studentTQuantile } from '../../../shared/engine/frequency-fit';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

// Exact model data are recovered to the convergence limit of the iteration (steps of 1e-10 dB
// and 1e-10 decades); 1e-6 leaves room for the rounding of 41 log10 evaluations.
const EXACT_RECOVERY = 1e-6;
// Two independent least-squares solvers stopping at their own tolerances on the same smooth
// problem agree to far better than a microdecibel; interval half-widths to a relative 1e-6.
const SOLVER_AGREEMENT = 1e-6;
const INTERVAL_AGREEMENT = 1e-6;
// scipy.stats.t.ppf and our Newton-refined quantile: both near double precision.
const QUANTILE_AGREEMENT = 1e-9;

/** Deterministic normal noise (mulberry32 + Box–Muller): tests must not use the global random. */
function normalNoise(seed: number): () => number {
  let state = seed >>> 0;
  const uniform = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
}

function logSpaced(startHz: number, stopHz: number, count: number): number[] {
  return Array.from({ length: count }, (_, i) => startHz * (stopHz / startHz) ** (i / (count - 1)));
}

interface ModelOptions {
  frequencyHz: number[];
  cmrrDcDb: number;
  cornerHz: number;
  ad0?: number;
  bandwidthHz?: number;
  /** Standard deviation of the CMRR noise in dB (applied to acm). */
  noiseDb?: number;
  seed?: number;
  /** CMRR values (dB) to hide below a floor: points listed are replaced by bounds at this level. */
  bounds?: Map<number, number>;
}

/** Points of the DOMAIN.md first-order model, optionally with noise and bound points. */
function modelPoints(options: ModelOptions): CmrrPoint[] {
  const ad0 = options.ad0 ?? 10;
  const acm0 = ad0 / 10 ** (options.cmrrDcDb / 20);
  const kPerHz = acm0 / options.cornerHz;
  const noise = normalNoise(options.seed ?? 1);
  return options.frequencyHz.map((frequencyHz, index) => {
    const poleFactor = options.bandwidthHz ? Math.sqrt(1 + (frequencyHz / options.bandwidthHz) ** 2) : 1;
    const ad = ad0 / poleFactor;
    let acm = (Math.sqrt(acm0 ** 2 + (kPerHz * frequencyHz) ** 2) / poleFactor) * 10 ** (((options.noiseDb ?? 0) * noise()) / 20);
    const boundDb = options.bounds?.get(index);
    if (boundDb !== undefined) acm = ad / 10 ** (boundDb / 20);
    return {
      frequencyHz,
      ad,
      acm,
      cmrrDb: 20 * Math.log10(ad / acm),
      lowerBound: boundDb !== undefined,
      interpolated: false,
      commonModeLine: index + 2,
    };
  });
}

// The same log-domain model and one-sided residual for bounds, fitted by scipy; and Student t
// quantiles. One python run for the whole file (starting scipy takes seconds on a busy machine).
const scipyScript = `
import json, sys, numpy as np
from scipy.optimize import least_squares
from scipy import stats
d = json.load(sys.stdin)
def fit(x, y, bound, start):
    y = np.array(y); bound = np.array(bound, dtype=bool)
    def residuals(p):
        r = y - (p[0] - 10 * np.log10(1 + 10 ** (2 * (x - p[1]))))
        r[bound] = np.maximum(r[bound], 0)  # a bound counts only where the model lies below it
        return r
    def jacobian(p):
        u = 10 ** (2 * (x - p[1]))
        J = -np.column_stack([np.ones_like(x), 20 * u / (1 + u)])
        J[bound & (residuals(p) <= 0)] = 0
        return J
    solution = least_squares(residuals, start, jac=jacobian, method="lm", xtol=1e-15, ftol=1e-15, gtol=1e-15)
    r = residuals(solution.x)
    active = (~bound) | (r > 0)
    J = jacobian(solution.x)[active]
    dof = int(active.sum()) - 2
    covariance = np.sum(r ** 2) / dof * np.linalg.inv(J.T @ J)
    half = stats.t.ppf(0.975, dof) * np.sqrt(np.diag(covariance))
    return {"level": solution.x[0], "log10Corner": solution.x[1], "half": half.tolist(), "active": int(active.sum())}
def both(points):
    x = np.log10(np.array(points["frequencyHz"]))
    return {
        "ad": fit(x, 20 * np.log10(points["ad"]), [False] * len(x), [20.0, float(x[-1])]),
        "cmrr": fit(x, points["cmrrDb"], points["bound"], [float(np.max(points["cmrrDb"])), float(np.mean(x))]),
    }
print(json.dumps({
    "fits": [both(points) for points in d["datasets"]],
    "t": [[float(stats.t.ppf(p, n)) for n in d["degrees"]] for p in d["probabilities"]],
}))
`;

interface ScipyRolloff {
  level: number;
  log10Corner: number;
  half: [number, number];
  active: number;
}

const tProbabilities = [0.025, 0.6, 0.9, 0.975, 0.995];
const tDegrees = [1, 2, 3, 4, 7, 12, 30, 120, 1998];
// Noisy first-order data (invented): 92 dB, 3 kHz corner, fp = 80 kHz, 0.4 dB scatter.
const noisyPoints = modelPoints({
  frequencyHz: logSpaced(20, 500e3, 60), cmrrDcDb: 92, cornerHz: 3e3, bandwidthHz: 80e3, noiseDb: 0.4, seed: 7,
});
// The same with bounds: at the three lowest frequencies 30 dB under the curve (they must not
// count), at the three highest 1.5 dB over it (they hold the curve up).
const censoredFrequencyHz = logSpaced(20, 500e3, 60);
const censoredPoints = modelPoints({
  frequencyHz: censoredFrequencyHz, cmrrDcDb: 92, cornerHz: 3e3, noiseDb: 0.4, seed: 11,
  bounds: new Map(
    [0, 1, 2, 57, 58, 59].map((index) => [
      index,
      92 - 10 * Math.log10(1 + (censoredFrequencyHz[index] / 3e3) ** 2) + (index < 3 ? -30 : 1.5),
    ]),
  ),
});

let scipyCache: { fits: { ad: ScipyRolloff; cmrr: ScipyRolloff }[]; t: number[][] } | undefined;
function scipyReferences() {
  scipyCache ??= runPython(scipyScript, {
    datasets: [noisyPoints, censoredPoints].map((points) => ({
      frequencyHz: points.map((point) => point.frequencyHz),
      ad: points.map((point) => point.ad),
      cmrrDb: points.map((point) => point.cmrrDb),
      bound: points.map((point) => point.lowerBound),
    })),
    probabilities: tProbabilities,
    degrees: tDegrees,
  });
  return scipyCache!;
}

describe('studentTQuantile', () => {
  it('gives the textbook 97.5 % point for 10 degrees of freedom', () => {
    // t(0.975, 10) = 2.228 in every statistics table (from memory).
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
  });

  it.skipIf(!hasNumpy)('agrees with scipy.stats.t.ppf across probabilities and degrees of freedom', () => {
    const reference = scipyReferences().t; // scipy.stats.t.ppf(p, n), in scipyScript
    tProbabilities.forEach((probability, i) =>
      tDegrees.forEach((degreesOfFreedom, j) => {
        const value = studentTQuantile(probability, degreesOfFreedom);
        expect(Math.abs(value - reference[i][j])).toBeLessThan(QUANTILE_AGREEMENT * Math.max(1, Math.abs(reference[i][j])));
      }),
    );
  });

  it('rejects a probability outside (0, 1) and non-positive degrees of freedom', () => {
    expect(() => studentTQuantile(1, 5)).toThrow(/studentTQuantile: probability must be inside/);
    expect(() => studentTQuantile(0.5, 0)).toThrow(/degrees of freedom must be positive/);
  });
});

describe('fitCmrrFrequencyResponse', () => {
  const band = logSpaced(10, 1e6, 41);

  it('recovers dc CMRR, corner, bandwidth, Acm0 and k from exact first-order model values', () => {
    // Known answer: the DOMAIN.md model evaluated at 86 dB, 12 kHz corner, Ad0 = 10, fp = 200 kHz.
    const fit = fitCmrrFrequencyResponse(modelPoints({ frequencyHz: band, cmrrDcDb: 86, cornerHz: 12e3, bandwidthHz: 200e3 }));
    expect(fit.model).toBe('first-order');
    expect(Math.abs(fit.cmrrDcDb! - 86)).toBeLessThan(EXACT_RECOVERY);
    expect(Math.abs(fit.cmrrCornerHz! / 12e3 - 1)).toBeLessThan(EXACT_RECOVERY);
    expect(Math.abs(fit.bandwidthHz! / 200e3 - 1)).toBeLessThan(EXACT_RECOVERY);
    expect(Math.abs(fit.differentialGainDc - 10)).toBeLessThan(EXACT_RECOVERY);
    const acm0 = 10 / 10 ** (86 / 20);
    expect(Math.abs(fit.commonModeGainModel!.acm0 / acm0 - 1)).toBeLessThan(EXACT_RECOVERY);
    expect(Math.abs(fit.commonModeGainModel!.kPerHz / (acm0 / 12e3) - 1)).toBeLessThan(EXACT_RECOVERY);
    expect(fit.residualRmsDb).toBeLessThan(EXACT_RECOVERY);
    // Exact data: the intervals collapse onto the values.
    expect(fit.cmrrDcDbInterval95![1] - fit.cmrrDcDbInterval95![0]).toBeLessThan(EXACT_RECOVERY);
    expect(fit.degreesOfFreedom).toBe(39);
  });

  it('states the regimes: flat below the corner, rising common-mode gain above it', () => {
    const fit = fitCmrrFrequencyResponse(modelPoints({ frequencyHz: band, cmrrDcDb: 86, cornerHz: 12e3 }));
    expect(fit.regimes.map((span) => span.limitedBy)).toEqual(['flat', 'rising-common-mode']);
    expect(fit.regimes[0].fromHz).toBe(10);
    expect(Math.abs(fit.regimes[0].toHz / 12e3 - 1)).toBeLessThan(EXACT_RECOVERY);
    expect(fit.regimes[1].toHz).toBeCloseTo(1e6, 3);
    expect(fit.regimeSentence).toMatch(/^Below 12 kHz rejection is flat near 86\.0 dB, limited by resistor mismatch/);
    expect(fit.regimeSentence).toContain('above 12 kHz rejection is falling');
  });

  it('measures the high-frequency slope above 3× the corner close to the model asymptote of −20 dB/decade', () => {
    const fit = fitCmrrFrequencyResponse(modelPoints({ frequencyHz: band, cmrrDcDb: 86, cornerHz: 12e3 }));
    const slope = fit.highFrequencySlope!;
    expect(slope.method).toBe('regression');
    expect(slope.fromHz).toBeGreaterThanOrEqual(36e3);
    // The first-order curve's local slope is −20·u/(1+u), u = (f/fc)² (differentiating the model):
    // between 3× and 83× the corner it runs from −18 to −19.997 dB/decade, so a line through it lies between.
    expect(slope.dbPerDecade).toBeLessThan(-18);
    expect(slope.dbPerDecade).toBeGreaterThan(-20);
  });

  it('falls back to the model slope at the top frequency when fewer than 3 points lie above 3× the corner', () => {
    const fit = fitCmrrFrequencyResponse(modelPoints({ frequencyHz: band, cmrrDcDb: 86, cornerHz: 200e3 }));
    const slope = fit.highFrequencySlope!;
    expect(slope.method).toBe('model-at-highest-frequency');
    // −20·u/(1+u) with u = (1 MHz / 200 kHz)² = 25: −20·25/26 = −19.23 dB/decade (differentiating the model).
    expect(Math.abs(slope.dbPerDecade - (-20 * 25) / 26)).toBeLessThan(EXACT_RECOVERY);
  });

  it.skipIf(!hasNumpy)('agrees with scipy.optimize.least_squares on noisy data: values and 95 % intervals', () => {
    const fit = fitCmrrFrequencyResponse(noisyPoints);
    const reference = scipyReferences().fits[0];
    expect(fit.model).toBe('first-order');
    expect(Math.abs(fit.cmrrDcDb! - reference.cmrr.level)).toBeLessThan(SOLVER_AGREEMENT);
    expect(Math.abs(Math.log10(fit.cmrrCornerHz!) - reference.cmrr.log10Corner)).toBeLessThan(SOLVER_AGREEMENT);
    expect(Math.abs(Math.log10(fit.bandwidthHz!) - reference.ad.log10Corner)).toBeLessThan(SOLVER_AGREEMENT);
    const levelHalfWidth = (fit.cmrrDcDbInterval95![1] - fit.cmrrDcDbInterval95![0]) / 2;
    expect(Math.abs(levelHalfWidth / reference.cmrr.half[0] - 1)).toBeLessThan(INTERVAL_AGREEMENT);
    const cornerHalfWidthDecades = Math.log10(fit.cmrrCornerHzInterval95![1] / fit.cmrrCornerHz!);
    expect(Math.abs(cornerHalfWidthDecades / reference.cmrr.half[1] - 1)).toBeLessThan(INTERVAL_AGREEMENT);
    // And the truth lies inside the intervals (a 95 % statement; seed 7 is one such case).
    expect(fit.cmrrDcDbInterval95![0]).toBeLessThan(92);
    expect(fit.cmrrDcDbInterval95![1]).toBeGreaterThan(92);
  });

  it.skipIf(!hasNumpy)('agrees with scipy on censored data, where active bounds count and inactive ones do not', () => {
    const fit = fitCmrrFrequencyResponse(censoredPoints);
    const reference = scipyReferences().fits[1];
    expect(fit.model).toBe('first-order');
    expect(fit.activeBoundCount).toBe(3);
    expect(fit.activePointCount).toBe(reference.cmrr.active);
    expect(Math.abs(fit.cmrrDcDb! - reference.cmrr.level)).toBeLessThan(SOLVER_AGREEMENT);
    expect(Math.abs(Math.log10(fit.cmrrCornerHz!) - reference.cmrr.log10Corner)).toBeLessThan(SOLVER_AGREEMENT);
    const levelHalfWidth = (fit.cmrrDcDbInterval95![1] - fit.cmrrDcDbInterval95![0]) / 2;
    expect(Math.abs(levelHalfWidth / reference.cmrr.half[0] - 1)).toBeLessThan(INTERVAL_AGREEMENT);
  });

  it('ignores a bound the fitted curve already clears and is held up by one it does not', () => {
    const base = { frequencyHz: band, cmrrDcDb: 86, cornerHz: 12e3, noiseDb: 0.3, seed: 3 };
    const resolvedOnly = modelPoints(base).filter((_, index) => index !== 40);
    const withLowBound = modelPoints({ ...base, bounds: new Map([[40, 20]]) });
    const withHighBound = modelPoints({ ...base, bounds: new Map([[40, 60]]) });
    const reference = fitCmrrFrequencyResponse(resolvedOnly);
    const low = fitCmrrFrequencyResponse(withLowBound);
    const high = fitCmrrFrequencyResponse(withHighBound);
    // At 1 MHz the curve is near 86 − 20·log10(1e6/12e3) ≈ 47.6 dB (model arithmetic): a 20 dB
    // bound is cleared (no effect), a 60 dB bound is not (it pulls the corner up).
    expect(low.activeBoundCount).toBe(0);
    expect(Math.abs(low.cmrrCornerHz! - reference.cmrrCornerHz!)).toBeLessThan(EXACT_RECOVERY * reference.cmrrCornerHz!);
    expect(high.activeBoundCount).toBe(1);
    expect(high.cmrrCornerHz!).toBeGreaterThan(reference.cmrrCornerHz! * 1.01);
    expect(high.residualsDb[40]).toBeGreaterThan(0);
  });

  it('reports the bandwidth as unknown, with a reason, when the differential gain does not roll off in the band', () => {
    const fit = fitCmrrFrequencyResponse(modelPoints({ frequencyHz: band, cmrrDcDb: 86, cornerHz: 12e3 }));
    expect(fit.bandwidthHz).toBeNull();
    expect(fit.bandwidthHzInterval95).toBeNull();
    expect(fit.bandwidthNote).toContain('above the measured range');
    // Flat Ad = 10 exactly (the generator's Ad0).
    expect(Math.abs(fit.differentialGainDc - 10)).toBeLessThan(EXACT_RECOVERY);
  });

  describe('when the first-order model does not describe the data', () => {
    it('falls back to a smooth curve when the corner lies above the measured range, still giving the flat level', () => {
      const fit = fitCmrrFrequencyResponse(
        modelPoints({ frequencyHz: logSpaced(10, 10e3, 31), cmrrDcDb: 100, cornerHz: 1e9, noiseDb: 0.2, seed: 5 }),
      );
      expect(fit.model).toBe('smooth');
      expect(fit.modelReason).toContain('above the resolved range');
      expect(fit.modelReason).toContain('rising part (k) cannot be identified');
      expect(fit.cmrrCornerHz).toBeNull();
      expect(fit.cmrrDcDbInterval95).toBeNull();
      // The flat level is 100 dB (generator); 0.2 dB noise on 31 points leaves the smooth end within 0.5 dB.
      expect(Math.abs(fit.cmrrDcDb! - 100)).toBeLessThan(0.5);
      expect(fit.regimes.map((span) => span.limitedBy)).toEqual(['flat']);
      expect(fit.regimeSentence).toMatch(/^Across 10 Hz–10 kHz rejection is flat/);
    });

    it('gives no fitted value outside the resolved range of the smooth curve (floor-limited ends)', () => {
      // The corner above the band forces the smooth curve; the lowest five and the highest two
      // frequencies are floor-limited (bounds at 90 dB, below the 100 dB level).
      const bounds = new Map([0, 1, 2, 3, 4, 29, 30].map((index) => [index, 90] as [number, number]));
      const fit = fitCmrrFrequencyResponse(
        modelPoints({ frequencyHz: logSpaced(10, 10e3, 31), cmrrDcDb: 100, cornerHz: 1e9, noiseDb: 0.2, seed: 5, bounds }),
      );
      expect(fit.model).toBe('smooth');
      for (const index of [0, 1, 2, 3, 4, 29, 30]) {
        expect(fit.fittedCmrrDb[index]).toBeNaN();
        expect(fit.residualsDb[index]).toBeNaN();
      }
      for (let index = 5; index <= 28; index++) expect(Number.isFinite(fit.fittedCmrrDb[index])).toBe(true);
      expect(fit.activeBoundCount).toBe(0);
      expect(Number.isFinite(fit.residualRmsDb)).toBe(true);
    });

    it('falls back when the corner lies below the measured range, giving no dc value but the slope', () => {
      const fit = fitCmrrFrequencyResponse(
        modelPoints({ frequencyHz: logSpaced(1e3, 1e6, 31), cmrrDcDb: 100, cornerHz: 10, noiseDb: 0.2, seed: 9 }),
      );
      expect(fit.model).toBe('smooth');
      expect(fit.modelReason).toContain('below the resolved range');
      expect(fit.cmrrDcDb).toBeNull();
      // 100 or more times above the corner the model falls 20 dB/decade (model arithmetic); 0.2 dB noise.
      expect(Math.abs(fit.highFrequencySlope!.dbPerDecade + 20)).toBeLessThan(1);
      expect(fit.regimes.map((span) => span.limitedBy)).toEqual(['rising-common-mode']);
    });

    it('falls back when the CMRR rises with frequency, and calls the rise unexplained', () => {
      const points = modelPoints({ frequencyHz: band, cmrrDcDb: 80, cornerHz: 1e9 });
      // A 12 dB resonance-like bump of CMRR over 1–10 kHz (invented shape for the test).
      for (const point of points) {
        const bump = 12 * Math.exp(-((Math.log10(point.frequencyHz) - 3.5) ** 2) / 0.05);
        point.cmrrDb += bump;
        point.acm /= 10 ** (bump / 20);
      }
      const fit = fitCmrrFrequencyResponse(points);
      expect(fit.model).toBe('smooth');
      const rise = /the measured CMRR rises by (\d+\.\d) dB between/.exec(fit.modelReason);
      // The 5-point running median trims the 12 dB peak (8 points a decade) but keeps well over 3 dB.
      expect(Number(rise?.[1])).toBeGreaterThan(3);
      expect(Number(rise?.[1])).toBeLessThanOrEqual(12);
      expect(fit.regimes.some((span) => span.limitedBy === 'unexplained')).toBe(true);
    });

    it('falls back when the residual RMS is too large for a monotone but steeper roll-off', () => {
      // A second-order roll-off, 40 dB/decade above 1 kHz (invented shape for the test).
      const points = modelPoints({ frequencyHz: band, cmrrDcDb: 100, cornerHz: 1e9 });
      for (const point of points) {
        const drop = 10 * Math.log10(1 + (point.frequencyHz / 1e3) ** 4);
        point.cmrrDb -= drop;
        point.acm *= 10 ** (drop / 20);
      }
      const fit = fitCmrrFrequencyResponse(points);
      expect(fit.model).toBe('smooth');
      expect(fit.modelReason).toMatch(/residual RMS is \d+\.\d\d dB, above 1\.5 dB/);
      expect(fit.smoothDegree).toBeGreaterThanOrEqual(2);
      expect(fit.residualRmsDb).toBeLessThan(1.5);
    });

    it('fits nothing with fewer than 3 resolved points, and says so', () => {
      const bounds = new Map(Array.from({ length: 39 }, (_, index) => [index, 90] as [number, number]));
      const fit = fitCmrrFrequencyResponse(modelPoints({ frequencyHz: band, cmrrDcDb: 86, cornerHz: 12e3, bounds }));
      expect(fit.model).toBe('none');
      expect(fit.modelReason).toContain('only 2 point(s) are resolved');
      expect(fit.cmrrDcDb).toBeNull();
    });
  });

  it('rejects fewer than 2 points', () => {
    const [single] = modelPoints({ frequencyHz: [100], cmrrDcDb: 80, cornerHz: 1e3 });
    expect(() => fitCmrrFrequencyResponse([single])).toThrow(EngineInputError);
    expect(() => fitCmrrFrequencyResponse([single])).toThrow(/fitCmrrFrequencyResponse: needs at least 2 paired points, got 1/);
  });
});

describe('analyzeSweeps', () => {
  it('parses, pairs and fits two CSV sweeps', () => {
    const frequencies = logSpaced(10, 1e6, 21);
    const differential = `frequency_hz,vin_v,vout_v\n${frequencies.map((f) => `${f},0.1,1`).join('\n')}\n`;
    const acm0 = 10 / 10 ** (80 / 20);
    const commonMode =
      `frequency_hz;vin_v;vout_v;floor_v\n` +
      frequencies.map((f) => `${f};1;${Math.sqrt(acm0 ** 2 + ((acm0 / 5e3) * f) ** 2)};1e-9`).join('\n');
    const analysis = analyzeSweeps(differential, commonMode, { differentialFile: 'd.csv', commonModeFile: 'c.csv' });
    expect(analysis.points).toHaveLength(21);
    // Known answer: generated at 80 dB and a 5 kHz corner.
    expect(Math.abs(analysis.fit.cmrrDcDb! - 80)).toBeLessThan(EXACT_RECOVERY);
    expect(Math.abs(analysis.fit.cmrrCornerHz! / 5e3 - 1)).toBeLessThan(EXACT_RECOVERY);
  });

  it('passes on file-named errors from the reader', () => {
    expect(() => analyzeSweeps('frequency_hz,vin_v,vout_v\n100,1,1\n200,1,1\n', '', { commonModeFile: 'c.csv' })).toThrow(
      /^c\.csv: parseSweepCsv: the sweep file is empty/,
    );
  });
});
