// What a measured CMRR curve says about the built circuit, set beside its design: the resistor
// ratio error the flat part of the common-mode gain implies, and how the rising part compares with
// what the op-amp data predict.
import type { Circuit } from '../schemas/designs';
import {
  EngineInputError,
  dbToMagnitude,
  predictDifferenceAmplifier,
  predictInstrumentationAmplifier,
  type CmrrPoint,
  type FrequencyFit,
} from '../engine';
import { circuitOpAmp, drawCircuitTrials, nominalResistors } from './circuit-trials';
import { percentilesInPlace } from './percentiles';

/**
 * The resistor ratio error of the difference stage, `δ = (R4/R3')/(R2/R1') − 1` with
 * `R1' = R1 + Rs1`, `R3' = R3 + Rs2`: how far the non-inverting divider's ratio is from the
 * inverting one. Zero for a matched stage.
 */
export interface RatioErrorDiagnosis {
  /** Where the flat level came from: the first-order fit's Acm0/Ad0, or the smooth description's low-frequency CMRR. */
  basis: 'first-order-fit' | 'smooth-low-frequency-level';
  /** Measured |Acm0/Ad0| of the whole amplifier (dimensionless). */
  commonModeToDifferentialRatio: number;
  /** Difference-stage gain G = R2/(R1 + Rs1), nominal. */
  stageGain: number;
  /** Input-stage gain 1 + (RF1 + RF2)/RG of an instrumentation amplifier; 1 for a difference amplifier. */
  inputStageGain: number;
  /** |δ| that the whole flat part implies (op-amp dc rejection included: the "effective" error), as a fraction. */
  effectiveRatioErrorFraction: number;
  /** Sign of δ from the phase of Acm against Ad at low frequency: positive means R4/R3' is the larger ratio. */
  sign: 'positive' | 'negative' | 'unknown';
  /** δ with its sign, when the sign is known. */
  signedRatioErrorFraction: number | null;
  /** Circular mean of (Acm phase − Ad phase) over the flat-part points with phases, degrees; null without phases. */
  phaseDifferenceDeg: number | null;
  phasePointCount: number;
  /** |Acm/Ad| the op-amp data alone give at low frequency with matched resistors (pessimistic sign), dimensionless; 0 without data. */
  opAmpFlatRatio: number;
  /** Range of |δ| left for the resistors once the op-amp's own dc term is taken off with either sign, fractions. */
  resistorRatioErrorRangeFraction: [number, number];
  /** δ of the nominal design (e.g. from unequal source resistances), fraction. */
  nominalRatioErrorFraction: number;
  /** Largest |δ| over the tolerance corners of R1…R4, fraction. */
  worstCaseRatioErrorFraction: number;
  /** 95th percentile of |δ| over a 20,000-trial Monte Carlo of the tolerances (seed 1, the design's distribution), fraction. */
  monteCarloP95RatioErrorFraction: number;
  /** `within-rating`: at or below the Monte Carlo 95th percentile; `unusual`: between it and the worst case; `beyond-rating`: above the worst case. */
  verdict: 'within-rating' | 'unusual' | 'beyond-rating';
  sentence: string;
}

/** The rising (20 dB/decade) part of |Acm| set beside the op-amp data. */
export interface RisingPartDiagnosis {
  /** Frequency at which both are compared: the highest resolved measured frequency, Hz. */
  referenceFrequencyHz: number;
  /** CMRR the rising part alone gives there, Ad0/(k·f), dB: the op-amp rejection it implies. */
  risingPartCmrrDb: number;
  /** The same from the design's op-amp data with matched resistors, pessimistic sign(s), dB; null without op-amp data. */
  predictedRisingCmrrDb: number | null;
  /** …and with the optimistic sign(s), dB (equal to the pessimistic one for a difference amplifier). */
  predictedRisingOptimisticCmrrDb: number | null;
  /** How much larger the measured rising part is than the pessimistic prediction, dB (positive = worse than the data). */
  excessDb: number | null;
  /** The op-amp rejection corner that would explain the measured rising part with the data's dc rejection, Hz. */
  impliedOpAmpCornerHz: number | null;
  /** The data's corner, Hz. */
  dataCornerHz: number | null;
  verdict: 'consistent' | 'worse' | 'better' | 'no-op-amp-data';
  sentence: string;
}

