// Least-squares sine fits of IEEE Std 1057 (digitizing waveform recorders; the same fits appear
// in IEEE Std 1241 for ADCs): the three-parameter fit at a known frequency and the iterative
// four-parameter fit when the frequency must be estimated.
//
// Model, in the standard's cosine convention, for sample n at time t_n = startTimeS + n/sampleRateHz:
//   y[n] = A·cos(ω·t_n) + B·sin(ω·t_n) + C = amplitude·cos(ω·t_n + phase) + offset
// with amplitude = sqrt(A² + B²) (peak) and phase = atan2(−B, A).
//
// Speed: the fits never call Math.sin/Math.cos per sample. The basis cos/sin is advanced by a
// complex phasor rotation and re-anchored exactly every PHASOR_BLOCK samples; only the sums that
// involve the data are accumulated, in one pass (block partial sums, which also keep the summation
// error small), while the data-free sums (Σcos, Σsin², …) come from closed forms. The residual comes from the normal-equation sums, in the quadratic form that is
// insensitive to first-order errors in the solved coefficients; when the residual is so far below
// the signal that cancellation could cost accuracy, a second pass fits what is left after
// subtracting the first fit (one step of iterative refinement), where there is nothing to cancel.
import { EngineInputError } from './errors';

/** Samples of one channel with uniform sampling. Both typed arrays are read directly. */
export type SampleArray = Float64Array | Float32Array;

/** Result of a sine fit of one channel. */
export interface SineFit {
  /** Fitted frequency (Hz): the given one, or the estimate of the four-parameter fit. */
  frequencyHz: number;
  /** Peak amplitude, in the unit of the samples. */
  amplitude: number;
  /** Phase of amplitude·cos(2π·f·t + phase) at t = 0 of the time axis, degrees in (−180, 180]. */
  phaseDeg: number;
  /** Dc offset C, in the unit of the samples. */
  offset: number;
  /** RMS of y − fit over the record, in the unit of the samples (divides by the sample count). */
  residualRms: number;
  /** A: coefficient of cos(2π·f·t). */
  cosineCoefficient: number;
  /** B: coefficient of sin(2π·f·t). */
  sineCoefficient: number;
  /** Number of samples fitted. */
  sampleCount: number;
}

/** Result of the four-parameter fit: a sine fit plus how the iteration went. */
export interface FourParameterSineFit extends SineFit {
  /** Gauss–Newton iterations used, summed over the stages (see fitSineFourParameter). */
  iterations: number;
}

/** Options of fitSineThreeParameter. */
export interface ThreeParameterOptions {
  /** Sample rate (Hz), > 0. */
  sampleRateHz: number;
  /** Known signal frequency (Hz), 0 < f < sampleRateHz/2. */
  frequencyHz: number;
  /** Time of the first sample (s); phases refer to t = 0. Default 0. */
  startTimeS?: number;
}

/** Options of fitSineFourParameter. */
export interface FourParameterOptions {
  /** Sample rate (Hz), > 0. */
  sampleRateHz: number;
  /** Start value for the frequency (Hz), e.g. from estimateFrequencyFromSpectrum. */
  initialFrequencyHz: number;
  /** Time of the first sample (s); phases refer to t = 0. Default 0. */
  startTimeS?: number;
  /** Upper limit of Gauss–Newton iterations per stage. Default 40. */
  maxIterations?: number;
}

// Samples between exact re-anchoring of the rotating phasor. The rotation's rounding error grows
// about linearly with the step count (≈ PHASOR_BLOCK · 1e-16 relative here), and the block is also
// the unit of the partial sums that keep the accumulation error near sqrt(n)-growth.
const PHASOR_BLOCK = 256;

// Ratio Σy² / Σresidual² above which the one-pass residual is refined by a second pass. The
// one-pass residual sum of squares carries a relative error of about this ratio times the rounding
// error of Σy² (≈ 1e-16 times a small factor from the block sums): below 1e8 that is ≲ 1e-7, and
// the residual RMS keeps about 7 digits without the extra pass.
const REFINE_RATIO = 1e8;

