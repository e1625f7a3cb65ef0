import { describe, expect, it } from 'vitest';
import { pairCmrrPoints } from '../../../shared/engine/cmrr-points';
import { EngineInputError } from '../../../shared/engine/errors';
import { parseSweepCsv } from '../../../shared/engine/sweep-file';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

// A ratio, a log10 and a power of doubles: well inside 1e-12 relative.
const ROUNDING = 1e-12;

function sweep(text: string, file?: string) {
  return parseSweepCsv(text, { file });
}

function inputError(action: () => unknown): EngineInputError {
  try {
    action();
  } catch (error) {
    expect(error).toBeInstanceOf(EngineInputError);
    return error as EngineInputError;
  }
  throw new Error('expected an EngineInputError, none was thrown');
}

describe('pairCmrrPoints', () => {
  it('computes ad, acm and cmrrDb = 20·log10(ad/acm) at shared frequencies', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v\n100,0.1,1\n1000,0.1,0.5\n');
    const commonMode = sweep('frequency_hz,vin_v,vout_v\n100,1,0.001\n1000,1,0.0005\n');
    const { points, warnings } = pairCmrrPoints(differential, commonMode);
    expect(warnings).toEqual([]);
    // DOMAIN.md "Quantities": ad = 1/0.1 = 10, acm = 0.001/1, CMRR = 20·log10(10/0.001) = 80 dB.
    expect(points[0].ad).toBeCloseTo(10, 12);
    expect(points[0].acm).toBe(0.001);
    expect(Math.abs(points[0].cmrrDb - 80)).toBeLessThan(ROUNDING * 80);
    // 5/0.0005 = 1e4 → 80 dB again, by hand.
    expect(Math.abs(points[1].cmrrDb - 80)).toBeLessThan(ROUNDING * 80);
    expect(points.map((point) => point.lowerBound)).toEqual([false, false]);
    expect(points.map((point) => point.interpolated)).toEqual([false, false]);
  });

  it('turns a common-mode reading below twice its floor into a flagged lower bound using 2·floor', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v\n100,1,10\n1000,1,10\n');
    const commonMode = sweep('frequency_hz,vin_v,vout_v,floor_v\n100,2,1.5e-5,1e-5\n1000,2,2e-5,1e-5\n', 'cm.csv');
    const { points } = pairCmrrPoints(differential, commonMode);
    // DOMAIN.md "Measuring it": vout = 1.5e-5 < 2·1e-5, so acm = 2·1e-5/2 = 1e-5 and
    // CMRR ≥ 20·log10(10/1e-5) = 120 dB.
    expect(points[0].lowerBound).toBe(true);
    expect(Math.abs(points[0].acm - 1e-5)).toBeLessThan(ROUNDING * 1e-5);
    expect(Math.abs(points[0].cmrrDb - 120)).toBeLessThan(ROUNDING * 120);
    // vout = 2·floor exactly is not below 2·floor: a plain value, 20·log10(10/1e-5) = 120 dB.
    expect(points[1].lowerBound).toBe(false);
  });

  it('interpolates the differential gain linearly in log-gain against log-frequency', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v\n100,1,10\n10000,1,1\n');
    const commonMode = sweep('frequency_hz,vin_v,vout_v\n100,1,0.01\n1000,1,0.001\n');
    const { points: [exact, point] } = pairCmrrPoints(differential, commonMode);
    expect(exact.interpolated).toBe(false);
    // Halfway in log10(f) between gains 10 and 1 is sqrt(10) (by hand); CMRR = 20·log10(sqrt(10)/0.001) = 70 dB.
    expect(point.interpolated).toBe(true);
    expect(Math.abs(point.ad - Math.sqrt(10))).toBeLessThan(ROUNDING * 10);
    expect(Math.abs(point.cmrrDb - 70)).toBeLessThan(ROUNDING * 70);
  });

  it.skipIf(!hasNumpy)('agrees with numpy.interp on log10 values at uneven frequencies', () => {
    const differentialRows = [
      [10, 100.2], [31.6, 99.8], [100, 99.0], [316, 95.1], [1000, 80.3], [3160, 40.2], [10000, 13.1],
    ];
    const commonModeHz = [12, 50, 100, 420, 999, 5000, 9999];
    const differential = sweep(`frequency_hz,vin_v,vout_v\n${differentialRows.map(([f, v]) => `${f},1,${v}`).join('\n')}\n`);
    const commonMode = sweep(`frequency_hz,vin_v,vout_v\n${commonModeHz.map((f) => `${f},1,0.001`).join('\n')}\n`);
    const { points } = pairCmrrPoints(differential, commonMode);
    const reference = runPython<number[]>(
      [
        'import json, sys, numpy as np',
        'd = json.load(sys.stdin)',
        'x = np.log10([r[0] for r in d["rows"]]); y = np.log10([r[1] for r in d["rows"]])',
        'print(json.dumps((10 ** np.interp(np.log10(d["at"]), x, y)).tolist()))',
      ].join('\n'),
      { rows: differentialRows, at: commonModeHz },
    );
    points.forEach((point, index) => expect(Math.abs(point.ad / reference[index] - 1)).toBeLessThan(ROUNDING));
  });

  it('interpolates the differential phase the short way round ±180°', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v,phase_deg\n100,1,1,170\n10000,1,1,-170\n');
    const commonMode = sweep('frequency_hz,vin_v,vout_v,phase_deg\n1000,1,0.001,45\n10000,1,0.001,50\n');
    const { points } = pairCmrrPoints(differential, commonMode);
    // Halfway from 170° to −170° going through 180° is 180°, by hand.
    expect(points[0].adPhaseDeg).toBeCloseTo(180, 9);
    expect(points[0].acmPhaseDeg).toBe(45);
    expect(points[1].adPhaseDeg).toBe(-170);
  });

  it('uses only common-mode frequencies inside the differential range and says what it left out', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v\n100,1,10\n1000,1,10\n');
    const commonMode = sweep('frequency_hz,vin_v,vout_v\n10,1,1e-4\n100,1,1e-4\n1000,1,1e-4\n5000,1,1e-4\n', 'cm.csv');
    const { points, warnings } = pairCmrrPoints(differential, commonMode);
    expect(points.map((point) => point.frequencyHz)).toEqual([100, 1000]);
    expect(warnings).toEqual(["cm.csv: 2 point(s) outside the differential sweep's range 100–1000 Hz were left out"]);
  });

  it('leaves out a differential point within 6 dB of its floor, with a warning naming its line', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v,floor_v\n100,1,10,1e-6\n1000,1,10,1e-6\n10000,1,1e-6,1e-6\n', 'd.csv');
    const commonMode = sweep('frequency_hz,vin_v,vout_v\n100,1,1e-4\n1000,1,1e-4\n10000,1,1e-4\n');
    const { points, warnings } = pairCmrrPoints(differential, commonMode);
    expect(points.map((point) => point.frequencyHz)).toEqual([100, 1000]);
    expect(warnings[0]).toContain('d.csv, line 4: differential output is within 6 dB of its floor');
  });

  it('rejects a pair of sweeps with no overlapping frequencies, giving both ranges', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v\n100,1,10\n1000,1,10\n', 'd.csv');
    const commonMode = sweep('frequency_hz,vin_v,vout_v\n2000,1,1e-4\n5000,1,1e-4\n', 'cm.csv');
    const error = inputError(() => pairCmrrPoints(differential, commonMode));
    expect(error.location).toMatchObject({ file: 'cm.csv', field: 'frequency_hz' });
    expect(error.message).toContain('do not overlap');
    expect(error.message).toContain('d.csv covers 100–1000 Hz');
    expect(error.message).toContain('cm.csv covers 2000–5000 Hz');
  });

  it('rejects a differential sweep with fewer than 2 points above its floor', () => {
    const differential = sweep('frequency_hz,vin_v,vout_v,floor_v\n100,1,1e-6,1e-6\n1000,1,10,1e-6\n', 'd.csv');
    const commonMode = sweep('frequency_hz,vin_v,vout_v\n100,1,1e-4\n1000,1,1e-4\n');
    const error = inputError(() => pairCmrrPoints(differential, commonMode));
    expect(error.location).toMatchObject({ file: 'd.csv', field: 'vout_v' });
  });
});