/** Result of {@link diagnoseAgainstDesign}. */
export interface DesignDiagnosis {
  model: FrequencyFit['model'];
  ratio: RatioErrorDiagnosis | null;
  risingPart: RisingPartDiagnosis | null;
  /** What could not be diagnosed, and why. */
  notes: string[];
  /** Readable sentences, in order: ratio, rising part, notes. */
  sentences: string[];
}

/** Measured rising part this many dB from the prediction still counts as consistent (common practice, no source: a datasheet's typical CMRR is rarely better known). */
export const RISING_PART_CONSISTENCY_DB = 3;
/** Phase within this many degrees of 0° or 180° decides the sign (common practice, no source). */
const SIGN_PHASE_WINDOW_DEG = 45;
const RATIO_MONTE_CARLO_TRIALS = 20_000;

/**
 * Exact inversion of the ideal-op-amp relation (DOMAIN.md) `Acm/Ad = 2(R1R4 − R2R3)/(R4(R1+R2) +
 * R2(R3+R4))`: with `R2 = G·R1'` and `R4 = G·(1 + δ)·R3'` it becomes `Acm/Ad = δ/((1 + G) +
 * δ·(1 + 2G)/2)`, so `δ = ρ·(1 + G)/(1 − ρ·(1 + 2G)/2)` for a signed ratio ρ = Acm/Ad of the
 * difference stage. To first order δ ≈ ρ·(1 + G), the familiar (1 + G)/δ rejection.
 *
 * @param signedStageRatio ρ = Acm/Ad of the difference stage (signed, dimensionless)
 * @param stageGain G = R2/R1' (> 0)
 * @returns δ, a fraction (signed like ρ)
 * @example ratioErrorFromCommonModeRatio(0.0005 / (11 + 0.0005 * 10.5), 10) // → 0.0005
 */
export function ratioErrorFromCommonModeRatio(signedStageRatio: number, stageGain: number): number {
  return (signedStageRatio * (1 + stageGain)) / (1 - (signedStageRatio * (1 + 2 * stageGain)) / 2);
}

function formatPercent(fraction: number): string {
  const percent = fraction * 100;
  if (percent === 0) return '0 %';
  return `${Number(percent.toPrecision(2))} %`;
}

function formatHz(frequencyHz: number): string {
  if (frequencyHz >= 1e6) return `${Number((frequencyHz / 1e6).toPrecision(3))} MHz`;
  if (frequencyHz >= 1e3) return `${Number((frequencyHz / 1e3).toPrecision(3))} kHz`;
  return `${Number(frequencyHz.toPrecision(3))} Hz`;
}

function toleranceWords(circuit: Circuit): string {
  const tolerances = [circuit.r1.tolerance, circuit.r2.tolerance, circuit.r3.tolerance, circuit.r4.tolerance];
  if (tolerances.every((value) => value === tolerances[0])) return `${formatPercent(tolerances[0])} resistors`;
  return `the design's tolerances (R1 ${formatPercent(tolerances[0])}, R2 ${formatPercent(tolerances[1])}, R3 ${formatPercent(tolerances[2])}, R4 ${formatPercent(tolerances[3])})`;
}

/** The difference stage with R4 set so its ratio matches R2/R1' exactly: what the op-amp alone leaves. */
function matchedPrediction(circuit: Circuit, frequenciesHz: number[]): { lowDb: number; highDb: number }[] {
  const opAmp = circuitOpAmp(circuit) ?? undefined;
  const sources = circuit.topology === 'difference-amplifier' ? [circuit.sourceResistance1Ohms ?? 0, circuit.sourceResistance2Ohms ?? 0] : [0, 0];
  const stageGain = circuit.r2.ohms / (circuit.r1.ohms + sources[0]);
  const stage = {
    r1Ohms: circuit.r1.ohms,
    r2Ohms: circuit.r2.ohms,
    r3Ohms: circuit.r3.ohms,
    r4Ohms: stageGain * (circuit.r3.ohms + sources[1]),
    sourceResistance1Ohms: sources[0],
    sourceResistance2Ohms: sources[1],
  };
  if (circuit.topology === 'difference-amplifier') {
    return predictDifferenceAmplifier(frequenciesHz, stage, opAmp).map((point) => ({ lowDb: point.cmrrBandLowDb, highDb: point.cmrrBandHighDb }));
  }
  return predictInstrumentationAmplifier(
    frequenciesHz,
    {
      feedbackResistance1Ohms: circuit.feedback1.ohms,
      feedbackResistance2Ohms: circuit.feedback2.ohms,
      gainResistanceOhms: circuit.gainResistor.ohms,
      differenceStage: stage,
    },
    opAmp ? { input1: opAmp, input2: opAmp, difference: opAmp } : {},
  ).map((point) => ({ lowDb: point.cmrrBandLowDb, highDb: point.cmrrBandHighDb }));
}

