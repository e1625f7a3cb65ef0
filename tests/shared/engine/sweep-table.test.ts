import { describe, expect, it } from 'vitest';
import { createSweepAccumulator, createSweepBuilder, readDelimitedTable, sweepFromReadings } from '../../../shared/engine/sweep-table';
import { amplitudeToRmsVolts, canonicalMapping } from '../../../shared/schemas/sweeps';
import { engineColumnMapping } from '../../../shared/sweep-mapping';

// Exact up to the last bit or two of a double: the conversions are one multiply or one power.
const conversionTolerance = 1e-12;

describe('readDelimitedTable', () => {
  it('skips comments and blank lines, detects the delimiter from the header and keeps line numbers', () => {
    const table = readDelimitedTable('# bench HRB-204\n\n"Freq (kHz)";Drive mV\n1;0,5\n# note\n2;0,5\n');
    expect(table.delimiter).toBe(';');
    expect(table.headerLine).toBe(3);
    expect(table.header).toEqual(['Freq (kHz)', 'Drive mV']);
    expect(table.rows).toEqual([
      { line: 4, cells: ['1', '0,5'] },
      { line: 6, cells: ['2', '0,5'] },
    ]);
  });

  it('stops at maximumRows and says so', () => {
    const table = readDelimitedTable('a,b\n1,2\n3,4\n5,6\n', { maximumRows: 2 });
    expect(table.rows).toHaveLength(2);
    expect(table.truncated).toBe(true);
  });

  it('refuses text with no header line, naming the file', () => {
    expect(() => readDelimitedTable('# only a comment\n\n', { file: 'x.csv' })).toThrow(/^x\.csv: readDelimitedTable: the file is empty/);
  });
});

describe('amplitudeToRmsVolts', () => {
  // dBV is decibels relative to 1 V rms; peak = √2 · rms for a sine (common practice, no source).
  it('converts mV peak, µV rms and dBV to volts rms', () => {
    expect(amplitudeToRmsVolts(100, 'mV', 'peak')).toBeCloseTo(0.1 / Math.SQRT2, 15);
    expect(amplitudeToRmsVolts(250, 'µV', 'rms')).toBeCloseTo(250e-6, 18);
    expect(Math.abs(amplitudeToRmsVolts(-20, 'dBV', 'peak') - 0.1)).toBeLessThan(conversionTolerance);
  });
});

describe('createSweepBuilder with a column mapping', () => {
  const header = ['Freq (kHz)', 'Drive (mV pk)', 'Out (mV pk)', 'Floor (dBV)'];
  const mapping = engineColumnMapping({
    frequency: { column: 'Freq (kHz)', unit: 'kHz' },
    vin: { column: 'Drive (mV pk)', unit: 'mV', convention: 'peak' },
    vout: { column: 'Out (mV pk)', unit: 'mV', convention: 'peak' },
    phase: null,
    floor: { column: 'Floor (dBV)', unit: 'dBV', convention: 'rms' },
  });

  it('converts every column to Hz and volts rms and computes the gain', () => {
    const builder = createSweepBuilder(header, mapping, { allowDecimalComma: true });
    builder.addRow(2, ['10', '1414,2', '14142', '-100']);
    builder.addRow(3, ['0,1', '1414,2', '14000', '-100']);
    const sweep = builder.finish();
    expect(Array.from(sweep.frequencyHz)).toEqual([100, 10_000]);
    expect(Math.abs(sweep.vinVolts[0] - 1.4142 / Math.SQRT2)).toBeLessThan(conversionTolerance);
    // gain = vout/vin, the same convention on both: 14000/1414.2 and 14142/1414.2.
    expect(sweep.gain[0]).toBeCloseTo(14000 / 1414.2, 12);
    expect(sweep.gain[1]).toBeCloseTo(10, 12);
    expect(Math.abs(sweep.floorVolts![0] - 1e-5)).toBeLessThan(conversionTolerance);
    expect(Array.from(sweep.lineNumber)).toEqual([3, 2]);
  });

  it('names the mapped column and row of a bad cell', () => {
    const builder = createSweepBuilder(header, mapping, { file: 'bench.csv', functionName: 'upload' });
    expect(() => builder.addRow(7, ['1', 'twelve', '3', '-90'])).toThrow('bench.csv, row 7, column "Drive (mV pk)": upload: "twelve" is not a number');
  });

  it('refuses a mapping naming a column the header does not have, or one it has twice', () => {
    expect(() => createSweepBuilder(['f', 'a'], { frequency: { column: 'f' }, vin: { column: 'a' }, vout: { column: 'b' } }, { file: 'u.csv', headerLine: 1 })).toThrow(
      /u\.csv, row 1, field "vout": parseSweepCsv: the header has no "b" column for vout/,
    );
    expect(() => createSweepBuilder(['f', 'a', 'A'], { frequency: { column: 'f' }, vin: { column: 'a' }, vout: { column: 'f' } })).toThrow(/appears twice/);
  });
});

