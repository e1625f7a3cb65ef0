import { describe, expect, it } from 'vitest';
import {
  designGains,
  explorerChanges,
  explorerCircuit,
  explorerFrequencies,
  explorerStateFromCircuit,
  tightestMaskFrequencyHz,
  toleranceSlider,
} from '../../../src/features/design-analysis/components/explorer-state';
import { bridgeCircuit, bridgeMask, currentSenseCircuit } from './fixtures';

/** Relative tolerance for values that only pass through a few floating-point operations. */
const FEW_OPERATIONS = 1e-12;

describe('explorerStateFromCircuit', () => {
  it('starts from the stored values, one shared tolerance when all resistors agree', () => {
    const state = explorerStateFromCircuit(bridgeCircuit(0.001), 1000);
    expect(state.toleranceMode).toBe('all');
    expect(state.allTolerancePercent).toBe('0.1'); // 0.001 as a fraction is 0.1 %
    expect(state.distribution).toBe('uniform');
    expect(state.sourceResistance1Ohms).toBe('175');
    expect(state.opAmpEnabled).toBe(true);
    expect(state.opAmp.cmrrCornerHz).toBe('2000');
    expect(state.frequencyHz).toBe('1000');
  });

  it('switches to one tolerance per resistor when they differ (the in-amp: 0.1 % feedback, 0.05 % stage)', () => {
    const state = explorerStateFromCircuit(currentSenseCircuit(), 10);
    expect(state.toleranceMode).toBe('each');
    expect(state.eachTolerancePercent.feedback1).toBe('0.1');
    expect(state.eachTolerancePercent.r3).toBe('0.05');
  });
});

describe('explorerCircuit', () => {
  const stored = bridgeCircuit(0.001);
  const state = explorerStateFromCircuit(stored, 1000);

  it('gives back the stored circuit unchanged when nothing was changed', () => {
    const result = explorerCircuit(stored, state);
    expect(result.errors).toEqual({});
    expect(result.circuit).toEqual(stored);
    expect(result.frequencyHz).toBe(1000);
  });

  it('applies the shared tolerance to all four resistors as a fraction, keeping their values', () => {
    const { circuit } = explorerCircuit(stored, { ...state, allTolerancePercent: '0.01' });
    for (const key of ['r1', 'r2', 'r3', 'r4'] as const) expect(circuit?.[key].tolerance).toBeCloseTo(0.0001, 15); // 0.01 % = 1e-4
    expect(circuit?.r2.ohms).toBe(49_900);
  });

  it('takes per-resistor tolerances in "each" mode', () => {
    const eachTolerancePercent = { ...state.eachTolerancePercent, r4: '0.02' };
    const { circuit } = explorerCircuit(stored, { ...state, toleranceMode: 'each', eachTolerancePercent });
    expect(circuit?.r4.tolerance).toBeCloseTo(0.0002, 15);
    expect(circuit?.r1.tolerance).toBeCloseTo(0.001, 15);
  });

  it('carries distribution, source resistances and op-amp data, or ideal op-amps when switched off', () => {
    const changed = explorerCircuit(stored, { ...state, distribution: 'normal', sourceResistance2Ohms: '1k', opAmp: { ...state.opAmp, cmrrDb: '100' } }).circuit!;
    expect(changed.toleranceDistribution).toBe('normal');
    expect(changed.sourceResistance2Ohms).toBe(1000);
    expect(changed.opAmp).toMatchObject({ cmrrDb: 100, partNumber: 'HRX-2210 (fictional)' });
    expect(explorerCircuit(stored, { ...state, opAmpEnabled: false }).circuit?.opAmp).toBeNull();
  });

  it('refuses unusable values with a message per field and no circuit', () => {
    const result = explorerCircuit(stored, { ...state, allTolerancePercent: '60', sourceResistance1Ohms: '-1', opAmp: { ...state.opAmp, gainBandwidthHz: 'fast' }, frequencyHz: '' });
    expect(result.circuit).toBeNull();
    expect(result.errors).toEqual({
      allTolerancePercent: 'Tolerance must be above 0 % and below 50 %',
      sourceResistance1Ohms: 'Rs1 cannot be negative',
      'opAmp.gainBandwidthHz': 'GBW: “fast” is not a number',
      frequencyHz: 'Frequency is needed',
    });
    expect(result.frequencyHz).toBeNaN();
  });

  it('names the resistor whose own tolerance is wrong', () => {
    const result = explorerCircuit(stored, { ...state, toleranceMode: 'each', eachTolerancePercent: { ...state.eachTolerancePercent, r3: '0' } });
    expect(result.errors['each.r3']).toBe('R3 tolerance must be above 0 % and below 50 %');
  });
});