/** Circular mean of Acm phase − Ad phase over resolved points below `upToHz`, degrees. */
function lowFrequencyPhase(points: readonly CmrrPoint[], upToHz: number): { meanDeg: number | null; count: number } {
  let sumCos = 0;
  let sumSin = 0;
  let count = 0;
  for (const point of points) {
    if (point.lowerBound || point.frequencyHz > upToHz || point.acmPhaseDeg === undefined || point.adPhaseDeg === undefined) continue;
    const radians = ((point.acmPhaseDeg - point.adPhaseDeg) * Math.PI) / 180;
    sumCos += Math.cos(radians);
    sumSin += Math.sin(radians);
    count++;
  }
  if (count === 0 || (sumCos === 0 && sumSin === 0)) return { meanDeg: null, count };
  return { meanDeg: (Math.atan2(sumSin, sumCos) * 180) / Math.PI, count };
}

function diagnoseRatio(
  circuit: Circuit,
  ratio: number,
  basis: RatioErrorDiagnosis['basis'],
  points: readonly CmrrPoint[],
  flatUpToHz: number,
): RatioErrorDiagnosis {
  const resistors = nominalResistors(circuit, 'diagnoseAgainstDesign');
  const [r1, r2, r3, r4] = resistors;
  const stageGain = r2.ohms / (r1.ohms + r1.seriesOhms);
  const inputStageGain = circuit.topology === 'instrumentation-amplifier' ? 1 + (circuit.feedback1.ohms + circuit.feedback2.ohms) / circuit.gainResistor.ohms : 1;
  // The input stage passes common mode at unity and multiplies the difference by its gain, so the
  // difference stage's own ratio is the whole amplifier's times the input-stage gain (DOMAIN.md).
  const stageRatio = ratio * inputStageGain;
  const { meanDeg, count } = lowFrequencyPhase(points, flatUpToHz);
  let sign: RatioErrorDiagnosis['sign'] = 'unknown';
  if (meanDeg !== null && Math.abs(meanDeg) <= SIGN_PHASE_WINDOW_DEG) sign = 'positive';
  else if (meanDeg !== null && Math.abs(meanDeg) >= 180 - SIGN_PHASE_WINDOW_DEG) sign = 'negative';
  const signedFor = (magnitude: number, direction: number) => ratioErrorFromCommonModeRatio(direction * magnitude, stageGain);
  const direction = sign === 'negative' ? -1 : 1;
  const effective = Math.abs(signedFor(stageRatio, direction));

  const flat = matchedPrediction(circuit, [0])[0];
  const opAmpFlatRatio = Number.isFinite(flat.lowDb) ? 1 / dbToMagnitude(flat.lowDb) : 0;
  const opAmpStageRatio = opAmpFlatRatio * inputStageGain;
  const range: [number, number] = [
    Math.abs(signedFor(Math.max(stageRatio - opAmpStageRatio, 0), direction)),
    Math.abs(signedFor(stageRatio + opAmpStageRatio, direction)),
  ];

  const ratioOf = (values: number[]) => (values[3] / values[2]) / (values[1] / values[0]) - 1;
  const nominal = ratioOf([r1, r2, r3, r4].map((r) => r.ohms + r.seriesOhms));
  let worstCase = 0;
  for (let corner = 0; corner < 16; corner++) {
    const values = [r1, r2, r3, r4].map((r, index) => r.ohms * ((corner >> index) & 1 ? 1 + r.toleranceFraction : 1 - r.toleranceFraction) + r.seriesOhms);
    worstCase = Math.max(worstCase, Math.abs(ratioOf(values)));
  }
  const trials = drawCircuitTrials(circuit, {
    trials: RATIO_MONTE_CARLO_TRIALS,
    seed: 1,
    distribution: circuit.toleranceDistribution ?? 'uniform',
    opAmpTermSign: 1,
  });
  const errors = new Float64Array(RATIO_MONTE_CARLO_TRIALS);
  for (let trial = 0; trial < RATIO_MONTE_CARLO_TRIALS; trial++) {
    errors[trial] = Math.abs((trials.r4Ohms[trial] / trials.r3Ohms[trial]) / (trials.r2Ohms[trial] / trials.r1Ohms[trial]) - 1);
  }
  const [p95] = percentilesInPlace(errors, [95]);

  // The resistors can be blamed only for what is left once the op-amp's term is taken off.
  const resistorPart = range[0];
  const verdict: RatioErrorDiagnosis['verdict'] = resistorPart > worstCase ? 'beyond-rating' : resistorPart > p95 ? 'unusual' : 'within-rating';
  const signWords = sign === 'unknown' ? '' : sign === 'positive' ? ' (R4/R3 the larger ratio, from the phase)' : ' (R2/R1 the larger ratio, from the phase)';
  const allowance = `${toleranceWords(circuit)} (worst case ${formatPercent(worstCase)}, 95 % of builds below ${formatPercent(p95)})`;
  let sentence = `Effective ratio error ${formatPercent(effective)}${signWords}, `;
  if (verdict === 'within-rating') sentence += `within what ${allowance} allow.`;
  else if (verdict === 'unusual') sentence += `inside the worst case of ${allowance} but above its 95th percentile: possible, but look at the parts.`;
  else {
    const excessOhms = (resistorPart - worstCase) * (r3.ohms + r3.seriesOhms);
    sentence +=
      `beyond what ${allowance} allow: check the resistors' actual values, a source resistance imbalance ` +
      `(about ${Number(excessOhms.toPrecision(2))} Ω between the two sources would explain the excess), and the fixture's own rejection.`;
  }
  if (opAmpStageRatio > 0.3 * stageRatio) {
    sentence += ` The op-amp's own dc rejection is a large share of this flat level, so the resistors' part lies between ${formatPercent(range[0])} and ${formatPercent(range[1])}.`;
  }
  return {
    basis,
    commonModeToDifferentialRatio: ratio,
    stageGain,
    inputStageGain,
    effectiveRatioErrorFraction: effective,
    sign,
    signedRatioErrorFraction: sign === 'unknown' ? null : direction * effective,
    phaseDifferenceDeg: meanDeg,
    phasePointCount: count,
    opAmpFlatRatio,
    resistorRatioErrorRangeFraction: range,
    nominalRatioErrorFraction: nominal,
    worstCaseRatioErrorFraction: worstCase,
    monteCarloP95RatioErrorFraction: p95,
    verdict,
    sentence,
  };
}

