import { describe, expect, it } from 'vitest';
import { magnitudeComplex } from '../../../shared/engine/complex';
import { predictDifferenceAmplifier, type OpAmpModel, type OpAmpTermSign } from '../../../shared/engine/difference-amplifier';
import {
  instrumentationAmplifierCmrrEstimateDb,
  instrumentationAmplifierGains,
  predictInstrumentationAmplifier,
  type InstrumentationAmplifierCircuit,
} from '../../../shared/engine/instrumentation-amplifier';
import { hasNgspice } from '../../helpers/reference-tools';
import { readNetlistParameters, runGainNetlist } from './ngspice-fixtures';

/** The required agreement with ngspice (13 printed digits are far finer). */
const NGSPICE_AGREEMENT_DB = 0.01;
/** A 4×4 elimination and a closed form in double precision: a few ulps, amplified by the gain of 100. */
const ROUNDING_RELATIVE = 1e-10;

const circuit: InstrumentationAmplifierCircuit = {
  feedbackResistance1Ohms: 4950,
  feedbackResistance2Ohms: 4950,
  gainResistanceOhms: 100,
  differenceStage: { r1Ohms: 10e3, r2Ohms: 10e3, r3Ohms: 10e3, r4Ohms: 10.1e3 },
};

/** An op-amp whose gain and bandwidth are effectively infinite but whose own rejection is finite. */
function rejectionOnly(cmrrDb: number): OpAmpModel {
  return { openLoopGainDb: 300, gainBandwidthHz: 1e18, cmrrDb, cmrrCornerHz: 1e15 };
}

describe('instrumentationAmplifierGains with ideal op-amps', () => {
  it('has input-stage differential gain 1 + 2·RF/RG and common-mode gain 1', () => {
    // Three-op-amp instrumentation amplifier, DOMAIN.md (from memory, textbook): 1 + 2·4950/100 = 100.
    const gains = instrumentationAmplifierGains(circuit);
    expect(Math.abs(gains.inputStageDifferentialGain.re / 100 - 1)).toBeLessThan(ROUNDING_RELATIVE);
    expect(Math.abs(gains.inputStageCommonModeGain.re - 1)).toBeLessThan(ROUNDING_RELATIVE);
  });

  it('multiplies the difference stage’s rejection by the input-stage gain', () => {
    // DOMAIN.md (from memory, textbook): with ideal op-amps CMRR = G1 · CMRRds, here +40 dB exactly.
    const [differenceStage] = predictDifferenceAmplifier([0], circuit.differenceStage);
    const [whole] = predictInstrumentationAmplifier([0], circuit);
    expect(whole.cmrrDb - differenceStage.cmrrDb).toBeCloseTo(40, 9);
    expect(instrumentationAmplifierCmrrEstimateDb(100, differenceStage.cmrrDb)).toBeCloseTo(whole.cmrrDb, 9);
  });
});

describe('instrumentationAmplifierGains with input op-amps of finite rejection', () => {
  const matchedStage: InstrumentationAmplifierCircuit = {
    ...circuit,
    differenceStage: { r1Ohms: 10e3, r2Ohms: 10e3, r3Ohms: 10e3, r4Ohms: 10e3 },
  };

  it('adds the input op-amps’ rejection mismatch directly, not divided by the gain', () => {
    // DOMAIN.md (from memory, textbook): 1/CMRR ≈ |1/CMRR1 − 1/CMRR2| with a perfect difference stage;
    // 90 dB and 100 dB of the same sign leave 1/CMRR = 3.162e-5 − 1e-5 → 93.30 dB.
    // The model differs from the estimate in second order (terms of 1/CMRR²): 1e-3 dB is generous.
    const gains = instrumentationAmplifierGains(matchedStage, 0, { input1: rejectionOnly(90), input2: rejectionOnly(100) });
    const cmrrDb = 20 * Math.log10(magnitudeComplex(gains.differentialGain) / magnitudeComplex(gains.commonModeGain));
    expect(cmrrDb).toBeCloseTo(instrumentationAmplifierCmrrEstimateDb(100, Infinity, 90, 100), 3);
    expect(cmrrDb).toBeCloseTo(93.3, 1);
  });

  it('cancels equal input op-amp terms of the same sign and doubles them for opposite signs', () => {
    // Follows from the estimate above: |e − e| = 0 and |e + e| = 2e (textbook, from memory).
    const opAmps = { input1: rejectionOnly(90), input2: rejectionOnly(90) };
    const same = instrumentationAmplifierGains(matchedStage, 0, opAmps);
    expect(magnitudeComplex(same.commonModeGain)).toBeLessThan(1e-12);
    const opposite = instrumentationAmplifierGains(matchedStage, 0, opAmps, { input1: 1, input2: -1, difference: 1 });
    const cmrrDb = 20 * Math.log10(magnitudeComplex(opposite.differentialGain) / magnitudeComplex(opposite.commonModeGain));
    expect(cmrrDb).toBeCloseTo(90 - 20 * Math.log10(2), 3);
  });

  it('spans the sign combinations in its band', () => {
    const [point] = predictInstrumentationAmplifier([100], matchedStage, { input1: rejectionOnly(90), input2: rejectionOnly(90) });
    expect(point.cmrrBandLowDb).toBeCloseTo(90 - 20 * Math.log10(2), 3);
    expect(point.cmrrBandHighDb).toBeGreaterThan(200);
    expect(point.cmrrDb).toBeGreaterThan(200);
  });
});