// Four-parameter fit: stop when the frequency step changes the phase at the record ends by less
// than this (radians). Far below any phase a measurement can resolve, above the rounding floor.
const PHASE_STEP_TOLERANCE_RAD = 1e-9;

// The four-parameter iteration first converges on a prefix of this many samples, then on prefixes
// PREFIX_GROWTH times longer, so that a start frequency good to a fraction of a DFT bin of the
// prefix stays inside the Gauss–Newton convergence range at each stage.
// The first prefix also holds at least FIRST_PREFIX_CYCLES cycles (or is the whole record).
const FIRST_PREFIX_SAMPLES = 65_536;
const FIRST_PREFIX_CYCLES = 64;
const PREFIX_GROWTH = 16;

const TWO_PI = 2 * Math.PI;

// Index into the sums array filled by the accumulation kernels.
const S_Y = 0;
const S_YY = 1;
const S_YC = 2;
const S_YS = 3;
const S_CC = 4;
const S_CS = 5;
const S_SS = 6;
const S_C = 7;
const S_S = 8;
const S_D = 9;
const S_DD = 10;
const S_DC = 11;
const S_DS = 12;
const S_YD = 13;
const SUM_COUNT = 14;

function checkRecord(functionName: string, samples: SampleArray, sampleRateHz: number, minimumSamples: number): void {
  if (!(samples instanceof Float64Array) && !(samples instanceof Float32Array)) {
    throw new EngineInputError(`${functionName} requires samples as a Float64Array or Float32Array`, { field: 'samples' });
  }
  if (samples.length < minimumSamples) {
    throw new EngineInputError(
      `${functionName} requires at least ${minimumSamples} samples, got ${samples.length}`,
      { field: 'samples' },
    );
  }
  if (!Number.isFinite(sampleRateHz) || sampleRateHz <= 0) {
    throw new EngineInputError(`${functionName} requires a finite sample rate > 0 Hz, got ${sampleRateHz}`, {
      field: 'sampleRateHz',
    });
  }
}

function checkFrequency(functionName: string, field: string, frequencyHz: number, sampleRateHz: number): void {
  if (!Number.isFinite(frequencyHz) || frequencyHz <= 0 || frequencyHz >= sampleRateHz / 2) {
    throw new EngineInputError(
      `${functionName} requires 0 < ${field} < sampleRateHz/2 = ${sampleRateHz / 2} Hz, got ${frequencyHz}`,
      { field },
    );
  }
}

/** Phase in radians of the sample at index `index`: 2π·frac(startCycles + cyclesPerSample·index). */
function anchorPhase(startCycles: number, cyclesPerSample: number, index: number): number {
  const cycles = startCycles + cyclesPerSample * index;
  return TWO_PI * (cycles - Math.floor(cycles));
}

/** sin(π·x), with x reduced modulo 2 first so that large arguments keep their accuracy. */
function sinPi(x: number): number {
  return Math.sin(Math.PI * (x - 2 * Math.floor(x / 2)));
}

/**
 * Dirichlet ratio sin(π·N·x)/sin(π·x) = |Σ_{k<N} e^{2πi·x·k}| with sign, for 0 < x < 1; near
 * x = 1 it works with q = 1 − x (exact there) so that the small denominator keeps its accuracy.
 */
function dirichletRatio(count: number, x: number): number {
  if (x <= 0.5) return sinPi(count * x) / sinPi(x);
  const q = 1 - x;
  if (q === 0) return count % 2 === 1 ? count : -count;
  return ((count % 2 === 1 ? 1 : -1) * sinPi(count * q)) / sinPi(q);
}

