import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { analyzeSweeps } from '../../shared/engine/frequency-fit';
import { runCli } from '../helpers/cli-runner';

const root = fileURLToPath(new URL('../..', import.meta.url));
const sweeps = 'sample-data/sweeps';
const scratch = mkdtempSync(join(tmpdir(), 'rejectra-analyze-'));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

const cli = (...args: string[]) => runCli('analyze', args);

function scratchFile(name: string, text: string): string {
  const path = join(scratch, name);
  writeFileSync(path, text);
  return path;
}

interface AnalyzeDocument {
  points: { frequencyHz: number; ad: number; acm: number; cmrrDb: number; lowerBound: boolean }[];
  fit: {
    model: string;
    cmrrDcDb: number | null;
    cmrrDcDbInterval95: [number, number] | null;
    cmrrCornerHz: number | null;
    bandwidthHz: number | null;
    regimeSentence: string;
    residualsDb: (number | null)[];
  };
  warnings: string[];
}

describe('rejectra analyze', () => {
  it('prints exactly one JSON document with the contract fields, equal to the engine run in-process', async () => {
    const differential = `${sweeps}/hrb204-0007-differential.csv`;
    const commonMode = `${sweeps}/hrb204-0007-common-mode.csv`;
    const { status, stdout, stderr } = await cli('--differential', differential, '--common-mode', commonMode, '--json');
    expect(stderr).toBe('');
    expect(status).toBe(0);
    const document = JSON.parse(stdout) as AnalyzeDocument;
    expect(document.points).toHaveLength(51); // 10 Hz–1 MHz at 10 points a decade (the generator)
    for (const point of document.points) {
      expect(Object.keys(point)).toEqual(expect.arrayContaining(['frequencyHz', 'ad', 'acm', 'cmrrDb', 'lowerBound']));
    }
    const engine = analyzeSweeps(readFileSync(join(root, differential)), readFileSync(join(root, commonMode)));
    expect(document.points.map((point) => point.cmrrDb)).toEqual(engine.points.map((point) => point.cmrrDb));
    expect(document.fit.cmrrDcDb).toBe(engine.fit.cmrrDcDb);
    expect(document.fit.cmrrCornerHz).toBe(engine.fit.cmrrCornerHz);
    expect(document.fit.model).toBe('first-order');
    // The demo board was generated at 84 dB with 0.3 dB scatter (sample-data/sweeps/manifest.json):
    // 51 points put the fitted dc value well within 0.5 dB.
    expect(Math.abs(document.fit.cmrrDcDb! - 84)).toBeLessThan(0.5);
  });

  it('reports floor-limited common-mode points as flagged lower bounds computed with twice the floor', async () => {
    const commonMode = `${sweeps}/hrb204-0012-floor-limited-common-mode.csv`;
    const { status, stdout } = await cli('--differential', `${sweeps}/hrb204-0012-floor-limited-differential.csv`, '--common-mode', commonMode, '--json');
    expect(status).toBe(0);
    const document = JSON.parse(stdout) as AnalyzeDocument;
    const firstRow = readFileSync(join(root, commonMode), 'utf8').split('\n').find((line) => /^\d/.test(line))!.split(',');
    const [vinVolts, voutVolts, floorVolts] = [Number(firstRow[1]), Number(firstRow[2]), Number(firstRow[4])];
    expect(voutVolts).toBeLessThan(2 * floorVolts);
    expect(document.points[0].lowerBound).toBe(true);
    // DOMAIN.md "Measuring it": acm = 2·floor/vin for a point within 6 dB of its floor.
    expect(document.points[0].acm).toBe((2 * floorVolts) / vinVolts);
    expect(document.points.filter((point) => point.lowerBound).length).toBeGreaterThan(3);
  });

  it('prints a readable table marking bounds, with the fit summary and the regime sentence', async () => {
    const { status, stdout } = await cli(
      '--differential', `${sweeps}/hrb204-0012-floor-limited-differential.csv`,
      '--common-mode', `${sweeps}/hrb204-0012-floor-limited-common-mode.csv`,
    );
    expect(status).toBe(0);
    const lines = stdout.split('\n');
    expect(lines[0]).toMatch(/^frequency \(Hz\)\s+Ad\s+Acm\s+CMRR \(dB\)\s+fit \(dB\)\s+residual \(dB\)$/);
    // Right-aligned columns: every point row is as long as the header.
    expect(lines[1].length).toBe(lines[0].length);
    expect(lines[1]).toContain('≥ ');
    expect(stdout).toMatch(/^dc CMRR {7}\d+\.\d\d dB {2}95 % \[/m);
    expect(stdout).toMatch(/^regimes {7}Below .* rejection is flat/m);
  });

  it('sorts a sweep recorded in falling order', async () => {
    const { status, stdout } = await cli(
      '--differential', `${sweeps}/hrb311-0003-falling-differential.csv`,
      '--common-mode', `${sweeps}/hrb311-0003-falling-common-mode.csv`, '--json',
    );
    expect(status).toBe(0);
    const frequencies = (JSON.parse(stdout) as AnalyzeDocument).points.map((point) => point.frequencyHz);
    expect(frequencies[0]).toBe(20);
    expect(frequencies.every((frequency, index) => index === 0 || frequency > frequencies[index - 1])).toBe(true);
  });

  it('rejects repeated frequencies naming file, row and column, and averages them with --average-repeats', async () => {
    const args = ['--differential', `${sweeps}/hrb204-0021-semicolon-differential.csv`, '--common-mode', `${sweeps}/hrb204-0021-semicolon-common-mode.csv`];
    const refused = await cli(...args, '--json');
    expect(refused.status).toBe(1);
    expect(refused.stdout).toBe('');
    expect(refused.stderr).toMatch(
      /^rejectra analyze: sample-data\/sweeps\/hrb204-0021-semicolon-common-mode\.csv, row \d+, column "frequency_hz": parseSweepCsv: frequency 1002 Hz is repeated/,
    );
    const averaged = await cli(...args, '--json', '--average-repeats');
    expect(averaged.status).toBe(0);
    expect((JSON.parse(averaged.stdout) as AnalyzeDocument).fit.model).toBe('first-order');
  });

  it('names file, row and column of a bad cell', async () => {
    const bad = scratchFile('bad.csv', 'frequency_hz,vin_v,vout_v\n100,1,1e-4\n200,1,n/a\n');
    const { status, stdout, stderr } = await cli('--differential', `${sweeps}/hrb204-0007-differential.csv`, '--common-mode', bad);
    expect(status).toBe(1);
    expect(stdout).toBe('');
    expect(stderr).toBe(`rejectra analyze: ${bad}, row 3, column "vout_v": parseSweepCsv: "n/a" is not a number\n`);
  });

  it('refuses a sweep pair with no overlapping frequencies', async () => {
    const high = scratchFile('high.csv', 'frequency_hz,vin_v,vout_v\n2e6,1,1e-3\n3e6,1,1e-3\n');
    const { status, stderr } = await cli('--differential', `${sweeps}/hrb204-0007-differential.csv`, '--common-mode', high);
    expect(status).toBe(1);
    expect(stderr).toContain('do not overlap in frequency');
    expect(stderr).toContain(high);
  });

  it('says which option is missing, and which file cannot be read', async () => {
    const missing = await cli('--differential', `${sweeps}/hrb204-0007-differential.csv`);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toContain('missing --common-mode FILE');
    const unreadable = await cli('--differential', `${sweeps}/no-such-file.csv`, '--common-mode', `${sweeps}/hrb204-0007-common-mode.csv`);
    expect(unreadable.status).toBe(1);
    expect(unreadable.stderr).toBe(`rejectra analyze: cannot read ${sweeps}/no-such-file.csv: ENOENT\n`);
  });
});
