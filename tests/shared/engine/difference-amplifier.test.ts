import { describe, expect, it } from 'vitest';
import { magnitudeComplex } from '../../../shared/engine/complex';
import {
  differenceAmplifierGains,
  opAmpResponse,
  predictDifferenceAmplifier,
  type DifferenceAmplifierResistors,
  type OpAmpModel,
} from '../../../shared/engine/difference-amplifier';
import { EngineInputError } from '../../../shared/engine/errors';
import { hasNgspice } from '../../helpers/reference-tools';
import { readNetlistParameters, runGainNetlist } from './ngspice-fixtures';

/** The required agreement with ngspice. ngspice prints 13 significant digits; its ideal stand-in (gain 1e6) moves Ad by about 1e-4 dB. */
const NGSPICE_AGREEMENT_DB = 0.01;
/** Closed forms and node equations evaluate the same rational function in a different order: a few ulps apart. */
const ROUNDING_RELATIVE = 1e-12;

const matched: DifferenceAmplifierResistors = { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100e3 };
const mismatched: DifferenceAmplifierResistors = { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10.01e3, r4Ohms: 99.9e3 };
const opAmp: OpAmpModel = { openLoopGainDb: 110, gainBandwidthHz: 3e6, cmrrDb: 95, cmrrCornerHz: 2e3 };

/** DOMAIN.md textbook relations (ideal op-amp). */
function textbookGains(r1: number, r2: number, r3: number, r4: number): { ad: number; acm: number } {
  return {
    acm: (r1 * r4 - r2 * r3) / (r1 * (r3 + r4)),
    ad: (r4 * (r1 + r2) + r2 * (r3 + r4)) / (2 * r1 * (r3 + r4)),
  };
}

describe('differenceAmplifierGains with an ideal op-amp', () => {
  it('gives vout = (R2/R1)(v2 − v1) when the ratios match: Ad = R2/R1 and Acm = 0', () => {
    // Matched-ratio relation, DOMAIN.md (textbook).
    const gains = differenceAmplifierGains(matched);
    expect(gains.differentialGain.re).toBeCloseTo(10, 12);
    expect(gains.differentialGain.im).toBe(0);
    expect(magnitudeComplex(gains.commonModeGain)).toBe(0);
  });

  it('equals the textbook Acm and Ad formulas for mismatched resistors', () => {
    // Acm = (R1·R4 − R2·R3)/(R1·(R3 + R4)), Ad = (R4·(R1 + R2) + R2·(R3 + R4))/(2·R1·(R3 + R4)), DOMAIN.md.
    const expected = textbookGains(10e3, 100e3, 10.01e3, 99.9e3);
    const gains = differenceAmplifierGains(mismatched, 1000);
    expect(Math.abs(gains.commonModeGain.re / expected.acm - 1)).toBeLessThan(ROUNDING_RELATIVE);
    expect(Math.abs(gains.differentialGain.re / expected.ad - 1)).toBeLessThan(ROUNDING_RELATIVE);
  });

  it('treats source resistances as additions to R1 and R3', () => {
    // DOMAIN.md: Rs1, Rs2 add in series with R1 and R3.
    const withSources = differenceAmplifierGains({ ...matched, sourceResistance1Ohms: 50, sourceResistance2Ohms: 600 });
    const expected = textbookGains(10e3 + 50, 100e3, 10e3 + 600, 100e3);
    expect(Math.abs(withSources.commonModeGain.re / expected.acm - 1)).toBeLessThan(ROUNDING_RELATIVE);
    expect(Math.abs(withSources.differentialGain.re / expected.ad - 1)).toBeLessThan(ROUNDING_RELATIVE);
  });
});