/**
 * Closed forms (geometric series) of Σcos θ_k, Σsin θ_k, Σcos², Σcos·sin, Σsin² over
 * θ_k = 2π·(startCycles + cyclesPerSample·k), k = 0 … count−1, written into `sums`. They do not
 * depend on the data, so the kernels need not accumulate them.
 */
function trigonometricSums(count: number, startCycles: number, cyclesPerSample: number, sums: Float64Array): void {
  // Σ e^{iθ_k} = e^{2πi(startCycles + cyclesPerSample·(count−1)/2)} · D(cyclesPerSample)
  const single = dirichletRatio(count, cyclesPerSample);
  const singleCycles = fractionalPart(startCycles + (cyclesPerSample * (count - 1)) / 2);
  sums[S_C] = single * Math.cos(TWO_PI * singleCycles);
  sums[S_S] = single * Math.sin(TWO_PI * singleCycles);
  // Σ e^{2iθ_k}, then cos² = (1 + cos 2θ)/2, sin² = (1 − cos 2θ)/2, cos·sin = sin 2θ / 2
  const double = dirichletRatio(count, 2 * cyclesPerSample);
  const doubleCycles = fractionalPart(2 * startCycles + cyclesPerSample * (count - 1));
  const doubleReal = double * Math.cos(TWO_PI * doubleCycles);
  const doubleImaginary = double * Math.sin(TWO_PI * doubleCycles);
  sums[S_CC] = (count + doubleReal) / 2;
  sums[S_SS] = (count - doubleReal) / 2;
  sums[S_CS] = doubleImaginary / 2;
}

/**
 * One pass over samples[0, count) with the reference fit rA·cos + rB·sin + rC subtracted:
 * sums of y, y², y·cos, y·sin (and the data-free sums in closed form). Phase at index i is
 * 2π·(startCycles + cyclesPerSample·i).
 */
function accumulateThree(
  samples: SampleArray, count: number, startCycles: number, cyclesPerSample: number,
  rA: number, rB: number, rC: number, sums: Float64Array,
): void {
  const stepCos = Math.cos(TWO_PI * cyclesPerSample);
  const stepSin = Math.sin(TWO_PI * cyclesPerSample);
  let tY = 0, tYY = 0, tYC = 0, tYS = 0;
  for (let blockStart = 0; blockStart < count; blockStart += PHASOR_BLOCK) {
    const blockEnd = Math.min(count, blockStart + PHASOR_BLOCK);
    const phase = anchorPhase(startCycles, cyclesPerSample, blockStart);
    let c = Math.cos(phase);
    let s = Math.sin(phase);
    let bY = 0, bYY = 0, bYC = 0, bYS = 0;
    for (let i = blockStart; i < blockEnd; i++) {
      const y = samples[i] - rA * c - rB * s - rC;
      bY += y;
      bYY += y * y;
      bYC += y * c;
      bYS += y * s;
      const nextCos = c * stepCos - s * stepSin;
      s = c * stepSin + s * stepCos;
      c = nextCos;
    }
    tY += bY; tYY += bYY; tYC += bYC; tYS += bYS;
  }
  sums[S_Y] = tY; sums[S_YY] = tYY; sums[S_YC] = tYC; sums[S_YS] = tYS;
  trigonometricSums(count, startCycles, cyclesPerSample, sums);
}

/**
 * As accumulateThree (reference rC only), plus the four-parameter column
 * d = u·(B·cos − A·sin), the derivative of the model with respect to the phase step per sample,
 * with u = (i − centreIndex)/scale (scaled so that the 4×4 system is balanced): sums of d, d²,
 * d·cos, d·sin, y·d.
 */
