import { describe, expect, it } from 'vitest';
import { approximateWorstCaseCmrrDb, worstCaseCmrrDb } from '../../../shared/engine/resistor-tolerance';
import { pairAnswers, stageToleranceFraction, toleranceAnswer, toleranceToTry } from '../../../src/features/design-analysis/components/tolerance-answers';
import { bridgeCircuit, currentSenseCircuit } from './fixtures';

/** The engine bisects the worst case to 1e-12 relative; a CMRR evaluated there matches the target to far better than this. */
const BISECTION_DB = 1e-6;

describe('toleranceAnswer', () => {
  it('gives the approximation (1 + G)/(4·CMRR) and the exact worst case at the design gain', () => {
    const answer = toleranceAnswer(bridgeCircuit(), 81);
    // ε = (1 + G)/(4·10^(81/20)) with G = 10 (DOMAIN.md's approximation).
    expect(answer.approximationToleranceFraction).toBeCloseTo(11 / (4 * 10 ** (81 / 20)), 15);
    // The exact answer meets the target at its worst corner (engine worstCaseCmrrDb).
    expect(worstCaseCmrrDb(10, answer.worstCaseToleranceFraction)).toBeCloseTo(81, 5);
    expect(Math.abs(worstCaseCmrrDb(10, answer.worstCaseToleranceFraction) - 81)).toBeLessThan(BISECTION_DB);
    expect(answer.frontGainDb).toBe(0);
    expect(answer.opAmpLimitDb).toBeNull();
  });

  it('lets the in-amp input stage carry 20·log10(1 + 2RF/RG) of the target', () => {
    const answer = toleranceAnswer(currentSenseCircuit(), 91.5);
    const frontGainDb = 20 * Math.log10(50.8); // 1 + 2·24.9 kΩ/1 kΩ
    expect(answer.stageTargetDb).toBeCloseTo(91.5 - frontGainDb, 12);
    expect(answer.approximationToleranceFraction).toBeCloseTo(2 / (4 * 10 ** ((91.5 - frontGainDb) / 20)), 15); // G = 1 in the stage
  });

  it('says when the op-amp itself cannot reach the target', () => {
    expect(toleranceAnswer(bridgeCircuit(), 115).opAmpLimitDb).toBe(110); // the demo op-amp's 110 dB
  });

  it('needs no resistor matching when the input stage alone reaches the target', () => {
    expect(toleranceAnswer(currentSenseCircuit(), 30).worstCaseToleranceFraction).toBe(0.5); // 30 dB < 34.1 dB of front gain
  });

  it('refuses a target that is not a number', () => {
    expect(() => toleranceAnswer(bridgeCircuit(), Number.NaN)).toThrow('toleranceAnswer requires a finite target in dB, got NaN');
  });
});

describe('pairAnswers', () => {
  it('lists preferred-value pairs for the gain with their CMRR at the tolerance', () => {
    const pairs = pairAnswers(bridgeCircuit(), 10, 'E96', 0.001, 3);
    expect(pairs.map((pair) => [pair.r1Ohms, pair.r2Ohms])).toEqual([
      [1000, 10_000],
      [1020, 10_200],
      [1050, 10_500],
    ]); // IEC 60063 E96 starts 100, 102, 105
    expect(pairs[0].designWorstCaseDb).toBeCloseTo(worstCaseCmrrDb(10, 0.001), 12);
    expect(pairs[0].designApproximationDb).toBeCloseTo(approximateWorstCaseCmrrDb(10, 0.001), 12);
  });

  it('adds the in-amp input stage to each pair', () => {
    const [pair] = pairAnswers(currentSenseCircuit(), 1, 'E24', 0.0005, 1);
    expect(pair.designWorstCaseDb).toBeCloseTo(worstCaseCmrrDb(1, 0.0005) + 20 * Math.log10(50.8), 12);
  });

  it('refuses a gain the engine refuses', () => {
    expect(() => pairAnswers(bridgeCircuit(), -1, 'E96', 0.001)).toThrow('nearestResistorPairs requires a finite target gain above 0, got -1');
  });
});

describe('stageToleranceFraction and toleranceToTry', () => {
  it('judges pairs at the loosest of R1…R4 and offers a rounded-down tolerance', () => {
    const circuit = { ...bridgeCircuit(0.001), r3: { ohms: 4990, tolerance: 0.002 } };
    expect(stageToleranceFraction(circuit)).toBe(0.002);
    expect(toleranceToTry(0.000245094)).toBe('0.024'); // 0.0245 % rounded down to two figures
    expect(toleranceToTry(0.001)).toBe('0.1');
    expect(toleranceToTry(0.000679)).toBe('0.067');
  });
});
