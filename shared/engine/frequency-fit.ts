// Regression of measured CMRR against frequency: the first-order model of DOMAIN.md, fitted in
// the log domain with censored (floor-limited) points, or a smooth log-log curve when that model
// does not describe the data.
//
// The Levenberg–Marquardt iteration is written out here rather than taken from
// ml-levenberg-marquardt: that package has no way to switch residuals on and off for censored
// points, and it stops only on an absolute error threshold or its iteration limit, so on noisy data
// it runs every iteration, each building ml-matrix objects. Measured here on the 1,000-point sweep of
// bench/frequency-fit.bench.ts (CMRR model only, resolved points, its analytic-Jacobian option):
// 26–80 ms for its 100 iterations (machine load varies), against about 0.3 ms for this whole
// analysis. The models have two parameters and closed-form derivatives, so a loop over
// Float64Arrays is short.
import { PolynomialRegression } from 'ml-regression-polynomial';
import { gammaln, probit } from 'simple-statistics';
import { pairCmrrPoints, type CmrrPoint } from './cmrr-points';
import { EngineInputError } from './errors';
import { parseSweepCsv, type Sweep } from './sweep-file';

// ---------------------------------------------------------------------------------------------
// Student t quantile (needed for the 95 % intervals; simple-statistics has the normal quantile only)

const maximumContinuedFractionTerms = 300;
const continuedFractionTolerance = 1e-15;

/** Continued fraction of the incomplete beta function (modified Lentz; A&S 26.5.8). */
function incompleteBetaFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let fraction = d;
  for (let m = 1; m <= maximumContinuedFractionTerms; m++) {
    const twoM = 2 * m;
    let term = (m * (b - m) * x) / ((a + twoM - 1) * (a + twoM));
    d = 1 + term * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + term / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    fraction *= d * c;
    term = (-(a + m) * (a + b + m) * x) / ((a + twoM) * (a + twoM + 1));
    d = 1 + term * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + term / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    fraction *= delta;
    if (Math.abs(delta - 1) < continuedFractionTolerance) break;
  }
  return fraction;
}

/** Regularized incomplete beta function I_x(a, b) (A&S 26.5.8 with the symmetry I_x(a,b) = 1 − I_(1−x)(b,a)). */
function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const logFront = gammaln(a + b) - gammaln(a) - gammaln(b) + a * Math.log(x) + b * Math.log(1 - x);
  if (x < (a + 1) / (a + b + 2)) return (Math.exp(logFront) * incompleteBetaFraction(x, a, b)) / a;
  return 1 - (Math.exp(logFront) * incompleteBetaFraction(1 - x, b, a)) / b;
}