describe('canonicalMapping', () => {
  it('recognises the engine header in any case and order, and nothing else', () => {
    expect(canonicalMapping(['VOUT_V', 'frequency_hz', 'vin_v', 'floor_v'])).toMatchObject({ vout: { column: 'VOUT_V' }, floor: { column: 'floor_v' }, phase: null });
    expect(canonicalMapping(['Freq', 'vin_v', 'vout_v'])).toBeNull();
  });
});

describe('sweepFromReadings', () => {
  it('sorts readings and averages repeated frequencies when asked', () => {
    const sweep = sweepFromReadings(
      [
        { line: 1, frequencyHz: 1000, vinVolts: 1, voutVolts: 2e-4 },
        { line: 2, frequencyHz: 100, vinVolts: 1, voutVolts: 1e-4 },
        { line: 3, frequencyHz: 1000, vinVolts: 1, voutVolts: 4e-4 },
      ],
      { averageRepeats: true },
    );
    expect(Array.from(sweep.frequencyHz)).toEqual([100, 1000]);
    // Mean of the two readings at 1 kHz: (2e-4 + 4e-4)/2.
    expect(sweep.voutVolts[1]).toBeCloseTo(3e-4, 15);
    expect(Array.from(sweep.repeatCount)).toEqual([1, 2]);
  });

  it('gives the same sweep whether the readings arrive sorted or not', () => {
    // Invented readings with repeats: one sweep of 1 kHz and 10 kHz measured twice, the repeat
    // written with lower line numbers (as a second stored sweep of the same mode can be).
    const sorted = [
      { line: 1, frequencyHz: 100, vinVolts: 1, voutVolts: 1e-4, phaseDeg: 170 },
      { line: 2, frequencyHz: 1000, vinVolts: 1, voutVolts: 2e-4, phaseDeg: 179 },
      { line: 12, frequencyHz: 1000, vinVolts: 1.1, voutVolts: 4e-4, phaseDeg: -179 },
      { line: 3, frequencyHz: 10_000, vinVolts: 1, voutVolts: 3e-4, phaseDeg: 150 },
      { line: 13, frequencyHz: 10_000, vinVolts: 0.9, voutVolts: 5e-4, phaseDeg: 160 },
    ];
    const shuffled = [sorted[4], sorted[2], sorted[0], sorted[3], sorted[1]];
    const options = { averageRepeats: true, file: 'sweep' };
    expect(sweepFromReadings(shuffled, options)).toEqual(sweepFromReadings(sorted, options));
    const sweep = sweepFromReadings(sorted, options);
    expect(Array.from(sweep.repeatCount)).toEqual([1, 2, 2]);
    expect(Array.from(sweep.lineNumber)).toEqual([1, 2, 3]);
    // The circular mean of 179° and −179° is 180° (by hand: both lie 1° from it), not their arithmetic mean 0°.
    expect(Math.abs(Math.abs(sweep.phaseDeg![1]) - 180)).toBeLessThan(conversionTolerance);
  });

  it('refuses a repeated frequency unless asked to average, naming both lines', () => {
    const readings = [
      { line: 4, frequencyHz: 1000, vinVolts: 1, voutVolts: 2e-4 },
      { line: 2, frequencyHz: 100, vinVolts: 1, voutVolts: 1e-4 },
      { line: 3, frequencyHz: 1000, vinVolts: 1, voutVolts: 4e-4 },
    ];
    expect(() => sweepFromReadings(readings, { file: 'sweep' })).toThrowError(
      'sweep, row 4, column "frequency_hz": sweepFromReadings: frequency 1000 Hz is repeated (also on line 3); remove the repeat or ask for repeats to be averaged',
    );
  });

  it('refuses a non-finite reading, naming its line', () => {
    const accumulator = createSweepAccumulator({ hasPhase: false, hasFloor: false, file: 'stream', functionName: 'analysis' });
    expect(() => accumulator.add({ line: 9, frequencyHz: Number.NaN, vinVolts: 1, voutVolts: 1 })).toThrow('stream, row 9, column "frequency_hz": analysis: NaN is not a finite number');
  });
});
