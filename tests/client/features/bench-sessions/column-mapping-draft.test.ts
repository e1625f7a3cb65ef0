import { describe, expect, it } from 'vitest';
import { checkPreview, guessMapping, previewBytes, previewFromText, rememberedMappingFor } from '../../../../src/features/bench-sessions/components/column-mapping-draft';

describe('guessMapping', () => {
  it('recognises the canonical header exactly', () => {
    expect(guessMapping(['frequency_hz', 'vin_v', 'vout_v', 'floor_v'])).toMatchObject({
      frequency: { column: 'frequency_hz', unit: 'Hz' },
      vout: { column: 'vout_v', unit: 'V', convention: 'rms' },
      floor: { column: 'floor_v' },
      phase: null,
    });
  });

  it('reads units and peak from foreign column names', () => {
    expect(guessMapping(['Freq (kHz)', 'Drive (mV pk)', 'Out (mV pk)'])).toEqual({
      frequency: { column: 'Freq (kHz)', unit: 'kHz' },
      vin: { column: 'Drive (mV pk)', unit: 'mV', convention: 'peak' },
      vout: { column: 'Out (mV pk)', unit: 'mV', convention: 'peak' },
      phase: null,
      floor: null,
    });
  });

  it('finds phase, floor and dBV columns', () => {
    const mapping = guessMapping(['f [MHz]', 'input dBV', 'output dBV', 'phase deg', 'noise floor uV']);
    expect(mapping.frequency.unit).toBe('MHz');
    expect(mapping.vin).toEqual({ column: 'input dBV', unit: 'dBV', convention: 'rms' });
    expect(mapping.phase).toEqual({ column: 'phase deg' });
    expect(mapping.floor).toMatchObject({ column: 'noise floor uV', unit: 'µV' });
  });

  it('falls back to unused columns in order when names say nothing', () => {
    const mapping = guessMapping(['a', 'b', 'c']);
    expect([mapping.frequency.column, mapping.vin.column, mapping.vout.column]).toEqual(['a', 'b', 'c']);
  });
});

describe('rememberedMappingFor', () => {
  const remembered = { header: ['F', 'A', 'B'], mapping: guessMapping(['F', 'A', 'B']) };
  it('returns the remembered mapping for the very same header', () => {
    expect(rememberedMappingFor(remembered, ['F', 'A', 'B'])).toBe(remembered.mapping);
  });
  it('ignores it for another header or order, and when there is none', () => {
    expect(rememberedMappingFor(remembered, ['F', 'B', 'A'])).toBeNull();
    expect(rememberedMappingFor(remembered, ['F', 'A'])).toBeNull();
    expect(rememberedMappingFor(null, ['F'])).toBeNull();
  });
});

describe('previewFromText', () => {
  it('drops a last line that may have been cut when the file is longer than the preview', () => {
    const text = 'f;a;b\n1;1;1\n2;1;1\n3;1';
    expect(previewFromText(text, 'x.csv', previewBytes + 1).table.rows.map((row) => row.line)).toEqual([2, 3]);
    expect(previewFromText(text, 'x.csv', text.length).table.rows.map((row) => row.line)).toEqual([2, 3, 4]);
  });
});

describe('checkPreview', () => {
  const text = '# bench\nFreq (kHz);Drive (mV pk);Out (mV pk)\n0,01;100;999\n1;100;990\n';
  const preview = previewFromText(text, 'diff.csv', text.length);

  it('reads the previewed rows with the guessed mapping, frequencies scaled to Hz', () => {
    expect(checkPreview(preview, guessMapping(preview.table.header), false)).toEqual({ ok: true, rowsChecked: 2, firstFrequencyHz: 10, lastFrequencyHz: 1000 });
  });

  it('names the row and column of the first cell the engine refuses', () => {
    const bad = previewFromText('f,a,b\n1,1,1\n2,x,1\n', 'bad.csv', 20);
    const result = checkPreview(bad, guessMapping(bad.table.header), false);
    expect(result).toMatchObject({ ok: false, row: 3, column: 'a' });
    expect(result.ok ? '' : result.message).toContain('"x" is not a number');
  });

  it('refuses a repeated frequency unless repeats are averaged', () => {
    const repeated = previewFromText('f,a,b\n1,1,1\n1,1,1\n2,1,1\n', 'r.csv', 30);
    expect(checkPreview(repeated, guessMapping(repeated.table.header), false).ok).toBe(false);
    expect(checkPreview(repeated, guessMapping(repeated.table.header), true).ok).toBe(true);
  });
});