describe('predictInstrumentationAmplifier against ngspice (tests/fixtures/ngspice/instrumentation-amplifier-opamps.cir)', () => {
  it.skipIf(!hasNgspice)('matches Ad, Acm and CMRR within 0.01 dB with three different op-amps and mixed signs', () => {
    const netlist = 'instrumentation-amplifier-opamps.cir';
    const p = readNetlistParameters(netlist);
    const rows = runGainNetlist(netlist);
    const netlistCircuit: InstrumentationAmplifierCircuit = {
      feedbackResistance1Ohms: p.rf1,
      feedbackResistance2Ohms: p.rf2,
      gainResistanceOhms: p.rg,
      differenceStage: { r1Ohms: p.r1, r2Ohms: p.r2, r3Ohms: p.r3, r4Ohms: p.r4 },
    };
    const opAmp = (index: number): OpAmpModel => ({
      openLoopGainDb: p[`a0db${index}`],
      gainBandwidthHz: p[`gbw${index}`],
      cmrrDb: p[`cmrrdb${index}`],
      cmrrCornerHz: p[`fcm${index}`],
    });
    const signs = {
      input1: p.cmsign1 as OpAmpTermSign,
      input2: p.cmsign2 as OpAmpTermSign,
      difference: p.cmsign3 as OpAmpTermSign,
    };
    expect(rows).toHaveLength(36);
    for (const row of rows) {
      const gains = instrumentationAmplifierGains(
        netlistCircuit,
        row.frequencyHz,
        { input1: opAmp(1), input2: opAmp(2), difference: opAmp(3) },
        signs,
      );
      const adDb = 20 * Math.log10(magnitudeComplex(gains.differentialGain));
      const acmDb = 20 * Math.log10(magnitudeComplex(gains.commonModeGain));
      expect(Math.abs(20 * Math.log10(row.differentialMagnitude) - adDb)).toBeLessThan(NGSPICE_AGREEMENT_DB);
      expect(Math.abs(20 * Math.log10(row.commonModeMagnitude) - acmDb)).toBeLessThan(NGSPICE_AGREEMENT_DB);
    }
  });
});

describe('instrumentation amplifier input checks', () => {
  it('names a non-positive feedback or gain resistor', () => {
    expect(() => instrumentationAmplifierGains({ ...circuit, gainResistanceOhms: 0 })).toThrowError(/gainResistanceOhms/);
    expect(() => predictInstrumentationAmplifier([1], { ...circuit, feedbackResistance2Ohms: -1 })).toThrowError(/feedbackResistance2Ohms/);
  });

  it('names the difference-stage resistor and the op-amp whose data is incomplete', () => {
    expect(() =>
      instrumentationAmplifierGains({ ...circuit, differenceStage: { ...circuit.differenceStage, r4Ohms: Number.NaN } }),
    ).toThrowError(/r4Ohms/);
    const partial = { openLoopGainDb: 100, cmrrDb: 90, cmrrCornerHz: 10 } as OpAmpModel;
    expect(() => instrumentationAmplifierGains(circuit, 0, { input2: partial })).toThrowError(/input2\.gainBandwidthHz is missing/);
  });

  it('rejects bad frequencies and estimate inputs', () => {
    expect(() => predictInstrumentationAmplifier([1, Infinity], circuit)).toThrowError(/entry 2/);
    expect(() => predictInstrumentationAmplifier([], circuit)).toThrowError(/at least one frequency/);
    expect(() => instrumentationAmplifierGains(circuit, -1)).toThrowError(/frequency/);
    expect(() => instrumentationAmplifierCmrrEstimateDb(0.5, 60)).toThrowError(/at least 1/);
    expect(() => instrumentationAmplifierCmrrEstimateDb(10, Number.NaN)).toThrowError(/differenceStageCmrrDb is NaN/);
  });
});