function accumulateFour(
  samples: SampleArray, count: number, startCycles: number, cyclesPerSample: number,
  rC: number, derivativeA: number, derivativeB: number, centreIndex: number, scale: number, sums: Float64Array,
): void {
  const stepCos = Math.cos(TWO_PI * cyclesPerSample);
  const stepSin = Math.sin(TWO_PI * cyclesPerSample);
  let tY = 0, tYY = 0, tYC = 0, tYS = 0, tD = 0, tDD = 0, tDC = 0, tDS = 0, tYD = 0;
  const inverseScale = 1 / scale;
  for (let blockStart = 0; blockStart < count; blockStart += PHASOR_BLOCK) {
    const blockEnd = Math.min(count, blockStart + PHASOR_BLOCK);
    const phase = anchorPhase(startCycles, cyclesPerSample, blockStart);
    let c = Math.cos(phase);
    let s = Math.sin(phase);
    let u = (blockStart - centreIndex) * inverseScale;
    let bY = 0, bYY = 0, bYC = 0, bYS = 0, bD = 0, bDD = 0, bDC = 0, bDS = 0, bYD = 0;
    for (let i = blockStart; i < blockEnd; i++) {
      const y = samples[i] - rC;
      const d = u * (derivativeB * c - derivativeA * s);
      bY += y;
      bYY += y * y;
      bYC += y * c;
      bYS += y * s;
      bD += d;
      bDD += d * d;
      bDC += d * c;
      bDS += d * s;
      bYD += y * d;
      const nextCos = c * stepCos - s * stepSin;
      s = c * stepSin + s * stepCos;
      c = nextCos;
      u += inverseScale;
    }
    tY += bY; tYY += bYY; tYC += bYC; tYS += bYS; tD += bD; tDD += bDD; tDC += bDC; tDS += bDS; tYD += bYD;
  }
  sums[S_Y] = tY; sums[S_YY] = tYY; sums[S_YC] = tYC; sums[S_YS] = tYS;
  sums[S_D] = tD; sums[S_DD] = tDD; sums[S_DC] = tDC; sums[S_DS] = tDS; sums[S_YD] = tYD;
  trigonometricSums(count, startCycles, cyclesPerSample, sums);
}

/**
 * Solves the symmetric positive definite system `matrix · x = rhs` (row-major size×size) by
 * Cholesky decomposition; returns x, or null when the matrix is not positive definite.
 */
function solveSymmetricPositiveDefinite(matrix: number[], rhs: number[], size: number): number[] | null {
  const lower = new Array<number>(size * size).fill(0);
  for (let row = 0; row < size; row++) {
    for (let column = 0; column <= row; column++) {
      let value = matrix[row * size + column];
      for (let k = 0; k < column; k++) value -= lower[row * size + k] * lower[column * size + k];
      if (row === column) {
        if (!(value > 0)) return null;
        lower[row * size + row] = Math.sqrt(value);
      } else {
        lower[row * size + column] = value / lower[column * size + column];
      }
    }
  }
  const forward = new Array<number>(size);
  for (let row = 0; row < size; row++) {
    let value = rhs[row];
    for (let k = 0; k < row; k++) value -= lower[row * size + k] * forward[k];
    forward[row] = value / lower[row * size + row];
  }
  const solution = new Array<number>(size);
  for (let row = size - 1; row >= 0; row--) {
    let value = forward[row];
    for (let k = row + 1; k < size; k++) value -= lower[k * size + row] * solution[k];
    solution[row] = value / lower[row * size + row];
  }
  return solution;
}

interface ThreeSolution {
  a: number;
  b: number;
  c: number;
  /** Sum of squared residuals of the accumulated (reference-subtracted) data. */
  residualSumOfSquares: number;
}

/**
 * Solves the 3×3 normal equations in `sums` for count samples. The residual uses the full
 * quadratic form Σy² − 2βᵀg + βᵀHβ: exact for any β, and stationary at the solution, so rounding
 * in β does not enter it to first order (the shorter Σy² − βᵀg does).
 */
