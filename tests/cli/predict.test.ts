import { describe, expect, it } from 'vitest';
import { predictDifferenceAmplifier } from '../../shared/engine/difference-amplifier';
import { runCli } from '../helpers/cli-runner';

/** Runs `rejectra predict …` as a child process (several run side by side to keep the file quick). */
const cli = (...args: string[]) => runCli('predict', args);

interface PredictDocument {
  points: {
    frequencyHz: number;
    adDb: number | null;
    acmDb: number | null;
    cmrrDb: number | null;
    cmrrOppositeSignDb: number | null;
  }[];
}

const circuitArgs = ['--r1', '10000', '--r2', '100000', '--r3', '10000', '--r4', '100200', '--rs1', '50', '--rs2', '75'];
const opAmpArgs = ['--open-loop-gain-db', '110', '--gbw-hz', '3e6', '--opamp-cmrr-db', '95', '--opamp-cmrr-corner-hz', '2000'];

describe('rejectra predict', () => {
  it('prints one JSON document with the contract fields, equal to the engine run in-process', async () => {
    const { status, stdout, stderr } = await cli(...circuitArgs, ...opAmpArgs, '--frequencies', '10,1000,100000', '--json');
    expect(stderr).toBe('');
    expect(status).toBe(0);
    const document = JSON.parse(stdout) as PredictDocument;
    const engine = predictDifferenceAmplifier(
      [10, 1000, 100000],
      { r1Ohms: 10e3, r2Ohms: 100e3, r3Ohms: 10e3, r4Ohms: 100.2e3, sourceResistance1Ohms: 50, sourceResistance2Ohms: 75 },
      { openLoopGainDb: 110, gainBandwidthHz: 3e6, cmrrDb: 95, cmrrCornerHz: 2000 },
    );
    expect(document.points).toHaveLength(3);
    document.points.forEach((point, index) => {
      expect(point).toMatchObject({
        frequencyHz: engine[index].frequencyHz,
        adDb: engine[index].adDb,
        acmDb: engine[index].acmDb,
        cmrrDb: engine[index].cmrrDb,
        cmrrOppositeSignDb: engine[index].cmrrOppositeSignDb,
      });
    });
  });

  it('gives Ad = R2/R1 and null (infinite) CMRR for matched ratios with an ideal op-amp, accepting k multipliers', async () => {
    // Matched-ratio relation vout = (R2/R1)(v2 − v1), DOMAIN.md: 20·log10(10) = 20 dB.
    const { status, stdout } = await cli('--r1', '4.99k', '--r2', '49.9k', '--r3', '4.99k', '--r4', '49.9k', '--frequencies', '1k', '--json');
    expect(status).toBe(0);
    const [point] = (JSON.parse(stdout) as PredictDocument).points;
    expect(point.frequencyHz).toBe(1000);
    expect(point.adDb).toBeCloseTo(20, 12);
    expect(point.cmrrDb).toBeNull();
    expect(point.acmDb).toBeNull();
  });

  it('prints a readable aligned table without --json', async () => {
    const { status, stdout } = await cli(...circuitArgs, ...opAmpArgs, '--frequencies', '10,1000');
    expect(status).toBe(0);
    const lines = stdout.trimEnd().split('\n');
    expect(lines[0]).toMatch(/R1 10000 Ω.*op-amp A0 110 dB/);
    expect(lines[2]).toMatch(/frequency \(Hz\)\s+Ad \(dB\)\s+Acm \(dB\)\s+CMRR \(dB\)\s+CMRR, opposite sign \(dB\)/);
    expect(lines).toHaveLength(5);
    expect(new Set(lines.slice(2).map((line) => line.length)).size).toBe(1);
    // 91.485 dB as written for this circuit (the ngspice-checked fixture difference-amplifier-opamp-positive.cir).
    expect(lines[3]).toMatch(/91\.485/);
  });

  it('names the field for zero, negative and non-numeric resistances and a missing one', async () => {
    // `--r1=-100`: node's parseArgs takes a value starting with a dash only in this form.
    const ohms = (r1: string) => [`--r1=${r1}`, '--r2', '1000', '--r3', '1000', '--r4', '1000', '--frequencies', '10'];
    const runs = await Promise.all([
      cli(...ohms('0')),
      cli(...ohms('-100')),
      cli(...ohms('NaN')),
      cli('--r1', '1000', '--r2', '1000', '--r3', '1000', '--frequencies', '10'),
      cli(...ohms('1000'), '--rs2=-1'),
    ]);
    const expected = [/field "r1".*above 0 ohms/, /field "r1".*above 0 ohms/, /field "r1".*must be a number/, /field "r4".*required/, /field "rs2"/];
    runs.forEach((run, index) => {
      expect(run.status).toBe(1);
      expect(run.stdout).toBe('');
      expect(run.stderr).toMatch(expected[index]);
    });
  });

  it('says which op-amp parameters are missing from partial data', async () => {
    const run = await cli(...circuitArgs, '--open-loop-gain-db', '110', '--gbw-hz', '3e6', '--frequencies', '10');
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/--opamp-cmrr-db, --opamp-cmrr-corner-hz are missing/);
  });

  it('names the entry of a non-numeric or negative frequency, and a missing list', async () => {
    const runs = await Promise.all([
      cli(...circuitArgs, '--frequencies', '10,abc,100'),
      cli(...circuitArgs, '--frequencies=10,-5'),
      cli(...circuitArgs),
    ]);
    expect(runs[0].stderr).toMatch(/column 2, field "frequencies": .*entry 2.*"abc"/);
    expect(runs[1].stderr).toMatch(/entry 2/);
    expect(runs[2].stderr).toMatch(/--frequencies is required/);
    for (const run of runs) expect(run.status).toBe(1);
  });

  it('rejects an unknown option with usage and exit code 2', async () => {
    const run = await cli(...circuitArgs, '--frequencies', '10', '--r5', '1');
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/usage: rejectra predict/);
  });
});