function diagnoseRisingPart(circuit: Circuit, fit: FrequencyFit, points: readonly CmrrPoint[]): RisingPartDiagnosis | null {
  const model = fit.commonModeGainModel;
  if (!model || !(model.kPerHz > 0)) return null;
  let referenceFrequencyHz = 0;
  for (const point of points) if (!point.lowerBound && point.frequencyHz > referenceFrequencyHz) referenceFrequencyHz = point.frequencyHz;
  if (!(referenceFrequencyHz > 0)) return null;
  const measuredRatio = (model.kPerHz * referenceFrequencyHz) / fit.differentialGainDc;
  const risingPartCmrrDb = -20 * Math.log10(measuredRatio);
  const opAmp = circuit.opAmp;
  if (!opAmp) {
    return {
      referenceFrequencyHz,
      risingPartCmrrDb,
      predictedRisingCmrrDb: null,
      predictedRisingOptimisticCmrrDb: null,
      excessDb: null,
      impliedOpAmpCornerHz: null,
      dataCornerHz: null,
      verdict: 'no-op-amp-data',
      sentence:
        `The rising part gives ${risingPartCmrrDb.toFixed(1)} dB at ${formatHz(referenceFrequencyHz)}; ` +
        'the design has no op-amp data to set it beside.',
    };
  }
  // The rising part of the op-amp-only prediction: its |Acm/Ad| at the reference frequency with the
  // flat (dc) part taken off in quadrature, as the first-order model separates them.
  const [atDc, atReference] = matchedPrediction(circuit, [0, referenceFrequencyHz]);
  const rising = (levelDb: number, dcDb: number) => {
    const total = Number.isFinite(levelDb) ? 1 / dbToMagnitude(levelDb) : 0;
    const flat = Number.isFinite(dcDb) ? 1 / dbToMagnitude(dcDb) : 0;
    return Math.sqrt(Math.max(total * total - flat * flat, 0));
  };
  const pessimistic = rising(atReference.lowDb, atDc.lowDb);
  const optimistic = rising(atReference.highDb, atDc.highDb);
  const toDb = (ratio: number) => (ratio > 0 ? -20 * Math.log10(ratio) : Infinity);
  const predictedRisingCmrrDb = toDb(pessimistic);
  const predictedRisingOptimisticCmrrDb = toDb(optimistic);
  const excessDb = pessimistic > 0 ? 20 * Math.log10(measuredRatio / pessimistic) : Infinity;
  const shortfallDb = optimistic > 0 ? 20 * Math.log10(optimistic / measuredRatio) : -Infinity;
  const impliedOpAmpCornerHz = Number.isFinite(excessDb) ? opAmp.cmrrCornerHz * 10 ** (-excessDb / 20) : null;
  let verdict: RisingPartDiagnosis['verdict'] = 'consistent';
  if (excessDb > RISING_PART_CONSISTENCY_DB) verdict = 'worse';
  else if (shortfallDb > RISING_PART_CONSISTENCY_DB) verdict = 'better';
  const at = `at ${formatHz(referenceFrequencyHz)}`;
  let sentence: string;
  if (verdict === 'worse') {
    sentence =
      `Rising part ${excessDb.toFixed(0)} dB worse than the op-amp data (${risingPartCmrrDb.toFixed(1)} dB against ${predictedRisingCmrrDb.toFixed(1)} dB ${at}): ` +
      'look for capacitive imbalance between the two inputs (layout, cable, source capacitance), or an op-amp whose rejection corner ' +
      `is lower than its data say (this would need about ${formatHz(impliedOpAmpCornerHz ?? 0)} against ${formatHz(opAmp.cmrrCornerHz)}).`;
  } else if (verdict === 'better') {
    sentence =
      `Rising part ${shortfallDb.toFixed(0)} dB better than the op-amp data predict (${risingPartCmrrDb.toFixed(1)} dB ${at}): ` +
      'the data are conservative, or a small imbalance cancels part of the op-amp\'s term.';
  } else {
    const predicted =
      Math.abs(predictedRisingOptimisticCmrrDb - predictedRisingCmrrDb) < 0.5
        ? `${predictedRisingCmrrDb.toFixed(1)} dB`
        : `${predictedRisingCmrrDb.toFixed(1)}–${Number.isFinite(predictedRisingOptimisticCmrrDb) ? predictedRisingOptimisticCmrrDb.toFixed(1) : '∞'} dB between the op-amp-sign cases`;
    sentence = `Rising part consistent with the op-amp data (${risingPartCmrrDb.toFixed(1)} dB against ${predicted} ${at}).`;
  }
  return {
    referenceFrequencyHz,
    risingPartCmrrDb,
    predictedRisingCmrrDb,
    predictedRisingOptimisticCmrrDb,
    excessDb,
    impliedOpAmpCornerHz,
    dataCornerHz: opAmp.cmrrCornerHz,
    verdict,
    sentence,
  };
}

