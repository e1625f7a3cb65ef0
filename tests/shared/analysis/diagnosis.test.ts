import { describe, expect, it } from 'vitest';
import {
  EngineInputError,
  fitCmrrFrequencyResponse,
  logSpacedFrequencies,
  predictDifferenceAmplifier,
  predictInstrumentationAmplifier,
  type FrequencyFit,
} from '../../../shared/engine';
import { diagnoseAgainstDesign, ratioErrorFromCommonModeRatio } from '../../../shared/analysis';
import { differenceCircuit, instrumentationCircuit, OP_AMP, point, pointsFromPrediction } from './fixtures';

const FREQUENCIES = logSpacedFrequencies(10, 100e3, 41);
/**
 * The op-amp's own dc term (120 dB → 1e-6) against the resistors' (0.05 % at G = 10 → 4.5e-5)
 * shifts the effective error by about 2.2 %; 3 % leaves room for the fit (noiseless data: ~0).
 */
const RATIO_RECOVERY_RELATIVE = 0.03;
/** Noiseless data: the first-order model is exact for a difference amplifier, so the fit recovers k to rounding; 0.1 dB is generous. */
const RISING_RECOVERY_DB = 0.1;

function measuredDifferenceAmplifier(r4MismatchFraction: number, opAmp = OP_AMP) {
  // The engine's circuit prediction of a deliberately mismatched build stands in for the bench.
  const prediction = predictDifferenceAmplifier(FREQUENCIES, { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100e3 * (1 + r4MismatchFraction) }, opAmp);
  const points = pointsFromPrediction(prediction);
  return { points, fit: fitCmrrFrequencyResponse(points) };
}

describe('ratioErrorFromCommonModeRatio', () => {
  it('inverts the textbook Acm/Ad of DOMAIN.md exactly', () => {
    // Forward: Acm/Ad = 2(R1R4 − R2R3)/(R4(R1+R2) + R2(R3+R4)) with R1 = R3 = 1, R2 = 10, R4 = 10·(1 + δ).
    for (const delta of [0.0005, -0.002, 0.03]) {
      const r4 = 10 * (1 + delta);
      const ratio = (2 * (r4 - 10)) / (r4 * 11 + 10 * (1 + r4));
      expect(Math.abs(ratioErrorFromCommonModeRatio(ratio, 10) / delta - 1)).toBeLessThan(1e-12);
    }
  });
});