describe('explorerChanges', () => {
  it('lists what differs from the stored revision in words', () => {
    const stored = bridgeCircuit(0.001);
    const explored = { ...bridgeCircuit(0.0001), toleranceDistribution: 'normal' as const };
    expect(explorerChanges(stored, explored)).toEqual(['R1 ±0.1 % → ±0.01 %', 'R2 ±0.1 % → ±0.01 %', 'R3 ±0.1 % → ±0.01 %', 'R4 ±0.1 % → ±0.01 %', 'distribution uniform → normal']);
    expect(explorerChanges(stored, bridgeCircuit(0.001))).toEqual([]);
  });
});

describe('explorerFrequencies', () => {
  it('covers whole decades from one below the mask to one above it, with the mask corners exactly', () => {
    const frequencies = explorerFrequencies(bridgeMask, [], 6);
    expect(frequencies[0]).toBe(1); // 10 Hz is a decade: one decade lower
    expect(frequencies[frequencies.length - 1]).toBeCloseTo(1e6, 6); // 20 kHz rounds up to 100 kHz, plus one decade
    for (const corner of [10, 1000, 20_000]) expect(frequencies).toContain(corner);
    // 6 per decade over 6 decades is 37 points; 20 kHz is the only corner not on that grid.
    expect(frequencies).toHaveLength(38);
    for (let index = 1; index < frequencies.length; index++) expect(frequencies[index]).toBeGreaterThan(frequencies[index - 1]);
  });

  it('adds extra frequencies without duplicating grid points', () => {
    const frequencies = explorerFrequencies({ points: [{ frequencyHz: 100, minimumCmrrDb: 60 }] }, [100, 250], 1);
    expect(frequencies).toEqual([10, 100, 250, 1000, 10_000]); // one decade below 100 Hz; 250 Hz rounds up to 1 kHz, plus one decade
  });
});

describe('tightestMaskFrequencyHz', () => {
  it('picks the corner with the least margin, ties going to the higher frequency', () => {
    // Margins: 10 Hz −5 dB, 1 kHz −5 dB (a tie), 20 kHz +5 dB.
    expect(tightestMaskFrequencyHz(bridgeMask, () => 75)).toBe(1000);
    expect(tightestMaskFrequencyHz(bridgeMask, (frequencyHz) => (frequencyHz === 20_000 ? 60 : 90))).toBe(20_000);
    expect(tightestMaskFrequencyHz(bridgeMask, () => null)).toBe(10);
  });
});

describe('designGains', () => {
  it('reads the difference stage gain and, for an in-amp, the input stage gain', () => {
    expect(designGains(bridgeCircuit()).stageGain).toBeCloseTo(10, 12); // 49.9 kΩ / 4.99 kΩ
    const inAmp = designGains(currentSenseCircuit());
    expect(inAmp.stageGain).toBe(1);
    expect(inAmp.frontGain).toBeCloseTo(50.8, 12); // 1 + 2·24.9 kΩ/1 kΩ
    expect(inAmp.frontGainDb).toBeCloseTo(20 * Math.log10(50.8), 12);
  });
});

describe('toleranceSlider', () => {
  it('maps 0.001 % … 1 % onto 0 … 1000 logarithmically and back to two significant figures', () => {
    expect(toleranceSlider.toPosition(0.001)).toBe(0);
    expect(toleranceSlider.toPosition(1)).toBe(1000);
    expect(toleranceSlider.toPosition(0.01)).toBe(333); // one decade of three
    expect(toleranceSlider.toPercent(0)).toBeCloseTo(0.001, 15);
    expect(toleranceSlider.toPercent(1000)).toBeCloseTo(1, 15);
    expect(toleranceSlider.toPercent(toleranceSlider.toPosition(0.1))).toBeCloseTo(0.1, 15);
    expect(Math.abs(toleranceSlider.toPercent(500) - 0.032) / 0.032).toBeLessThan(FEW_OPERATIONS); // 10^−1.5 = 0.0316 → 0.032
  });
});
