import { describe, expect, it } from 'vitest';
import { EngineInputError } from '../../../shared/engine/errors';
import { parseSweepCsv } from '../../../shared/engine/sweep-file';

// Values here are decimal strings turned into doubles and divided once: a few ulps at most.
const ROUNDING = 1e-12;

/** Runs `action`, expects an EngineInputError, and returns it for closer checks. */
function inputError(action: () => unknown): EngineInputError {
  try {
    action();
  } catch (error) {
    expect(error).toBeInstanceOf(EngineInputError);
    return error as EngineInputError;
  }
  throw new Error('expected an EngineInputError, none was thrown');
}

describe('parseSweepCsv', () => {
  it('reads frequency, drive and output columns and computes the gain vout/vin', () => {
    const sweep = parseSweepCsv('frequency_hz,vin_v,vout_v\n100,0.5,5\n1000,0.5,4.9\n', { file: 'diff.csv' });
    expect(Array.from(sweep.frequencyHz)).toEqual([100, 1000]);
    // 5/0.5 = 10 and 4.9/0.5 = 9.8, by hand.
    expect(sweep.gain[0]).toBeCloseTo(10, 12);
    expect(Math.abs(sweep.gain[1] - 9.8)).toBeLessThan(ROUNDING);
    expect(sweep.phaseDeg).toBeNull();
    expect(sweep.floorVolts).toBeNull();
    expect(sweep.file).toBe('diff.csv');
    expect(Array.from(sweep.lineNumber)).toEqual([2, 3]);
  });

  it('skips # comment lines and blank lines and keeps the file line numbers', () => {
    const text = '# Halden Ridge Instruments lab\n# unit HRB204-0007\nfrequency_hz,vin_v,vout_v\n\n100,1,2\n# note\n200,1,3\n';
    const sweep = parseSweepCsv(text);
    expect(Array.from(sweep.lineNumber)).toEqual([5, 7]);
    expect(Array.from(sweep.gain)).toEqual([2, 3]);
  });

  it('detects a semicolon delimiter and accepts decimal commas with it', () => {
    const sweep = parseSweepCsv('frequency_hz;vin_v;vout_v\n100;1,0;0,25\n1000;1;0,125\n');
    // 0,25 and 0,125 are 0.25 and 0.125 written with a decimal comma.
    expect(Array.from(sweep.gain)).toEqual([0.25, 0.125]);
  });

  it('detects a tab delimiter', () => {
    const sweep = parseSweepCsv('frequency_hz\tvin_v\tvout_v\n10\t2\t1\n20\t2\t0.5\n');
    expect(Array.from(sweep.gain)).toEqual([0.5, 0.25]);
  });

  it('refuses a decimal comma when the delimiter is a comma, since the cell was split', () => {
    const error = inputError(() => parseSweepCsv('frequency_hz,vin_v,vout_v\n100,1,0,5\n200,1,0.5\n', { file: 'c.csv' }));
    expect(error.location).toMatchObject({ file: 'c.csv', row: 2 });
    expect(error.message).toContain('4 cells but the header has 3');
  });

  it('sorts a sweep recorded in falling frequency order', () => {
    const sweep = parseSweepCsv('frequency_hz,vin_v,vout_v\n1000,1,3\n100,1,2\n10,1,1\n');
    expect(Array.from(sweep.frequencyHz)).toEqual([10, 100, 1000]);
    expect(Array.from(sweep.voutVolts)).toEqual([1, 2, 3]);
    expect(Array.from(sweep.lineNumber)).toEqual([4, 3, 2]);
  });

  it('reads optional phase and floor columns in any order, any case, ignoring unknown columns', () => {
    const text = 'Floor_V,notes,VOUT_V,frequency_hz,phase_deg,vin_v\n1e-6,ok,0.001,100,-12.5,1\n2e-6,x,0.002,200,170,1\n';
    const sweep = parseSweepCsv(text);
    expect(Array.from(sweep.floorVolts!)).toEqual([1e-6, 2e-6]);
    expect(Array.from(sweep.phaseDeg!)).toEqual([-12.5, 170]);
    expect(Array.from(sweep.voutVolts)).toEqual([0.001, 0.002]);
  });

  it('accepts quoted cells, a byte-order mark and CRLF line ends', () => {
    const sweep = parseSweepCsv('\uFEFF"frequency_hz","vin_v","vout_v"\r\n"100","1","2"\r\n"200","1","4"\r\n');
    expect(Array.from(sweep.gain)).toEqual([2, 4]);
  });

  it('accepts UTF-8 bytes as a Uint8Array or an ArrayBuffer', () => {
    const bytes = new TextEncoder().encode('frequency_hz,vin_v,vout_v\n100,1,2\n200,1,4\n');
    expect(Array.from(parseSweepCsv(bytes).gain)).toEqual([2, 4]);
    expect(Array.from(parseSweepCsv(bytes.buffer as ArrayBuffer).gain)).toEqual([2, 4]);
  });

  it('accepts a zero output reading when the row gives a positive floor', () => {
    const sweep = parseSweepCsv('frequency_hz,vin_v,vout_v,floor_v\n100,1,0,1e-6\n200,1,1e-5,1e-6\n');
    expect(sweep.voutVolts[0]).toBe(0);
  });

  it('averages repeated frequencies only when asked: mean amplitudes, circular mean phase', () => {
    const text = 'frequency_hz,vin_v,vout_v,phase_deg,floor_v\n100,1,2,179,1e-6\n200,1,1,0,1e-6\n100,1,4,-179,3e-6\n';
    const sweep = parseSweepCsv(text, { averageRepeats: true });
    expect(Array.from(sweep.frequencyHz)).toEqual([100, 200]);
    // Means by hand: vout (2 + 4)/2 = 3, floor (1e-6 + 3e-6)/2 = 2e-6; the circular mean of
    // 179° and −179° is 180° (±180° are the same angle).
    expect(sweep.voutVolts[0]).toBe(3);
    expect(sweep.gain[0]).toBe(3);
    expect(Math.abs(sweep.floorVolts![0] - 2e-6)).toBeLessThan(ROUNDING);
    expect(Math.abs(Math.abs(sweep.phaseDeg![0]) - 180)).toBeLessThan(ROUNDING);
    expect(sweep.repeatCount[0]).toBe(2);
    expect(sweep.lineNumber[0]).toBe(2);
  });

  describe('bad input', () => {
    const header = 'frequency_hz,vin_v,vout_v\n';

    it('rejects an empty file, naming it', () => {
      const error = inputError(() => parseSweepCsv('', { file: 'empty.csv' }));
      expect(error.location.file).toBe('empty.csv');
      expect(error.message).toMatch(/^empty\.csv: parseSweepCsv: the sweep file is empty/);
    });

    it('rejects a file of comments only as empty', () => {
      expect(inputError(() => parseSweepCsv('# nothing here\n\n')).message).toContain('empty');
    });

    it('rejects a header without data rows', () => {
      const error = inputError(() => parseSweepCsv(header, { file: 'h.csv' }));
      expect(error.location).toMatchObject({ file: 'h.csv', row: 1 });
      expect(error.message).toContain('no data rows');
    });

    it('rejects a one-row sweep, naming the row', () => {
      const error = inputError(() => parseSweepCsv(`${header}100,1,2\n`, { file: 'one.csv' }));
      expect(error.location).toMatchObject({ file: 'one.csv', row: 2 });
      expect(error.message).toContain('single row');
    });

    it('rejects a missing required column, naming it', () => {
      const error = inputError(() => parseSweepCsv('frequency_hz,vin_v,vout\n100,1,2\n200,1,2\n', { file: 'm.csv' }));
      expect(error.location).toMatchObject({ file: 'm.csv', row: 1, field: 'vout_v' });
      expect(error.message).toContain('no "vout_v" column');
    });

    it('rejects a duplicated column, naming both positions', () => {
      const error = inputError(() => parseSweepCsv('frequency_hz,vin_v,vout_v,vin_v\n100,1,2,1\n200,1,2,1\n'));
      expect(error.location).toMatchObject({ row: 1, column: 4, field: 'vin_v' });
      expect(error.message).toContain('columns 2 and 4');
    });

    it('rejects text in a numeric cell with row and column', () => {
      const error = inputError(() => parseSweepCsv(`${header}100,1,2\n200,1,2.0V\n`, { file: 't.csv' }));
      expect(error.location).toMatchObject({ file: 't.csv', row: 3, column: 'vout_v' });
      expect(error.message).toBe('t.csv, row 3, column "vout_v": parseSweepCsv: "2.0V" is not a number');
    });

    it('rejects an empty numeric cell', () => {
      const error = inputError(() => parseSweepCsv(`${header}100,,2\n200,1,2\n`));
      expect(error.location).toMatchObject({ row: 2, column: 'vin_v' });
    });

    it.each(['NaN', 'nan', 'Inf', '-Infinity', '+inf'])('rejects %s as not finite', (cell) => {
      const error = inputError(() => parseSweepCsv(`${header}100,1,2\n200,1,${cell}\n`));
      expect(error.location).toMatchObject({ row: 3, column: 'vout_v' });
      expect(error.message).toContain('not a finite number');
    });

    it('rejects a number that overflows to infinity', () => {
      const error = inputError(() => parseSweepCsv(`${header}1e400,1,2\n200,1,2\n`));
      expect(error.location).toMatchObject({ row: 2, column: 'frequency_hz' });
    });

    it.each([
      ['0,1,2', 'frequency_hz', 'frequency must be positive'],
      ['-100,1,2', 'frequency_hz', 'frequency must be positive'],
      ['100,0,2', 'vin_v', 'drive amplitude must be positive'],
      ['100,-1,2', 'vin_v', 'drive amplitude must be positive'],
      ['100,1,-2', 'vout_v', 'output amplitude must be positive'],
      ['100,1,0', 'vout_v', 'only with a positive floor_v'],
    ])('rejects the row %s in column %s', (row, column, reason) => {
      const error = inputError(() => parseSweepCsv(`${header}${row}\n200,1,2\n`, { file: 'v.csv' }));
      expect(error.location).toMatchObject({ file: 'v.csv', row: 2, column });
      expect(error.message).toContain(reason);
    });

    it('rejects a negative floor', () => {
      const error = inputError(() => parseSweepCsv('frequency_hz,vin_v,vout_v,floor_v\n100,1,2,-1e-6\n200,1,2,0\n'));
      expect(error.location).toMatchObject({ row: 2, column: 'floor_v' });
    });

    it('rejects a row with a different number of cells than the header', () => {
      const error = inputError(() => parseSweepCsv(`${header}100,1,2\n200,1\n`));
      expect(error.location).toMatchObject({ row: 3 });
      expect(error.message).toContain('2 cells but the header has 3');
    });

    it('rejects a repeated frequency, naming both lines, unless averaging is asked', () => {
      const text = `${header}100,1,2\n200,1,2\n1e2,1,3\n`;
      const error = inputError(() => parseSweepCsv(text, { file: 'r.csv' }));
      expect(error.location).toMatchObject({ file: 'r.csv', row: 4, column: 'frequency_hz' });
      expect(error.message).toContain('frequency 100 Hz is repeated (also on line 2)');
      expect(parseSweepCsv(text, { averageRepeats: true }).frequencyHz.length).toBe(2);
    });

    it('rejects a sweep that averages down to a single frequency', () => {
      const error = inputError(() => parseSweepCsv(`${header}100,1,2\n100,1,3\n`, { averageRepeats: true }));
      expect(error.message).toContain('single frequency');
    });
  });
});