describe('diagnoseAgainstDesign', () => {
  it('recovers R4 off by +0.05 % as a positive ratio error within the 0.05 % resistors’ rating', () => {
    const { points, fit } = measuredDifferenceAmplifier(0.0005);
    const diagnosis = diagnoseAgainstDesign(fit, points, differenceCircuit(0.0005));
    const ratio = diagnosis.ratio!;
    expect(Math.abs(ratio.effectiveRatioErrorFraction / 0.0005 - 1)).toBeLessThan(RATIO_RECOVERY_RELATIVE);
    // The range after taking the op-amp's dc term off with either sign holds the true 0.05 %.
    expect(ratio.resistorRatioErrorRangeFraction[0]).toBeLessThanOrEqual(0.0005 * (1 + 1e-9));
    expect(ratio.resistorRatioErrorRangeFraction[1]).toBeGreaterThanOrEqual(0.0005 * (1 - 1e-9));
    expect(ratio.sign).toBe('positive');
    expect(ratio.verdict).toBe('within-rating');
    // Four resistors at ±0.05 %: worst |δ| = (1.0005/0.9995)² − 1 ≈ 0.2 % (exact corner algebra).
    expect(Math.abs(ratio.worstCaseRatioErrorFraction - ((1.0005 / 0.9995) ** 2 - 1))).toBeLessThan(1e-12);
    expect(ratio.sentence).toMatch(/^Effective ratio error 0\.051 % \(R4\/R3 the larger ratio, from the phase\), within what 0\.05 % resistors/);
  });

  it('reads the opposite sign from the phase when R4 is low', () => {
    const { points, fit } = measuredDifferenceAmplifier(-0.0005);
    const ratio = diagnoseAgainstDesign(fit, points, differenceCircuit(0.0005)).ratio!;
    expect(ratio.sign).toBe('negative');
    expect(ratio.signedRatioErrorFraction).toBeLessThan(0);
    expect(Math.abs(-ratio.signedRatioErrorFraction! / 0.0005 - 1)).toBeLessThan(RATIO_RECOVERY_RELATIVE);
  });

  it('leaves the sign unknown without phases', () => {
    const { points, fit } = measuredDifferenceAmplifier(0.0005);
    const withoutPhases = points.map(({ adPhaseDeg: _ad, acmPhaseDeg: _acm, ...rest }) => rest);
    const ratio = diagnoseAgainstDesign(fit, withoutPhases, differenceCircuit(0.0005)).ratio!;
    expect(ratio.sign).toBe('unknown');
    expect(ratio.signedRatioErrorFraction).toBeNull();
  });

  it('calls a 0.3 % ratio error beyond what 0.05 % resistors allow and names source imbalance', () => {
    const { points, fit } = measuredDifferenceAmplifier(0.003);
    const ratio = diagnoseAgainstDesign(fit, points, differenceCircuit(0.0005)).ratio!;
    expect(ratio.verdict).toBe('beyond-rating');
    expect(ratio.sentence).toMatch(/beyond what 0\.05 % resistors/);
    expect(ratio.sentence).toMatch(/source resistance imbalance/);
  });

  it('finds a rising part consistent with the op-amp data when the op-amp is as its data say', () => {
    const { points, fit } = measuredDifferenceAmplifier(0.0005);
    const rising = diagnoseAgainstDesign(fit, points, differenceCircuit(0.0005)).risingPart!;
    expect(rising.verdict).toBe('consistent');
    expect(Math.abs(rising.excessDb!)).toBeLessThan(RISING_RECOVERY_DB);
  });

  it('reports an op-amp 10 dB worse than its data as a rising part about 10 dB worse', () => {
    // Simulated build: op-amp CMRR 110 dB where the design's data say 120 dB.
    const { points, fit } = measuredDifferenceAmplifier(0.0005, { ...OP_AMP, cmrrDb: 110 });
    const rising = diagnoseAgainstDesign(fit, points, differenceCircuit(0.0005)).risingPart!;
    expect(Math.abs(rising.excessDb! - 10)).toBeLessThan(RISING_RECOVERY_DB);
    expect(rising.verdict).toBe('worse');
    expect(rising.sentence).toMatch(/^Rising part 10 dB worse than the op-amp data/);
    expect(rising.sentence).toMatch(/capacitive imbalance/);
    // With the data's dc rejection, a corner 10 dB (×3.16) lower explains it: 30 Hz → 9.49 Hz.
    expect(Math.abs(rising.impliedOpAmpCornerHz! - 30 / 10 ** 0.5)).toBeLessThan(0.05);
  });

  it('divides by the input-stage gain for an instrumentation amplifier', () => {
    const opAmp = { ...OP_AMP, cmrrCornerHz: 10 };
    const prediction = predictInstrumentationAmplifier(
      FREQUENCIES,
      { feedbackResistance1Ohms: 4500, feedbackResistance2Ohms: 4500, gainResistanceOhms: 1000, differenceStage: { r1Ohms: 10e3, r2Ohms: 10e3, r3Ohms: 10e3, r4Ohms: 10e3 * 1.0005 } },
      { input1: opAmp, input2: opAmp, difference: opAmp },
    );
    const points = pointsFromPrediction(prediction);
    const ratio = diagnoseAgainstDesign(fitCmrrFrequencyResponse(points), points, instrumentationCircuit(0.0005)).ratio!;
    expect(ratio.inputStageGain).toBe(10);
    // Without the division the answer would be 10× too small; op-amp terms move it by under 1 % here.
    expect(Math.abs(ratio.effectiveRatioErrorFraction / 0.0005 - 1)).toBeLessThan(RATIO_RECOVERY_RELATIVE);
  });

  it('says the rising part cannot be set beside anything when the design has no op-amp data', () => {
    const { points, fit } = measuredDifferenceAmplifier(0.0005);
    const rising = diagnoseAgainstDesign(fit, points, differenceCircuit(0.0005, null)).risingPart!;
    expect(rising.verdict).toBe('no-op-amp-data');
    expect(rising.sentence).toMatch(/no op-amp data/);
  });

  it('diagnoses only the flat part of a smooth fit, and says why', () => {
    const { points, fit } = measuredDifferenceAmplifier(0.0005);
    const smooth: FrequencyFit = { ...fit, model: 'smooth', modelReason: 'residual RMS 2.1 dB above 1.5 dB', commonModeGainModel: null };
    const diagnosis = diagnoseAgainstDesign(smooth, points, differenceCircuit(0.0005));
    expect(diagnosis.ratio?.basis).toBe('smooth-low-frequency-level');
    expect(diagnosis.risingPart).toBeNull();
    expect(diagnosis.notes.join(' ')).toMatch(/first-order model does not describe these data \(residual RMS 2\.1 dB/);
  });

  it('diagnoses nothing from a fit of model none, and says so', () => {
    const points = [point(100, 80, true), point(1000, 80, true)];
    const diagnosis = diagnoseAgainstDesign(fitCmrrFrequencyResponse(points), points, differenceCircuit());
    expect(diagnosis.model).toBe('none');
    expect(diagnosis.ratio).toBeNull();
    expect(diagnosis.sentences[0]).toMatch(/nothing can be diagnosed/);
  });

  it('refuses a circuit with an unusable tolerance, naming the resistor', () => {
    const { points, fit } = measuredDifferenceAmplifier(0.0005);
    const circuit = differenceCircuit();
    circuit.r2 = { ohms: 100e3, tolerance: -0.01 };
    expect(() => diagnoseAgainstDesign(fit, points, circuit)).toThrow(EngineInputError);
    expect(() => diagnoseAgainstDesign(fit, points, circuit)).toThrow(/tolerance of R2/);
  });
});