function solveThree(functionName: string, sums: Float64Array, count: number): ThreeSolution {
  const hCC = sums[S_CC], hCS = sums[S_CS], hSS = sums[S_SS], hC = sums[S_C], hS = sums[S_S];
  const gC = sums[S_YC], gS = sums[S_YS], gY = sums[S_Y];
  const solution = solveSymmetricPositiveDefinite([hCC, hCS, hC, hCS, hSS, hS, hC, hS, count], [gC, gS, gY], 3);
  if (!Number.isFinite(sums[S_YY]) || !Number.isFinite(gC) || !Number.isFinite(gS)) {
    throw new EngineInputError(`${functionName}: the samples contain NaN or Infinity`, { field: 'samples' });
  }
  if (solution === null) {
    throw new EngineInputError(
      `${functionName}: the sine and cosine at this frequency cannot be told apart over the record ` +
        '(frequency too close to 0 or to half the sample rate for this many samples)',
      { field: 'frequencyHz' },
    );
  }
  const [a, b, c] = solution;
  const quadratic =
    a * (a * hCC + 2 * b * hCS + 2 * c * hC) + b * (b * hSS + 2 * c * hS) + c * c * count;
  const residualSumOfSquares = Math.max(0, sums[S_YY] - 2 * (a * gC + b * gS + c * gY) + quadratic);
  return { a, b, c, residualSumOfSquares };
}

function toSineFit(frequencyHz: number, a: number, b: number, c: number, residualSumOfSquares: number, count: number): SineFit {
  const phaseRad = Math.atan2(-b, a);
  return {
    frequencyHz,
    amplitude: Math.hypot(a, b),
    phaseDeg: wrapDegrees((phaseRad * 180) / Math.PI),
    offset: c,
    residualRms: Math.sqrt(residualSumOfSquares / count),
    cosineCoefficient: a,
    sineCoefficient: b,
    sampleCount: count,
  };
}

/**
 * Wraps an angle in degrees to (−180, 180].
 * Cost O(1). Example: `wrapDegrees(270)` → −90.
 */
export function wrapDegrees(angleDeg: number): number {
  let wrapped = angleDeg - 360 * Math.floor((angleDeg + 180) / 360);
  if (wrapped === -180) wrapped = 180;
  return wrapped;
}

/**
 * One step of iterative refinement: fits what is left after subtracting `solution`, where the sums
 * of squares have nothing large to cancel, and returns the corrected solution and its residual.
 */
function refineThree(
  functionName: string, samples: SampleArray, count: number, startCycles: number, cyclesPerSample: number,
  solution: ThreeSolution, sums: Float64Array,
): ThreeSolution {
  accumulateThree(samples, count, startCycles, cyclesPerSample, solution.a, solution.b, solution.c, sums);
  const correction = solveThree(functionName, sums, count);
  return {
    a: solution.a + correction.a,
    b: solution.b + correction.b,
    c: solution.c + correction.c,
    residualSumOfSquares: correction.residualSumOfSquares,
  };
}

/**
 * Three-parameter fit from samples[0, count), phase origin `startCycles` cycles at index 0; one
 * pass, plus a refinement pass when the residual is too far below the signal (see REFINE_RATIO).
 */
function fitThree(
  functionName: string, samples: SampleArray, count: number, startCycles: number, cyclesPerSample: number,
  sums: Float64Array,
): ThreeSolution {
  // Shift by the first sample so that a large dc offset does not swamp the sums of squares.
  const shift = samples[0];
  accumulateThree(samples, count, startCycles, cyclesPerSample, 0, 0, shift, sums);
  const first = solveThree(functionName, sums, count);
  const solution = { a: first.a, b: first.b, c: first.c + shift, residualSumOfSquares: first.residualSumOfSquares };
  if (sums[S_YY] > REFINE_RATIO * first.residualSumOfSquares) {
    return refineThree(functionName, samples, count, startCycles, cyclesPerSample, solution, sums);
  }
  return solution;
}

