import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cli-runner';

const root = resolve(import.meta.dirname, '..', '..');
const samples = join(root, 'sample-data', 'captures');

/** Runs `rejectra capture …` as a child process (several run at once: the tests are concurrent). */
const cli = (...args: string[]) => runCli('capture', args);

interface ManifestEntry {
  file: string;
  frequencyHz: number;
  gain: number;
  phaseDeg: number;
  input: { amplitude: number; phaseDeg: number; offset: number };
  output: { amplitude: number; phaseDeg: number; offset: number };
}

// The parameters each demo capture was synthesised from (scripts/sample-data/captures.ts).
const manifest = JSON.parse(readFileSync(join(samples, 'manifest.json'), 'utf8')) as { captures: ManifestEntry[] };

// The demo records carry noise, harmonics and (WAV) quantisation. The scatter of a fitted
// amplitude is σ·sqrt(2/n) (least-squares covariance for white noise), below 1e-4 of the amplitude
// for every demo record; 1e-3 relative leaves a tenfold margin. Phase: 1e-3 rad ≈ 0.06°, so 0.1°.
const DEMO_RELATIVE = 1e-3;
const DEMO_PHASE_DEG = 0.1;
// The estimated frequency scatters by ~1e-7 relative on these records; 1e-5 is a wide margin.
const DEMO_FREQUENCY_RELATIVE = 1e-5;

const temporary = mkdtempSync(join(tmpdir(), 'capture-cli-'));
afterAll(() => rmSync(temporary, { recursive: true, force: true }));

function phaseDifferenceDeg(a: number, b: number): number {
  return Math.abs(((((a - b) % 360) + 540) % 360) - 180);
}

describe.concurrent('rejectra capture', () => {
  for (const entry of manifest.captures) {
    it(`prints one JSON document with the known gain and phase of ${entry.file} (frequency estimated)`, async () => {
      const result = await cli(`sample-data/captures/${entry.file}`, '--json');
      expect(result.stderr).toBe('');
      expect(result.status).toBe(0);
      const document = JSON.parse(result.stdout);
      // Synthetic signal with known parameters: manifest.json beside the file.
      expect(Math.abs(document.frequencyHz - entry.frequencyHz)).toBeLessThan(DEMO_FREQUENCY_RELATIVE * entry.frequencyHz);
      expect(Math.abs(document.gain - entry.gain)).toBeLessThan(DEMO_RELATIVE * entry.gain);
      expect(Math.abs(document.gainDb - 20 * Math.log10(entry.gain))).toBeLessThan(20 * Math.log10(1 + DEMO_RELATIVE));
      expect(phaseDifferenceDeg(document.phaseDeg, entry.phaseDeg)).toBeLessThan(DEMO_PHASE_DEG);
      for (const name of ['input', 'output'] as const) {
        expect(Math.abs(document[name].amplitude - entry[name].amplitude)).toBeLessThan(DEMO_RELATIVE * entry[name].amplitude);
        expect(document[name].residualRms).toBeGreaterThan(0);
        expect(Object.keys(document[name]).sort()).toEqual(['amplitude', 'offset', 'phaseDeg', 'residualRms']);
      }
      expect(document.frequencySource).toBe('estimated');
      expect(document).toHaveProperty('sampleRateHz');
      expect(document).toHaveProperty('samples');
      expect(document).toHaveProperty('cycles');
    });
  }

  it('fits at a given --frequency and says so', async () => {
    const entry = manifest.captures.find((capture) => capture.file.endsWith('pcm24.wav'))!;
    const result = await cli(`sample-data/captures/${entry.file}`, '--frequency', String(entry.frequencyHz), '--json');
    expect(result.status).toBe(0);
    const document = JSON.parse(result.stdout);
    expect(document.frequencyHz).toBe(entry.frequencyHz);
    expect(document.frequencySource).toBe('given');
    // Synthetic signal with known parameters (manifest.json).
    expect(Math.abs(document.gain - entry.gain)).toBeLessThan(DEMO_RELATIVE * entry.gain);
  });

  it('prints a readable table without --json', async () => {
    const result = await cli('sample-data/captures/hrb204-0012-common-mode-50hz.csv');
    expect(result.status).toBe(0);
    expect(result.stdout).toMatch(/^file\s+sample-data\/captures\/hrb204-0012-common-mode-50hz\.csv \(csv, text; amplitudes peak, in volts\)/);
    expect(result.stdout).toMatch(/\nfrequency\s+50\.0\d* Hz \(estimated\)/);
    expect(result.stdout).toMatch(/\ngain\s+2\.5\d*e-4 \(-72\.0\d* dB\)/);
    expect(result.stdout).toMatch(/\nchannel\s+amplitude \(V\)\s+phase \(°\)\s+offset \(V\)\s+residual RMS \(V\)\ninput\s+2\.0|\ninput\s+1\.99/);
  });

  it('reports a bad cell with file, line and column on stderr and exits 1 without printing JSON', async () => {
    const path = join(temporary, 'bad-cell.csv');
    writeFileSync(path, '# HRB204-0007\ntime_s,input_v,output_v\n0,1,1\n0.001,abc,1\n');
    const result = await cli(path, '--json');
    expect(result.status).toBe(1);
    expect(result.stdout).toBe('');
    expect(result.stderr).toBe(`rejectra capture: ${path}, row 4, column "input_v": "abc" is not a number (column 2)\n`);
  });

  it('reports a mono WAV, a capture with too few cycles and a bad --frequency', async () => {
    const mono = join(temporary, 'mono.wav');
    const bytes = readFileSync(join(samples, 'hrb204-0012-differential-100hz-pcm16.wav'));
    bytes.writeUInt16LE(1, 22);
    writeFileSync(mono, bytes);
    const monoResult = await cli(mono);
    expect(monoResult.status).toBe(1);
    expect(monoResult.stderr).toMatch(/mono\.wav, field "fmt\.channels": the WAV file is mono/);

    const few = await cli('sample-data/captures/hrb204-0012-differential-100hz-pcm16.wav', '--frequency', '0.5');
    expect(few.status).toBe(1);
    expect(few.stderr).toMatch(/field "frequencyHz": the capture holds only 0\.256 cycles .* at least 3 cycles are needed/);

    const badFrequency = await cli('sample-data/captures/hrb204-0012-differential-100hz-pcm16.wav', '--frequency', '1k');
    expect(badFrequency.status).toBe(1);
    expect(badFrequency.stderr).toMatch(/field "--frequency": "1k" is not a frequency in Hz above 0/);
  });

  it('reports a missing file and a missing argument', async () => {
    const missing = await cli('sample-data/captures/no-such-file.csv');
    expect(missing.status).toBe(1);
    expect(missing.stderr).toMatch(/cannot read sample-data\/captures\/no-such-file\.csv: ENOENT/);
    const none = await cli();
    expect(none.status).toBe(2);
    expect(none.stderr).toMatch(/missing FILE\nusage: rejectra capture FILE/);
  });
});