/**
 * Diagnoses a measured CMRR curve against its design (issue 5, "Diagnosis against the design").
 *
 * - Flat part: the fit's `Acm0/Ad0` (first-order model) or its low-frequency CMRR (smooth model)
 *   gives the effective resistor ratio error δ by the exact inversion of DOMAIN.md's ideal-op-amp
 *   relation ({@link ratioErrorFromCommonModeRatio}); for the three-op-amp instrumentation
 *   amplifier the ratio is first multiplied by the input-stage gain 1 + (RF1 + RF2)/RG (DOMAIN.md:
 *   the input stage multiplies the difference stage's rejection by its gain). The sign comes from
 *   the phase of Acm relative to Ad over the flat-part points (below a third of the corner): near
 *   0° R4/R3' is the larger ratio, near 180° R2/R1'. δ is set beside the worst case over the 16
 *   tolerance corners of R1…R4 and the 95th percentile of a 20,000-trial Monte Carlo (seed 1). The
 *   op-amp's own dc term (engine prediction with matched resistors) is reported and taken off
 *   with either sign to bound the resistors' share. A source resistance imbalance acts exactly
 *   like a resistor error (DOMAIN.md) and is named where the flat part exceeds the rating.
 * - Rising part (first-order model only): `k·f/Ad0` at the highest resolved frequency against the
 *   rising part of the engine's prediction for the same circuit with matched resistors and the
 *   design's op-amp data (predictDifferenceAmplifier / predictInstrumentationAmplifier, the
 *   pessimistic and optimistic op-amp signs); within ±3 dB counts as consistent
 *   ({@link RISING_PART_CONSISTENCY_DB}). The implied corner assumes the data's dc rejection.
 *
 * Fits with model `smooth` give the flat part only (when their low-frequency level is known);
 * `none` gives nothing; `notes` says so. Cost: O(points) plus a 20,000-trial Monte Carlo (about
 * 1 ms).
 *
 * @param fit the frequency fit of the session (fitCmrrFrequencyResponse)
 * @param points the session's paired points (phases used where present)
 * @param circuit the design revision's circuit
 * @throws EngineInputError for an unusable circuit (a resistor or tolerance, naming it) or a fit whose Ad0 is not positive
 * @example diagnoseAgainstDesign(fit, points, circuit).sentences[0] // → "Effective ratio error 0.05 %, within what 0.05 % resistors allow …"
 */