/**
 * Three-parameter least-squares sine fit at a known frequency (IEEE Std 1057, "three-parameter
 * (known frequency) sine fit"; also IEEE Std 1241): finds A, B, C minimising
 * Σ (y[n] − A·cos(ωt_n) − B·sin(ωt_n) − C)², t_n = startTimeS + n/sampleRateHz.
 *
 * @param samples one channel, uniformly sampled (any unit; results are in that unit)
 * @param options sampleRateHz (Hz), frequencyHz (Hz, 0 < f < sampleRateHz/2), startTimeS (s, default 0)
 * @returns frequencyHz (Hz), amplitude (peak), phaseDeg (degrees, cosine convention, at t = 0),
 *   offset, residualRms, the coefficients A and B, sampleCount
 * Cost: O(n), one pass (two when the residual RMS is below 1e-4 of the record's RMS about its
 * first sample), no per-sample trigonometric calls.
 * Throws EngineInputError when there are fewer than 4 samples, the sample rate or frequency is out
 * of range, the samples hold NaN/Infinity, or the frequency cannot be resolved over the record.
 * Example: `fitSineThreeParameter(Float64Array.from({ length: 1000 }, (_, n) => 2 * Math.cos(2 * Math.PI * 50 * n / 1000) + 0.5), { sampleRateHz: 1000, frequencyHz: 50 })`
 *   → amplitude 2, phaseDeg 0, offset 0.5, residualRms ≈ 0.
 */
export function fitSineThreeParameter(samples: SampleArray, options: ThreeParameterOptions): SineFit {
  const functionName = 'fitSineThreeParameter';
  const { sampleRateHz, frequencyHz, startTimeS = 0 } = options;
  checkRecord(functionName, samples, sampleRateHz, 4);
  checkFrequency(functionName, 'frequencyHz', frequencyHz, sampleRateHz);
  if (!Number.isFinite(startTimeS)) {
    throw new EngineInputError(`${functionName} requires a finite startTimeS, got ${startTimeS}`, { field: 'startTimeS' });
  }
  const sums = new Float64Array(SUM_COUNT);
  const cyclesPerSample = frequencyHz / sampleRateHz;
  const startCycles = fractionalPart(frequencyHz * startTimeS);
  const solution = fitThree(functionName, samples, samples.length, startCycles, cyclesPerSample, sums);
  return toSineFit(frequencyHz, solution.a, solution.b, solution.c, solution.residualSumOfSquares, samples.length);
}

function fractionalPart(value: number): number {
  return value - Math.floor(value);
}

/** (A − iB)·e^{2πi·cycles}: the coefficients of the same sinusoid with the phase origin moved. */
function rotateCoefficients(a: number, b: number, cycles: number): { a: number; b: number } {
  const angle = TWO_PI * fractionalPart(cycles);
  const cosAngle = Math.cos(angle);
  const sinAngle = Math.sin(angle);
  // (a − ib)(cos + i sin) = (a cos + b sin) + i(a sin − b cos)
  return { a: a * cosAngle + b * sinAngle, b: b * cosAngle - a * sinAngle };
}

interface FourParameterStage {
  /** Frequency (cycles per sample) at which the last pass was evaluated. */
  cyclesPerSample: number;
  /** Three-parameter solution at that frequency, phase origin at the centre of the prefix. */
  fit: ThreeSolution;
  /** Σ y² of that pass (y with the offset reference removed), for the refinement test. */
  sumOfSquares: number;
  iterations: number;
}

/**
 * Gauss–Newton iterations of the four-parameter fit on samples[0, count), phase measured from the
 * centre sample (which keeps the frequency column nearly orthogonal to the others). `start` holds
 * A, B, C for that origin when a previous stage has them; otherwise a three-parameter fit at the
 * start frequency provides them.
 */