function studentTCumulative(t: number, degreesOfFreedom: number): number {
  const tail = 0.5 * regularizedIncompleteBeta(degreesOfFreedom / (degreesOfFreedom + t * t), degreesOfFreedom / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

function studentTDensity(t: number, degreesOfFreedom: number): number {
  const nu = degreesOfFreedom;
  return Math.exp(
    gammaln((nu + 1) / 2) - gammaln(nu / 2) - 0.5 * Math.log(nu * Math.PI) - ((nu + 1) / 2) * Math.log1p((t * t) / nu),
  );
}

/**
 * Quantile of Student's t distribution: the t with P(T ≤ t) = `probability` for
 * `degreesOfFreedom` degrees of freedom. Closed forms for 1 and 2 degrees of freedom; otherwise
 * the Cornish–Fisher start of Abramowitz & Stegun 26.7.5 refined by Newton steps on the
 * cumulative distribution (A&S 26.7.1 through the incomplete beta function, 26.5.8). Agrees with
 * scipy.stats.t.ppf to about 1e-10 (tests/shared/engine/frequency-fit.test.ts). Cost O(1).
 *
 * Throws RangeError when the probability is outside (0, 1) or the degrees of freedom are not positive.
 *
 * @example studentTQuantile(0.975, 10) // 2.2281388519649385
 */
export function studentTQuantile(probability: number, degreesOfFreedom: number): number {
  if (!(probability > 0 && probability < 1)) {
    throw new RangeError(`studentTQuantile: probability must be inside (0, 1), got ${probability}`);
  }
  if (!(degreesOfFreedom > 0)) {
    throw new RangeError(`studentTQuantile: degrees of freedom must be positive, got ${degreesOfFreedom}`);
  }
  const nu = degreesOfFreedom;
  if (nu === 1) return Math.tan(Math.PI * (probability - 0.5));
  if (nu === 2) return (2 * probability - 1) / Math.sqrt(2 * probability * (1 - probability));
  const z = probit(probability);
  const z3 = z ** 3;
  const z5 = z ** 5;
  const z7 = z ** 7;
  let t =
    z +
    (z3 + z) / (4 * nu) +
    (5 * z5 + 16 * z3 + 3 * z) / (96 * nu ** 2) +
    (3 * z7 + 19 * z5 + 17 * z3 - 15 * z) / (384 * nu ** 3);
  for (let step = 0; step < 30; step++) {
    const correction = (studentTCumulative(t, nu) - probability) / studentTDensity(t, nu);
    t -= correction;
    if (Math.abs(correction) <= 1e-13 * Math.max(1, Math.abs(t))) break;
  }
  return t;
}

// ---------------------------------------------------------------------------------------------
// The first-order roll-off in dB, y(f) = levelDb − 10·log10(1 + (f/fc)²), fitted with censoring.
// For CMRR it is 20·log10(Ad0/Acm0) − 10·log10(1 + (f·k/Acm0)²); for |Ad| it is 20·log10(Ad0)
// − 10·log10(1 + (f/fp)²): the same two-parameter curve with different meanings.

interface RolloffFit {
  levelDb: number;
  log10CornerHz: number;
  /** Covariance of [levelDb, log10CornerHz] (s²·(JᵀJ)⁻¹), or null when JᵀJ is singular. */
  covariance: [number, number, number] | null;
  sumOfSquaresDb2: number;
  /** Residuals that count: every uncensored point plus the bound points the curve falls below. */
  activeCount: number;
  activeBoundCount: number;
  iterations: number;
  /** True when log10CornerHz ended on the limit placed around the measured range. */
  atLimit: boolean;
}

// How far outside the measured range the corner may wander before the iteration stops it there:
// beyond two decades the curve is flat (or a straight line) across the data to within 0.0004 dB.
const cornerLimitDecades = 2;
const maximumIterations = 100;
// Steps below these are beyond any meaning for a bench measurement (dB and decades).
const stepToleranceDb = 1e-10;
const stepToleranceDecades = 1e-10;

/**
 * Levenberg–Marquardt on residuals r = y − model, with bound points active only where the model
 * falls below them (a one-sided residual: a censored point never pulls the curve down).
 */
function fitRolloff(
  log10FrequencyHz: Float64Array,
  frequencyHzSquared: Float64Array,
  valueDb: Float64Array,
  isBound: Uint8Array,
): RolloffFit {
  const n = valueDb.length;
  let minimumLog10 = Infinity;
  let maximumLog10 = -Infinity;
  for (let i = 0; i < n; i++) {
    if (log10FrequencyHz[i] < minimumLog10) minimumLog10 = log10FrequencyHz[i];
    if (log10FrequencyHz[i] > maximumLog10) maximumLog10 = log10FrequencyHz[i];
  }
  const lowestCorner = minimumLog10 - cornerLimitDecades;
  const highestCorner = maximumLog10 + cornerLimitDecades;

  // Start: profile the corner over a coarse grid on about 48 of the points. For a given corner
  // the best level is the mean of the points shifted by the roll-off, and the sum of squares
  // follows from the first two moments of the shifted values.
  let stride = Math.max(1, Math.floor(n / 48));
  let sampledResolved = 0;
  for (let i = 0; i < n; i += stride) if (!isBound[i]) sampledResolved++;
  if (sampledResolved < 3) stride = 1;
  let log10Corner = highestCorner;
  let level = 0;
  let startSum = Infinity;
  const gridSteps = 24;
  for (let g = 0; g <= gridSteps; g++) {
    const trialCorner = lowestCorner + ((highestCorner - lowestCorner) * g) / gridSteps;
    const inverseCornerSquared = 10 ** (-2 * trialCorner);
    let shifted = 0;
    let shiftedSquares = 0;
    let count = 0;
    for (let i = 0; i < n; i += stride) {
      if (isBound[i]) continue;
      const value = valueDb[i] + 10 * Math.log10(1 + frequencyHzSquared[i] * inverseCornerSquared);
      shifted += value;
      shiftedSquares += value * value;
      count++;
    }
    const mean = shifted / count;
    const sum = shiftedSquares - count * mean * mean;
    if (sum < startSum) {
      startSum = sum;
      log10Corner = trialCorner;
      level = mean;
    }
  }

  // One pass over the data gives the sum of squares and the normal equations JᵀJ, Jᵀr together
  // (r = y − model; d model/d level = 1, d model/d log10Corner = 20·u/(1 + u), u = (f/fc)²), so
  // an accepted trial step needs no second pass.
  // Layout: [sum, JᵀJ00, JᵀJ01, JᵀJ11, Jᵀr0, Jᵀr1, active count, active bound count].
  let current = new Float64Array(8);
  let trial = new Float64Array(8);
  const evaluate = (trialLevel: number, trialLog10Corner: number, into: Float64Array): void => {
    const inverseCornerSquared = 10 ** (-2 * trialLog10Corner);
    let sum = 0;
    let a01 = 0;
    let a11 = 0;
    let g0 = 0;
    let g1 = 0;
    let active = 0;
    let activeBound = 0;
    for (let i = 0; i < n; i++) {
      const u = frequencyHzSquared[i] * inverseCornerSquared;
      const residual = valueDb[i] - trialLevel + 10 * Math.log10(1 + u);
      if (isBound[i] === 1) {
        if (residual <= 0) continue;
        activeBound++;
      }
      active++;
      const slope = (20 * u) / (1 + u);
      sum += residual * residual;
      a01 += slope;
      a11 += slope * slope;
      g0 += residual;
      g1 += slope * residual;
    }
    into[0] = sum;
    into[1] = active;
    into[2] = a01;
    into[3] = a11;
    into[4] = g0;
    into[5] = g1;
    into[6] = active;
    into[7] = activeBound;
  };

  evaluate(level, log10Corner, current);
  let damping = 1e-4;
  let iterations = 0;
  let converged = false;
  for (; iterations < maximumIterations; iterations++) {
    const a00 = current[1];
    const a01 = current[2];
    const a11 = current[3];
    const g0 = current[4];
    const g1 = current[5];
    let accepted = false;
    for (let attempt = 0; attempt < 30 && !accepted; attempt++) {
      // Marquardt's scaling of the diagonal, kept away from zero where the corner is unidentified.
      const d00 = a00 * (1 + damping) + 1e-12;
      const d11 = a11 * (1 + damping) + 1e-12 * (a00 + 1);
      const determinant = d00 * d11 - a01 * a01;
      const stepLevel = (d11 * g0 - a01 * g1) / determinant;
      const trialCorner = Math.min(
        highestCorner,
        Math.max(lowestCorner, log10Corner + (d00 * g1 - a01 * g0) / determinant),
      );
      const stepCorner = trialCorner - log10Corner;
      if (Math.abs(stepLevel) < stepToleranceDb && Math.abs(stepCorner) < stepToleranceDecades) {
        converged = true;
        break;
      }
      evaluate(level + stepLevel, trialCorner, trial);
      if (trial[0] <= current[0]) {
        level += stepLevel;
        log10Corner = trialCorner;
        const previous = current;
        current = trial;
        trial = previous;
        damping = Math.max(damping / 10, 1e-12);
        accepted = true;
      } else {
        damping *= 10;
      }
    }
    if (converged || !accepted) break;
  }

  const sum = current[0];
  const a00 = current[1];
  const a01 = current[2];
  const a11 = current[3];
  const activeCount = current[6];
  const activeBoundCount = current[7];
  const determinant = a00 * a11 - a01 * a01;
  const degreesOfFreedom = activeCount - 2;
  let covariance: RolloffFit['covariance'] = null;
  if (degreesOfFreedom > 0 && determinant > 1e-12 * (a00 * a11 + 1e-300)) {
    const variance = sum / degreesOfFreedom;
    covariance = [(variance * a11) / determinant, (-variance * a01) / determinant, (variance * a00) / determinant];
  }
  const atLimit =
    Math.abs(log10Corner - highestCorner) < 1e-9 || Math.abs(log10Corner - lowestCorner) < 1e-9;
  return {
    levelDb: level,
    log10CornerHz: log10Corner,
    covariance,
    sumOfSquaresDb2: sum,
    activeCount,
    activeBoundCount,
    iterations,
    atLimit,
  };
}

// ---------------------------------------------------------------------------------------------
// Results

/** A span of frequencies and what limits the rejection there. */
export interface RegimeSpan {
  fromHz: number;
  toHz: number;
  /**
   * `flat`: CMRR changes less than 10 dB/decade — resistor mismatch and the op-amp's dc rejection.
   * `rising-common-mode`: CMRR falls 10 dB/decade or faster — the common-mode gain rises with
   * frequency (op-amp rejection roll-off, capacitive imbalance); the first-order model gives 20.
   * `unexplained`: CMRR rises 10 dB/decade or faster, which neither part of the model does.
   */
  limitedBy: 'flat' | 'rising-common-mode' | 'unexplained';
}

/** The measured slope of CMRR at the top of the band. */
export interface HighFrequencySlope {
  dbPerDecade: number;
  interval95: [number, number];
  fromHz: number;
  toHz: number;
  /**
   * `regression`: a straight line through the resolved points above 3× the corner (first-order
   * model) or in the top decade (smooth model), t-interval from its standard error.
   * `model-at-highest-frequency`: the first-order curve's local slope at the highest frequency,
   * interval by the delta method, used when fewer than 3 resolved points lie above 3× the corner.
   */
  method: 'regression' | 'model-at-highest-frequency';
  pointCount: number;
}

/** Result of {@link fitCmrrFrequencyResponse}. */
export interface FrequencyFit {
  /** Which description was used; `none` when too few resolved points to fit anything. */
  model: 'first-order' | 'smooth' | 'none';
  /** Why this model: the checks the first-order model passed, or the first one it failed. */
  modelReason: string;
  /** CMRR at low frequency, 20·log10(Ad0/Acm0), dB; null when the data cannot show it. */
  cmrrDcDb: number | null;
  cmrrDcDbInterval95: [number, number] | null;
  /** −3 dB corner of the CMRR, Acm0/k, in Hz; null when outside the data. */
  cmrrCornerHz: number | null;
  cmrrCornerHzInterval95: [number, number] | null;
  /** Closed-loop bandwidth fp of the differential gain, Hz; null when outside the measured range. */
  bandwidthHz: number | null;
  bandwidthHzInterval95: [number, number] | null;
  /** Why the bandwidth is null, when it is. */
  bandwidthNote?: string;
  /** Differential gain at low frequency, Ad0 (dimensionless), from the |Ad(f)| fit. */
  differentialGainDc: number;
  /** Common-mode model |Acm(f)|² = (Acm0² + (k·f)²)/(1 + (f/fp)²): Acm0 and k (per Hz); first-order only. */
  commonModeGainModel: { acm0: number; kPerHz: number } | null;
  highFrequencySlope: HighFrequencySlope | null;
  /**
   * Fitted CMRR at each point's frequency, dB (same order as the points). NaN where there is no
   * fitted value: every point of model `none`, and the points of the smooth description outside
   * its resolved range (lower bounds below the lowest or above the highest resolved frequency).
   * JSON carries NaN as null.
   */
  fittedCmrrDb: number[];
  /** Measured (or bound) minus fitted CMRR at each point, dB; NaN where `fittedCmrrDb` is. For a bound point a positive value means the fit lies below the bound. */
  residualsDb: number[];
  /** Root mean square of the residuals of the resolved (non-bound) points, dB. */
  residualRmsDb: number;
  /** Points that carried weight in the fit: resolved points plus bound points the fit lies below. */
  activePointCount: number;
  activeBoundCount: number;
  degreesOfFreedom: number;
  /** The smooth fallback's polynomial degree in log10(f), when `model` is `smooth`. */
  smoothDegree?: number;
  regimes: RegimeSpan[];
  /** One readable sentence saying which part limits rejection where. */
  regimeSentence: string;
}

/** Options for {@link fitCmrrFrequencyResponse}. */
export interface FrequencyFitOptions {
  /**
   * Largest RMS residual (dB) for which the first-order model is said to describe the data.
   * Default 1.5 dB: common practice, no source (repeat readings of a bench CMRR sweep scatter by
   * a fraction of a dB; a model off by more than that misdescribes the shape).
   */
  maxResidualRmsDb?: number;
  /**
   * How much (dB) the measured CMRR may rise with frequency (after a 5-point running median)
   * before the data are called non-monotone. Default 3 dB: common practice, no source.
   */
  monotoneToleranceDb?: number;
}

const confidenceLevel = 0.95;
// A corner or bandwidth whose 95 % interval reaches more than this far (decades) either side of
// the estimate is not identified by the data.
const identifiedHalfWidthDecades = 1;
// The regime boundary: the first-order CMRR curve falls exactly 10 dB/decade at its corner.
const regimeSlopeDbPerDecade = 10;

function formatHz(frequencyHz: number): string {
  if (frequencyHz >= 1e6) return `${+(frequencyHz / 1e6).toPrecision(3)} MHz`;
  if (frequencyHz >= 1e3) return `${+(frequencyHz / 1e3).toPrecision(3)} kHz`;
  return `${+frequencyHz.toPrecision(3)} Hz`;
}

/** Ordinary least squares line y = a + b·x with a t-interval for b; null below 3 points. */
function straightLine(x: number[], y: number[]): { slope: number; halfWidth: number } | null {
  const n = x.length;
  if (n < 3) return null;
  let meanX = 0;
  let meanY = 0;
  for (let i = 0; i < n; i++) {
    meanX += x[i];
    meanY += y[i];
  }
  meanX /= n;
  meanY /= n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - meanX) ** 2;
    sxy += (x[i] - meanX) * (y[i] - meanY);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (y[i] - meanY - slope * (x[i] - meanX)) ** 2;
  const standardError = Math.sqrt(sse / (n - 2) / sxx);
  return { slope, halfWidth: studentTQuantile(0.5 + confidenceLevel / 2, n - 2) * standardError };
}

/** Median of five numbers without sorting an array (six comparisons' worth of min/max). */
function medianOfFive(a: number, b: number, c: number, d: number, e: number): number {
  // Drop the smaller of the two pairs' minima and the larger of their maxima, then take the median of three.
  const lowAB = Math.min(a, b);
  const highAB = Math.max(a, b);
  const lowCD = Math.min(c, d);
  const highCD = Math.max(c, d);
  const keptLow = Math.max(lowAB, lowCD);
  const keptHigh = Math.min(highAB, highCD);
  return Math.max(Math.min(keptLow, keptHigh), Math.min(Math.max(keptLow, keptHigh), e));
}

/**
 * Largest rise along the sequence of a running median (5 points; 3 at the ends, plain values when
 * there are fewer than 5), with where it starts and ends. O(n).
 */
function largestRise(log10FrequencyHz: number[], valueDb: number[]): { riseDb: number; fromHz: number; toHz: number } {
  const n = valueDb.length;
  let lowest = Infinity;
  let lowestAt = 0;
  let riseDb = 0;
  let fromAt = 0;
  let toAt = 0;
  for (let i = 0; i < n; i++) {
    let median: number;
    if (i >= 2 && i + 2 < n) {
      median = medianOfFive(valueDb[i - 2], valueDb[i - 1], valueDb[i], valueDb[i + 1], valueDb[i + 2]);
    } else if (i >= 1 && i + 1 < n) {
      const a = valueDb[i - 1];
      const b = valueDb[i];
      const c = valueDb[i + 1];
      median = Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
    } else {
      median = valueDb[i];
    }
    if (median - lowest > riseDb) {
      riseDb = median - lowest;
      fromAt = lowestAt;
      toAt = i;
    }
    if (median < lowest) {
      lowest = median;
      lowestAt = i;
    }
  }
  return { riseDb, fromHz: 10 ** log10FrequencyHz[fromAt], toHz: 10 ** log10FrequencyHz[toAt] };
}

/** Contiguous spans of equal regime from local slopes (dB/decade) at each frequency. */
function regimesFromSlopes(frequencyHz: number[], slopeDbPerDecade: number[]): RegimeSpan[] {
  const spans: RegimeSpan[] = [];
  const classify = (slope: number): RegimeSpan['limitedBy'] =>
    slope <= -regimeSlopeDbPerDecade ? 'rising-common-mode' : slope >= regimeSlopeDbPerDecade ? 'unexplained' : 'flat';
  for (let i = 0; i < frequencyHz.length; i++) {
    const limitedBy = classify(slopeDbPerDecade[i]);
    const last = spans[spans.length - 1];
    if (last && last.limitedBy === limitedBy) {
      last.toHz = frequencyHz[i];
    } else {
      // Spans meet halfway (on log-f) between the two points that differ.
      const boundary = last ? Math.sqrt(frequencyHz[i - 1] * frequencyHz[i]) : frequencyHz[i];
      if (last) last.toHz = boundary;
      spans.push({ fromHz: boundary, toHz: frequencyHz[i], limitedBy });
    }
  }
  return spans;
}

function describeRegimes(spans: RegimeSpan[], cmrrDcDb: number | null): string {
  const words: Record<RegimeSpan['limitedBy'], string> = {
    flat: 'flat{level}, limited by resistor mismatch and the op-amp\'s dc rejection',
    'rising-common-mode':
      'falling (about 20 dB/decade in a first-order circuit), limited by the rising common-mode gain: op-amp rejection roll-off or capacitive imbalance',
    unexplained: 'rising with frequency, which neither resistor mismatch nor op-amp roll-off explains',
  };
  if (spans.length === 0) return 'No resolved points: rejection is known only as lower bounds.';
  const parts = spans.map((span, index) => {
    const range = spans.length === 1 ? `Across ${formatHz(span.fromHz)}–${formatHz(span.toHz)}` : index === 0
      ? `Below ${formatHz(span.toHz)}`
      : index === spans.length - 1
        ? `above ${formatHz(span.fromHz)}`
        : `from ${formatHz(span.fromHz)} to ${formatHz(span.toHz)}`;
    const level = span.limitedBy === 'flat' && index === 0 && cmrrDcDb !== null ? ` near ${cmrrDcDb.toFixed(1)} dB` : '';
    return `${range} rejection is ${words[span.limitedBy].replace('{level}', level)}`;
  });
  return `${parts.join('; ')}.`;
}

/**
 * Fits CMRR against frequency with the first-order model of DOMAIN.md ("Regression against
 * frequency"): `|Ad(f)|² = Ad0²/(1 + (f/fp)²)`, `|Acm(f)|² = (Acm0² + (k·f)²)/(1 + (f/fp)²)`, so
 * `CMRR(f) = Ad0/sqrt(Acm0² + (k·f)²)`, dc value `Ad0/Acm0`, corner `Acm0/k`.
 *
 * Both fits are in the log domain (residuals in dB, i.e. relative errors) by Levenberg–Marquardt
 * with analytic derivatives (standard nonlinear least squares): the differential gain in dB gives
 * Ad0 and fp; the CMRR in dB (in which fp cancels) gives Ad0/Acm0 and Acm0/k, hence Acm0 and k.
 * Lower-bound points are censored: a bound counts only where the fitted CMRR falls below it, so it
 * can hold the curve up but never pull it down (the active set is re-decided at every iteration).
 * 95 % intervals come from the covariance s²·(JᵀJ)⁻¹ at the solution with the Student t quantile
 * for (active points − 2) degrees of freedom (JCGM 100 GUM, and any nonlinear least-squares
 * text); the corner and bandwidth are fitted as log10 and their intervals are mapped back.
 *
 * The first-order model is kept only when the data are monotone (CMRR rises by at most
 * `monotoneToleranceDb` after a 5-point running median), the corner lies inside the resolved
 * frequency range with a 95 % interval narrower than a decade each side, and the residual RMS is
 * at most `maxResidualRmsDb`. Otherwise `model` is `smooth`, `modelReason` says which check failed,
 * and the CMRR is described by a polynomial in log10(f) (resolved points only; degree 1–8 chosen
 * by the corrected Akaike criterion) from which the low-frequency level, the −3 dB frequency, the
 * top-decade slope and the regimes are read where the data show them.
 *
 * Units: frequencies in Hz, gains dimensionless, levels and residuals in dB. Cost O(n) per
 * iteration for n points (typically 5–15 iterations); the smooth fallback adds O(n) per degree.
 *
 * Throws {@link EngineInputError} when there are fewer than 2 points.
 *
 * @example fitCmrrFrequencyResponse(points).cmrrDcDb // 80.0 for points of Ad0 = 10, Acm0 = 0.001
 */
export function fitCmrrFrequencyResponse(points: readonly CmrrPoint[], options: FrequencyFitOptions = {}): FrequencyFit {
  const maxResidualRmsDb = options.maxResidualRmsDb ?? 1.5;
  const monotoneToleranceDb = options.monotoneToleranceDb ?? 3;
  const n = points.length;
  if (n < 2) {
    throw new EngineInputError(`fitCmrrFrequencyResponse: needs at least 2 paired points, got ${n}`, { field: 'points' });
  }

  const log10FrequencyHz = new Float64Array(n);
  const frequencyHzSquared = new Float64Array(n);
  const cmrrDb = new Float64Array(n);
  const adDb = new Float64Array(n);
  const isBound = new Uint8Array(n);
  const noBounds = new Uint8Array(n);
  let resolvedCount = 0;
  for (let i = 0; i < n; i++) {
    const point = points[i];
    log10FrequencyHz[i] = Math.log10(point.frequencyHz);
    frequencyHzSquared[i] = point.frequencyHz * point.frequencyHz;
    cmrrDb[i] = point.cmrrDb;
    adDb[i] = 20 * Math.log10(point.ad);
    isBound[i] = point.lowerBound ? 1 : 0;
    if (!point.lowerBound) resolvedCount++;
  }

  // |Ad(f)|: level 20·log10(Ad0), corner fp. Needs 3 points for an interval.
  const tTwoSided = (degreesOfFreedom: number) => studentTQuantile(0.5 + confidenceLevel / 2, degreesOfFreedom);
  const adFit = fitRolloff(log10FrequencyHz, frequencyHzSquared, adDb, noBounds);
  const lowestHz = points[0].frequencyHz;
  const highestHz = points[n - 1].frequencyHz;
  let bandwidthHz: number | null = null;
  let bandwidthHzInterval95: [number, number] | null = null;
  let bandwidthNote: string | undefined;
  let differentialGainDc = 10 ** (adFit.levelDb / 20);
  const adHalfWidth = adFit.covariance ? tTwoSided(adFit.activeCount - 2) * Math.sqrt(adFit.covariance[2]) : Infinity;
  if (adFit.atLimit || adFit.log10CornerHz > Math.log10(highestHz) + 1 || adHalfWidth > identifiedHalfWidthDecades) {
    bandwidthNote = `the differential gain shows no resolvable roll-off up to ${formatHz(highestHz)}: the bandwidth lies above the measured range`;
    if (adFit.log10CornerHz < Math.log10(lowestHz)) {
      bandwidthNote = `the differential gain already rolls off at ${formatHz(lowestHz)}: the bandwidth lies below the measured range`;
    } else {
      // A flat differential gain: its level is the mean in dB.
      let sum = 0;
      for (let i = 0; i < n; i++) sum += adDb[i];
      differentialGainDc = 10 ** (sum / n / 20);
    }
  } else {
    bandwidthHz = 10 ** adFit.log10CornerHz;
    bandwidthHzInterval95 = [10 ** (adFit.log10CornerHz - adHalfWidth), 10 ** (adFit.log10CornerHz + adHalfWidth)];
  }

  const base = {
    bandwidthHz,
    bandwidthHzInterval95,
    ...(bandwidthNote ? { bandwidthNote } : {}),
    differentialGainDc,
  };

  if (resolvedCount < 3) {
    const residualsDb = Array.from(cmrrDb, () => Number.NaN);
    return {
      model: 'none',
      modelReason: `only ${resolvedCount} point(s) are resolved above the common-mode floor; at least 3 are needed to fit`,
      cmrrDcDb: null,
      cmrrDcDbInterval95: null,
      cmrrCornerHz: null,
      cmrrCornerHzInterval95: null,
      ...base,
      commonModeGainModel: null,
      highFrequencySlope: null,
      fittedCmrrDb: residualsDb.slice(),
      residualsDb,
      residualRmsDb: Number.NaN,
      activePointCount: 0,
      activeBoundCount: 0,
      degreesOfFreedom: 0,
      regimes: [],
      regimeSentence: 'Too few resolved points to say what limits rejection; the bound points give lower limits only.',
    };
  }

  // Resolved points in order, for the monotonicity check, slopes and the smooth fallback.
  const resolvedLog10: number[] = [];
  const resolvedDb: number[] = [];
  for (let i = 0; i < n; i++) {
    if (isBound[i]) continue;
    resolvedLog10.push(log10FrequencyHz[i]);
    resolvedDb.push(cmrrDb[i]);
  }
  const lowestResolvedLog10 = resolvedLog10[0];
  const highestResolvedLog10 = resolvedLog10[resolvedLog10.length - 1];

  // CMRR: level 20·log10(Ad0/Acm0), corner Acm0/k.
  const cmrrFit = fitRolloff(log10FrequencyHz, frequencyHzSquared, cmrrDb, isBound);
  const fittedCmrrDb: number[] = new Array(n);
  const residualsDb: number[] = new Array(n);
  const inverseCornerSquared = 10 ** (-2 * cmrrFit.log10CornerHz);
  let resolvedSquares = 0;
  for (let i = 0; i < n; i++) {
    fittedCmrrDb[i] = cmrrFit.levelDb - 10 * Math.log10(1 + frequencyHzSquared[i] * inverseCornerSquared);
    residualsDb[i] = cmrrDb[i] - fittedCmrrDb[i];
    if (!isBound[i]) resolvedSquares += residualsDb[i] ** 2;
  }
  const residualRmsDb = Math.sqrt(resolvedSquares / resolvedCount);
  const degreesOfFreedom = cmrrFit.activeCount - 2;
  const cornerHalfWidth = cmrrFit.covariance ? tTwoSided(degreesOfFreedom) * Math.sqrt(cmrrFit.covariance[2]) : Infinity;

  let failure: string | null = null;
  const rise = largestRise(resolvedLog10, resolvedDb);
  if (rise.riseDb > monotoneToleranceDb) {
    failure =
      `the measured CMRR rises by ${rise.riseDb.toFixed(1)} dB between ${formatHz(rise.fromHz)} and ${formatHz(rise.toHz)}, ` +
      'while the first-order model can only fall';
  } else if (cmrrFit.atLimit || cmrrFit.log10CornerHz > highestResolvedLog10 || cmrrFit.log10CornerHz < lowestResolvedLog10) {
    const where = cmrrFit.log10CornerHz > highestResolvedLog10 ? 'above' : 'below';
    failure =
      `the fitted corner lies ${where} the resolved range ${formatHz(10 ** lowestResolvedLog10)}–${formatHz(10 ** highestResolvedLog10)}, ` +
      (where === 'above'
        ? 'so the rising part (k) cannot be identified'
        : 'so the flat part (Acm0) cannot be identified');
  } else if (!(cornerHalfWidth <= identifiedHalfWidthDecades)) {
    failure = `the corner's 95 % interval reaches more than ${identifiedHalfWidthDecades} decade either side, so Acm0 and k are not identified`;
  } else if (residualRmsDb > maxResidualRmsDb) {
    failure = `the residual RMS is ${residualRmsDb.toFixed(2)} dB, above ${maxResidualRmsDb} dB: the first-order shape does not describe the data`;
  }

  if (failure === null) {
    const covariance = cmrrFit.covariance!;
    const levelHalfWidth = tTwoSided(degreesOfFreedom) * Math.sqrt(covariance[0]);
    const cmrrCornerHz = 10 ** cmrrFit.log10CornerHz;
    const acm0 = differentialGainDc / 10 ** (cmrrFit.levelDb / 20);

    let highFrequencySlope: HighFrequencySlope;
    const aboveLog10: number[] = [];
    const aboveDb: number[] = [];
    const slopeStartLog10 = cmrrFit.log10CornerHz + Math.log10(3);
    for (let i = 0; i < resolvedLog10.length; i++) {
      if (resolvedLog10[i] >= slopeStartLog10) {
        aboveLog10.push(resolvedLog10[i]);
        aboveDb.push(resolvedDb[i]);
      }
    }
    const line = straightLine(aboveLog10, aboveDb);
    if (line) {
      highFrequencySlope = {
        dbPerDecade: line.slope,
        interval95: [line.slope - line.halfWidth, line.slope + line.halfWidth],
        fromHz: 10 ** aboveLog10[0],
        toHz: 10 ** aboveLog10[aboveLog10.length - 1],
        method: 'regression',
        pointCount: aboveLog10.length,
      };
    } else {
      // Local slope −20·u/(1 + u) at the top frequency; d slope/d log10(corner) = 40·ln10·u/(1 + u)².
      const u = 10 ** (2 * (highestResolvedLog10 - cmrrFit.log10CornerHz));
      const slope = (-20 * u) / (1 + u);
      const halfWidth = ((40 * Math.LN10 * u) / (1 + u) ** 2) * cornerHalfWidth;
      highFrequencySlope = {
        dbPerDecade: slope,
        interval95: [slope - halfWidth, Math.min(0, slope + halfWidth)],
        fromHz: 10 ** highestResolvedLog10,
        toHz: 10 ** highestResolvedLog10,
        method: 'model-at-highest-frequency',
        pointCount: 0,
      };
    }

    const regimes: RegimeSpan[] = [
      { fromHz: lowestHz, toHz: cmrrCornerHz, limitedBy: 'flat' },
      { fromHz: cmrrCornerHz, toHz: highestHz, limitedBy: 'rising-common-mode' },
    ];
    return {
      model: 'first-order',
      modelReason:
        `first-order model fits: residual RMS ${residualRmsDb.toFixed(2)} dB, corner inside the resolved range, ` +
        'CMRR monotone within tolerance',
      cmrrDcDb: cmrrFit.levelDb,
      cmrrDcDbInterval95: [cmrrFit.levelDb - levelHalfWidth, cmrrFit.levelDb + levelHalfWidth],
      cmrrCornerHz,
      cmrrCornerHzInterval95: [10 ** (cmrrFit.log10CornerHz - cornerHalfWidth), 10 ** (cmrrFit.log10CornerHz + cornerHalfWidth)],
      ...base,
      commonModeGainModel: { acm0, kPerHz: acm0 / cmrrCornerHz },
      highFrequencySlope,
      fittedCmrrDb,
      residualsDb,
      residualRmsDb,
      activePointCount: cmrrFit.activeCount,
      activeBoundCount: cmrrFit.activeBoundCount,
      degreesOfFreedom,
      regimes,
      regimeSentence: describeRegimes(regimes, cmrrFit.levelDb),
    };
  }

  return smoothFit(points, log10FrequencyHz, cmrrDb, isBound, resolvedLog10, resolvedDb, failure, base);
}

/** The fallback: a polynomial in log10(f) through the resolved points, degree by AICc. */
function smoothFit(
  points: readonly CmrrPoint[],
  log10FrequencyHz: Float64Array,
  cmrrDb: Float64Array,
  isBound: Uint8Array,
  resolvedLog10: number[],
  resolvedDb: number[],
  failure: string,
  base: Pick<FrequencyFit, 'bandwidthHz' | 'bandwidthHzInterval95' | 'bandwidthNote' | 'differentialGainDc'>,
): FrequencyFit {
  const n = points.length;
  const count = resolvedLog10.length;
  // Scale log10(f) to [−1, 1] so the powers stay well conditioned.
  const middle = (resolvedLog10[0] + resolvedLog10[count - 1]) / 2;
  const half = Math.max((resolvedLog10[count - 1] - resolvedLog10[0]) / 2, 1e-12);
  const scaled = resolvedLog10.map((x) => (x - middle) / half);

  let best: { regression: PolynomialRegression; degree: number; criterion: number } | null = null;
  const highestDegree = Math.min(8, count - 2);
  for (let degree = 1; degree <= highestDegree; degree++) {
    const regression = new PolynomialRegression(scaled, resolvedDb, degree);
    let sse = 0;
    for (let i = 0; i < count; i++) sse += (resolvedDb[i] - regression.predict(scaled[i])) ** 2;
    const parameters = degree + 1;
    // Corrected Akaike information criterion for Gaussian residuals (Hurvich & Tsai 1989).
    const correction = count - parameters - 1 > 0 ? (2 * parameters * (parameters + 1)) / (count - parameters - 1) : Infinity;
    const criterion = count * Math.log(Math.max(sse, 1e-300) / count) + 2 * parameters + correction;
    if (!best || criterion < best.criterion) best = { regression, degree, criterion };
  }
  const { regression, degree } = best!;
  const coefficients = regression.coefficients;
  const powers = regression.powers;
  const valueAt = (x: number) => regression.predict((x - middle) / half);
  // d/d log10(f) of Σ c·z^p with z = (x − middle)/half.
  const slopeAt = (x: number) => {
    const z = (x - middle) / half;
    let slope = 0;
    for (let j = 0; j < coefficients.length; j++) {
      if (powers[j] > 0) slope += powers[j] * coefficients[j] * z ** (powers[j] - 1);
    }
    return slope / half;
  };

  const fittedCmrrDb: number[] = new Array(n);
  const residualsDb: number[] = new Array(n);
  let squares = 0;
  let activeBoundCount = 0;
  for (let i = 0; i < n; i++) {
    // A polynomial says nothing outside the resolved points it was fitted to (it would extrapolate,
    // and holding an end value would draw a curve the data do not show): no fitted value there.
    const x = log10FrequencyHz[i];
    if (x < resolvedLog10[0] || x > resolvedLog10[count - 1]) {
      fittedCmrrDb[i] = Number.NaN;
      residualsDb[i] = Number.NaN;
      continue;
    }
    fittedCmrrDb[i] = valueAt(x);
    residualsDb[i] = cmrrDb[i] - fittedCmrrDb[i];
    if (!isBound[i]) squares += residualsDb[i] ** 2;
    else if (residualsDb[i] > 0) activeBoundCount++;
  }

  // What the smooth curve can still say: a flat low end gives the dc level and the −3 dB frequency.
  const flatEnoughDbPerDecade = 3;
  let cmrrDcDb: number | null = null;
  let cmrrCornerHz: number | null = null;
  if (Math.abs(slopeAt(resolvedLog10[0])) <= flatEnoughDbPerDecade) {
    cmrrDcDb = valueAt(resolvedLog10[0]);
    const steps = 400;
    for (let step = 1; step <= steps; step++) {
      const x = resolvedLog10[0] + ((resolvedLog10[count - 1] - resolvedLog10[0]) * step) / steps;
      if (valueAt(x) <= cmrrDcDb - 3) {
        cmrrCornerHz = 10 ** x;
        break;
      }
    }
  }

  const topLog10: number[] = [];
  const topDb: number[] = [];
  for (let i = 0; i < count; i++) {
    if (resolvedLog10[i] >= resolvedLog10[count - 1] - 1) {
      topLog10.push(resolvedLog10[i]);
      topDb.push(resolvedDb[i]);
    }
  }
  const line = straightLine(topLog10, topDb);
  const highFrequencySlope: HighFrequencySlope | null = line
    ? {
        dbPerDecade: line.slope,
        interval95: [line.slope - line.halfWidth, line.slope + line.halfWidth],
        fromHz: 10 ** topLog10[0],
        toHz: 10 ** topLog10[topLog10.length - 1],
        method: 'regression',
        pointCount: topLog10.length,
      }
    : null;

  const regimes = regimesFromSlopes(
    resolvedLog10.map((x) => 10 ** x),
    resolvedLog10.map(slopeAt),
  );
  return {
    model: 'smooth',
    modelReason: `first-order model rejected: ${failure}; described by a degree-${degree} polynomial in log10(f) instead`,
    cmrrDcDb,
    cmrrDcDbInterval95: null,
    cmrrCornerHz,
    cmrrCornerHzInterval95: null,
    ...base,
    commonModeGainModel: null,
    highFrequencySlope,
    fittedCmrrDb,
    residualsDb,
    residualRmsDb: Math.sqrt(squares / count),
    activePointCount: count,
    activeBoundCount,
    degreesOfFreedom: count - degree - 1,
    smoothDegree: degree,
    regimes,
    regimeSentence: describeRegimes(regimes, cmrrDcDb),
  };
}

// ---------------------------------------------------------------------------------------------

/** Options for {@link analyzeSweeps}. */
export interface AnalyzeSweepsOptions extends FrequencyFitOptions {
  /** File names used in error messages. */
  differentialFile?: string;
  commonModeFile?: string;
  /** Average rows that repeat a frequency instead of rejecting them (see parseSweepCsv). */
  averageRepeats?: boolean;
}

/** Result of {@link analyzeSweeps}. */
export interface SweepAnalysis {
  differential: Sweep;
  commonMode: Sweep;
  points: CmrrPoint[];
  fit: FrequencyFit;
  warnings: string[];
}

/**
 * The whole sweep analysis: parses a differential and a common-mode sweep CSV
 * ({@link parseSweepCsv}), pairs them into per-frequency CMRR points ({@link pairCmrrPoints})
 * and fits CMRR against frequency ({@link fitCmrrFrequencyResponse}). Units as in those functions.
 * Cost O(n log n) for n rows.
 *
 * Throws {@link EngineInputError} (naming the file, line and column) for anything those throw.
 *
 * @example analyzeSweeps(differentialCsv, commonModeCsv).fit.cmrrDcDb // 80.0 for Ad0 = 10, Acm0 = 0.001
 */
export function analyzeSweeps(
  differentialText: string | Uint8Array | ArrayBuffer,
  commonModeText: string | Uint8Array | ArrayBuffer,
  options: AnalyzeSweepsOptions = {},
): SweepAnalysis {
  const differential = parseSweepCsv(differentialText, { file: options.differentialFile, averageRepeats: options.averageRepeats });
  const commonMode = parseSweepCsv(commonModeText, { file: options.commonModeFile, averageRepeats: options.averageRepeats });
  const { points, warnings } = pairCmrrPoints(differential, commonMode);
  const fit = fitCmrrFrequencyResponse(points, options);
  return { differential, commonMode, points, fit, warnings };
}