export function diagnoseAgainstDesign(fit: FrequencyFit, points: readonly CmrrPoint[], circuit: Circuit): DesignDiagnosis {
  nominalResistors(circuit, 'diagnoseAgainstDesign');
  if (fit.model !== 'none' && !(fit.differentialGainDc > 0)) {
    throw new EngineInputError(`diagnoseAgainstDesign requires a fit with a positive differential gain, got ${fit.differentialGainDc}`, {
      field: 'fit.differentialGainDc',
    });
  }
  const notes: string[] = [];
  let ratio: RatioErrorDiagnosis | null = null;
  let risingPart: RisingPartDiagnosis | null = null;
  const flatUpToHz = fit.cmrrCornerHz !== null ? fit.cmrrCornerHz / 3 : Infinity;
  if (fit.model === 'first-order' && fit.commonModeGainModel) {
    const flatRatio = fit.commonModeGainModel.acm0 / fit.differentialGainDc;
    ratio = diagnoseRatio(circuit, flatRatio, 'first-order-fit', points, flatUpToHz);
    risingPart = diagnoseRisingPart(circuit, fit, points);
    if (!risingPart) notes.push('The fit shows no rising part, so the op-amp rejection cannot be read from it.');
  } else if (fit.model === 'smooth') {
    if (fit.cmrrDcDb !== null) {
      ratio = diagnoseRatio(circuit, 1 / dbToMagnitude(fit.cmrrDcDb), 'smooth-low-frequency-level', points, flatUpToHz);
    } else {
      notes.push('The data show no flat low-frequency level, so the resistor ratio error cannot be read from them.');
    }
    notes.push(
      `The first-order model does not describe these data (${fit.modelReason}), so the op-amp rejection and corner of the rising part cannot be diagnosed.`,
    );
  } else {
    notes.push(`Too few resolved points to fit (${fit.modelReason}): nothing can be diagnosed against the design.`);
  }
  const sentences = [ratio?.sentence, risingPart?.sentence, ...notes].filter((sentence): sentence is string => Boolean(sentence));
  return { model: fit.model, ratio, risingPart, notes, sentences };
}