function iterateFourParameter(
  functionName: string, samples: SampleArray, count: number, initialCyclesPerSample: number,
  start: ThreeSolution | null, maxIterations: number, sums: Float64Array,
): FourParameterStage {
  const centreIndex = (count - 1) / 2;
  const scale = Math.max(1, centreIndex);
  const startCyclesAt = (cycles: number): number => fractionalPart(-cycles * centreIndex);
  let cyclesPerSample = initialCyclesPerSample;
  let fit = start ?? fitThree(functionName, samples, count, startCyclesAt(cyclesPerSample), cyclesPerSample, sums);
  let previousResidual = start ? Infinity : fit.residualSumOfSquares;
  let previousCyclesPerSample = cyclesPerSample;
  for (let iteration = 1; iteration <= maxIterations; iteration++) {
    const startCycles = startCyclesAt(cyclesPerSample);
    accumulateFour(samples, count, startCycles, cyclesPerSample, fit.c, fit.a, fit.b, centreIndex, scale, sums);
    const three = solveThree(functionName, sums, count);
    // Slack for rounding in the one-pass residuals being compared (they cancel against Σy²).
    const slack = 1e-9 * sums[S_YY];
    if (three.residualSumOfSquares > previousResidual + slack) {
      // The step made the fit worse: go back half way (a damped Gauss–Newton step).
      const halfway = (cyclesPerSample + previousCyclesPerSample) / 2;
      if (Math.abs(halfway - previousCyclesPerSample) * TWO_PI * scale < PHASE_STEP_TOLERANCE_RAD) {
        cyclesPerSample = previousCyclesPerSample;
        previousResidual = Infinity;
        continue;
      }
      cyclesPerSample = halfway;
      continue;
    }
    const matrix = [
      sums[S_CC], sums[S_CS], sums[S_C], sums[S_DC],
      sums[S_CS], sums[S_SS], sums[S_S], sums[S_DS],
      sums[S_C], sums[S_S], count, sums[S_D],
      sums[S_DC], sums[S_DS], sums[S_D], sums[S_DD],
    ];
    const solution = solveSymmetricPositiveDefinite(matrix, [sums[S_YC], sums[S_YS], sums[S_Y], sums[S_YD]], 4);
    if (solution === null) {
      throw new EngineInputError(`${functionName}: the frequency cannot be estimated (the signal has no resolvable sine)`, {
        field: 'samples',
      });
    }
    const evaluated = { a: three.a, b: three.b, c: three.c + fit.c, residualSumOfSquares: three.residualSumOfSquares };
    // Column d was scaled by 1/scale per sample, so the phase step per sample is solution[3]/scale.
    const stepCyclesPerSample = solution[3] / scale / TWO_PI;
    if (Math.abs(stepCyclesPerSample) * TWO_PI * scale < PHASE_STEP_TOLERANCE_RAD) {
      return { cyclesPerSample, fit: evaluated, sumOfSquares: sums[S_YY], iterations: iteration };
    }
    // The standard linearises the next step with this iteration's four-parameter A and B.
    fit = { a: solution[0], b: solution[1], c: solution[2] + fit.c, residualSumOfSquares: three.residualSumOfSquares };
    previousResidual = three.residualSumOfSquares;
    previousCyclesPerSample = cyclesPerSample;
    cyclesPerSample += stepCyclesPerSample;
    if (!(cyclesPerSample > 0 && cyclesPerSample < 0.5)) {
      throw new EngineInputError(
        `${functionName}: the frequency estimate left the band between 0 and half the sample rate; ` +
          'the record holds no clear sine (give the frequency instead)',
        { field: 'samples' },
      );
    }
  }
  throw new EngineInputError(`${functionName} did not converge in ${maxIterations} iterations`, { field: 'samples' });
}