describe('differenceAmplifierGains with op-amp data', () => {
  it('approaches the ideal result as open-loop gain, bandwidth and op-amp rejection grow', () => {
    // Limit of the DOMAIN.md model as A0, GBW, CMRRdc → ∞ (common practice, no source).
    const nearIdeal: OpAmpModel = { openLoopGainDb: 240, gainBandwidthHz: 1e15, cmrrDb: 240, cmrrCornerHz: 1e12 };
    const ideal = differenceAmplifierGains(mismatched, 1000);
    const model = differenceAmplifierGains(mismatched, 1000, nearIdeal);
    expect(Math.abs(magnitudeComplex(model.commonModeGain) / magnitudeComplex(ideal.commonModeGain) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(magnitudeComplex(model.differentialGain) / magnitudeComplex(ideal.differentialGain) - 1)).toBeLessThan(1e-9);
  });

  it('lets the op-amp alone set Acm when the resistors match: |Acm| ≈ Ad/CMRRoa at dc', () => {
    // With matched ratios the output is G·(v+ − v−) error, so Acm ≈ G·(1/CMRRoa) (textbook, from memory);
    // finite A0 shifts it by about 1/(A0·β) ≈ 3.5e-5 relative here.
    const gains = differenceAmplifierGains(matched, 0, opAmp);
    const expected = 10 / 10 ** (95 / 20);
    expect(Math.abs(magnitudeComplex(gains.commonModeGain) / expected - 1)).toBeLessThan(1e-3);
  });

  it('uses 1/A(f) = 1/A0 + j·f/GBW and 1/CMRRoa(f) = (1 + j·f/fcm)/CMRRdc', () => {
    // DOMAIN.md op-amp model, inverted by hand.
    const response = opAmpResponse(1000, { openLoopGainDb: 120, gainBandwidthHz: 1e6, cmrrDb: 100, cmrrCornerHz: 1e3 });
    expect(response.inverseOpenLoopGain.re).toBeCloseTo(1e-6, 15);
    expect(response.inverseOpenLoopGain.im).toBeCloseTo(1e-3, 15);
    expect(response.inverseRejection.re).toBeCloseTo(1e-5, 15);
    expect(response.inverseRejection.im).toBeCloseTo(1e-5, 15);
  });
});

describe('predictDifferenceAmplifier', () => {
  it('gives the same CMRR for both signs with an ideal op-amp', () => {
    // No op-amp term, so nothing changes sign (follows from the model).
    const [point] = predictDifferenceAmplifier([100], mismatched);
    expect(point.cmrrDb).toBe(point.cmrrOppositeSignDb);
    expect(point.cmrrBandLowDb).toBe(point.cmrrBandHighDb);
  });

  it('reports infinite CMRR and Acm of −Infinity dB for an exactly matched ideal circuit', () => {
    // Acm = 0 exactly for R1/R2 = R3/R4 (DOMAIN.md).
    const [point] = predictDifferenceAmplifier([50], matched);
    expect(point.acmDb).toBe(-Infinity);
    expect(point.cmrrDb).toBe(Infinity);
    expect(point.adDb).toBeCloseTo(20, 12);
  });

  it('orders the band edges and keeps the frequencies in the order given', () => {
    const points = predictDifferenceAmplifier([1e4, 10, 1e3], { ...mismatched, sourceResistance1Ohms: 50 }, opAmp);
    expect(points.map((point) => point.frequencyHz)).toEqual([1e4, 10, 1e3]);
    for (const point of points) {
      expect(point.cmrrBandLowDb).toBe(Math.min(point.cmrrDb, point.cmrrOppositeSignDb));
      expect(point.cmrrBandHighDb).toBe(Math.max(point.cmrrDb, point.cmrrOppositeSignDb));
      expect(point.cmrrDb).not.toBe(point.cmrrOppositeSignDb);
    }
  });
});

describe('predictDifferenceAmplifier against ngspice (netlists in tests/fixtures/ngspice/)', () => {
  function circuitOf(parameters: Record<string, number>): DifferenceAmplifierResistors {
    return {
      r1Ohms: parameters.r1,
      r2Ohms: parameters.r2,
      r3Ohms: parameters.r3,
      r4Ohms: parameters.r4,
      sourceResistance1Ohms: parameters.rs1,
      sourceResistance2Ohms: parameters.rs2,
    };
  }
  function opAmpOf(parameters: Record<string, number>): OpAmpModel {
    return {
      openLoopGainDb: parameters.a0db,
      gainBandwidthHz: parameters.gbw,
      cmrrDb: parameters.cmrrdb,
      cmrrCornerHz: parameters.fcm,
    };
  }

  it.skipIf(!hasNgspice)('matches Ad of the matched ideal circuit, whose Acm both find to be zero', () => {
    const netlist = 'difference-amplifier-matched-ideal.cir';
    const rows = runGainNetlist(netlist);
    const points = predictDifferenceAmplifier(
      rows.map((row) => row.frequencyHz),
      circuitOf(readNetlistParameters(netlist)),
    );
    expect(rows).toHaveLength(36);
    rows.forEach((row, index) => {
      expect(Math.abs(20 * Math.log10(row.differentialMagnitude) - points[index].adDb)).toBeLessThan(NGSPICE_AGREEMENT_DB);
      expect(row.commonModeMagnitude).toBeLessThan(1e-12);
      expect(points[index].acmDb).toBe(-Infinity);
    });
  });

  // [description, netlist, which sign of the prediction the netlist's cmsign selects, with op-amp data]
  const cases: [string, string, 'asWritten' | 'opposite', boolean][] = [
    ['mismatched resistors with an ideal op-amp', 'difference-amplifier-mismatched-ideal.cir', 'asWritten', false],
    ['unequal source resistances with an ideal op-amp', 'difference-amplifier-source-imbalance-ideal.cir', 'asWritten', false],
    ['op-amp data with the op-amp term as written', 'difference-amplifier-opamp-positive.cir', 'asWritten', true],
    ['op-amp data with the op-amp term of opposite sign', 'difference-amplifier-opamp-negative.cir', 'opposite', true],
  ];
  for (const [description, netlist, sign, withOpAmp] of cases) {
    it.skipIf(!hasNgspice)(`matches Ad, Acm and CMRR within 0.01 dB for ${description}`, () => {
      const parameters = readNetlistParameters(netlist);
      const rows = runGainNetlist(netlist);
      const points = predictDifferenceAmplifier(
        rows.map((row) => row.frequencyHz),
        circuitOf(parameters),
        withOpAmp ? opAmpOf(parameters) : undefined,
      );
      expect(rows).toHaveLength(36);
      rows.forEach((row, index) => {
        const point = points[index];
        const adDb = 20 * Math.log10(row.differentialMagnitude);
        const acmDb = 20 * Math.log10(row.commonModeMagnitude);
        const predicted =
          sign === 'asWritten'
            ? { adDb: point.adDb, acmDb: point.acmDb, cmrrDb: point.cmrrDb }
            : { adDb: point.adOppositeSignDb, acmDb: point.acmOppositeSignDb, cmrrDb: point.cmrrOppositeSignDb };
        expect(Math.abs(adDb - predicted.adDb)).toBeLessThan(NGSPICE_AGREEMENT_DB);
        expect(Math.abs(acmDb - predicted.acmDb)).toBeLessThan(NGSPICE_AGREEMENT_DB);
        expect(Math.abs(adDb - acmDb - predicted.cmrrDb)).toBeLessThan(NGSPICE_AGREEMENT_DB);
      });
    });
  }

  it.skipIf(!hasNgspice)('shows the two signs of the op-amp term giving visibly different rejection at low frequency', () => {
    // Sanity check that the sign netlists differ (ngspice run of both fixtures).
    const positive = runGainNetlist('difference-amplifier-opamp-positive.cir')[0];
    const negative = runGainNetlist('difference-amplifier-opamp-negative.cir')[0];
    const positiveDb = 20 * Math.log10(positive.differentialMagnitude / positive.commonModeMagnitude);
    const negativeDb = 20 * Math.log10(negative.differentialMagnitude / negative.commonModeMagnitude);
    expect(Math.abs(positiveDb - negativeDb)).toBeGreaterThan(1);
  });
});

describe('differenceAmplifierGains and predictDifferenceAmplifier input checks', () => {
  for (const [field, value] of [
    ['r1Ohms', 0],
    ['r2Ohms', -1],
    ['r3Ohms', Number.NaN],
    ['r4Ohms', Infinity],
  ] as const) {
    it(`rejects ${field} = ${value} naming the field`, () => {
      expect(() => differenceAmplifierGains({ ...matched, [field]: value })).toThrowError(EngineInputError);
      expect(() => differenceAmplifierGains({ ...matched, [field]: value })).toThrowError(new RegExp(`field "${field}"`));
    });
  }

  it('rejects a negative source resistance but accepts zero', () => {
    expect(() => differenceAmplifierGains({ ...matched, sourceResistance2Ohms: -5 })).toThrowError(/sourceResistance2Ohms/);
    expect(() => differenceAmplifierGains({ ...matched, sourceResistance2Ohms: 0 })).not.toThrow();
  });

  it('says which op-amp parameter is missing from partial data', () => {
    const partial = { openLoopGainDb: 100, gainBandwidthHz: 1e6, cmrrDb: 90 } as OpAmpModel;
    expect(() => predictDifferenceAmplifier([10], matched, partial)).toThrowError(/cmrrCornerHz is missing/);
  });

  it('rejects op-amp data that cannot describe an op-amp', () => {
    expect(() => predictDifferenceAmplifier([10], matched, { ...opAmp, gainBandwidthHz: 0 })).toThrowError(/gainBandwidthHz/);
    expect(() => predictDifferenceAmplifier([10], matched, { ...opAmp, openLoopGainDb: -3 })).toThrowError(/openLoopGainDb/);
    expect(() => predictDifferenceAmplifier([10], matched, { ...opAmp, cmrrDb: Number.NaN })).toThrowError(/cmrrDb/);
  });

  it('rejects negative, NaN and missing frequencies, naming the entry', () => {
    expect(() => predictDifferenceAmplifier([10, -1], matched)).toThrowError(/entry 2/);
    expect(() => predictDifferenceAmplifier([Number.NaN], matched)).toThrowError(/entry 1/);
    expect(() => predictDifferenceAmplifier([], matched)).toThrowError(/at least one frequency/);
    expect(() => differenceAmplifierGains(matched, -10)).toThrowError(/frequencies/);
  });
});