/**
 * Four-parameter least-squares sine fit (IEEE Std 1057, "four-parameter (general-purpose) sine
 * fit"; also IEEE Std 1241): A, B, C and the frequency minimising the squared residual, by
 * Gauss–Newton iteration from a start frequency (linearising in the frequency with the previous
 * iteration's A and B, as the standard does). A step that raises the residual is halved. To stay
 * inside the convergence range with a start from a short spectrum, the iteration first converges
 * on the first 65,536 samples (or 64 cycles, if more), then on prefixes 16× longer up to the whole record. The returned
 * amplitude, phase, offset and residual come from a final three-parameter fit at the converged
 * frequency.
 *
 * @param samples one channel, uniformly sampled (any unit; results are in that unit)
 * @param options sampleRateHz (Hz), initialFrequencyHz (Hz, 0 < f < sampleRateHz/2, good to a
 *   fraction of sampleRateHz/min(n, 65536)), startTimeS (s, default 0), maxIterations (default 40)
 * @returns as fitSineThreeParameter, with frequencyHz the estimate, plus iterations
 * Cost: O(n) per iteration; typically 3–6 iterations on the first prefix and 2–3 on the record.
 * Throws EngineInputError for fewer than 5 samples, out-of-range rate or start frequency,
 * NaN/Infinity, no convergence, or a frequency estimate that leaves (0, sampleRateHz/2).
 * Example: `fitSineFourParameter(samplesOf50_3HzAt1kHz, { sampleRateHz: 1000, initialFrequencyHz: 50 })`
 *   → frequencyHz ≈ 50.3.
 */
export function fitSineFourParameter(samples: SampleArray, options: FourParameterOptions): FourParameterSineFit {
  const functionName = 'fitSineFourParameter';
  const { sampleRateHz, initialFrequencyHz, startTimeS = 0, maxIterations = 40 } = options;
  checkRecord(functionName, samples, sampleRateHz, 5);
  checkFrequency(functionName, 'initialFrequencyHz', initialFrequencyHz, sampleRateHz);
  if (!Number.isFinite(startTimeS)) {
    throw new EngineInputError(`${functionName} requires a finite startTimeS, got ${startTimeS}`, { field: 'startTimeS' });
  }
  const sums = new Float64Array(SUM_COUNT);
  const initialCyclesPerSample = initialFrequencyHz / sampleRateHz;
  let prefix = Math.min(samples.length, Math.max(FIRST_PREFIX_SAMPLES, Math.ceil(FIRST_PREFIX_CYCLES / initialCyclesPerSample)));
  let stage = iterateFourParameter(functionName, samples, prefix, initialCyclesPerSample, null, maxIterations, sums);
  let iterations = stage.iterations;
  while (prefix < samples.length) {
    const next = Math.min(samples.length, prefix * PREFIX_GROWTH);
    // Carry A, B, C over to the new prefix's centre as the start of its linearisation.
    const moved = rotateCoefficients(stage.fit.a, stage.fit.b, (stage.cyclesPerSample * (next - prefix)) / 2);
    const start = { ...stage.fit, a: moved.a, b: moved.b };
    stage = iterateFourParameter(functionName, samples, next, stage.cyclesPerSample, start, maxIterations, sums);
    iterations += stage.iterations;
    prefix = next;
  }
  const { cyclesPerSample } = stage;
  const frequencyHz = cyclesPerSample * sampleRateHz;
  // Move the phase origin from the record centre to t = 0 of the time axis.
  const startCycles = fractionalPart(frequencyHz * startTimeS);
  const centreIndex = (samples.length - 1) / 2;
  const origin = rotateCoefficients(stage.fit.a, stage.fit.b, -(startCycles + fractionalPart(cyclesPerSample * centreIndex)));
  let solution: ThreeSolution = { ...stage.fit, a: origin.a, b: origin.b };
  if (stage.sumOfSquares > REFINE_RATIO * solution.residualSumOfSquares) {
    solution = refineThree(functionName, samples, samples.length, startCycles, cyclesPerSample, solution, sums);
  }
  return {
    ...toSineFit(frequencyHz, solution.a, solution.b, solution.c, solution.residualSumOfSquares, samples.length),
    iterations,
  };
}
