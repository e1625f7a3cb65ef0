import { describe, expect, it } from 'vitest';
import { monteCarloCmrr } from '../../shared/engine/resistor-tolerance';
import { runCli } from '../helpers/cli-runner';

/** DOMAIN.md quotes its check values to 0.01 dB. */
const QUOTED_TO_HUNDREDTHS_DB = 0.005;

/** Runs `rejectra tolerance …` as a child process (several run side by side to keep the file quick). */
const cli = (...args: string[]) => runCli('tolerance', args);

interface ToleranceDocument {
  worstCaseDb: number;
  approximationDb: number;
  monteCarlo: { p05Db: number; p50Db: number; p95Db: number; trials: number; seed: number; yieldFraction?: number };
  inverse?: { targetDb: number; approximationToleranceFraction: number; worstCaseToleranceFraction: number };
  series?: string;
  pairs?: { r1Ohms: number; r2Ohms: number; gain: number; worstCaseCmrrDb: number }[];
}

describe('rejectra tolerance', () => {
  it('prints one JSON document with the contract fields: DOMAIN.md check value and the engine’s Monte Carlo', async () => {
    const { status, stdout, stderr } = await cli('--gain', '10', '--tolerance', '0.001', '--trials', '200000', '--seed', '42', '--json');
    expect(stderr).toBe('');
    expect(status).toBe(0);
    const document = JSON.parse(stdout) as ToleranceDocument;
    // DOMAIN.md: G = 10, ε = 0.1 % → 68.79 dB.
    expect(Math.abs(document.approximationDb - 68.79)).toBeLessThan(QUOTED_TO_HUNDREDTHS_DB);
    expect(Math.abs(document.worstCaseDb - 68.79)).toBeLessThan(QUOTED_TO_HUNDREDTHS_DB);
    const engine = monteCarloCmrr({ gain: 10, toleranceFraction: 0.001, trials: 200_000, seed: 42 });
    expect(document.monteCarlo).toMatchObject({ p05Db: engine.p05Db, p50Db: engine.p50Db, p95Db: engine.p95Db, trials: 200_000, seed: 42 });
  });

  it('adds the yield, the inverse and the nearest E-series pairs when asked', async () => {
    const { status, stdout } = await cli(
      '--gain', '1', '--tolerance', '0.01', '--trials', '10000', '--limit-db', '40', '--target-db', '33.98', '--series', 'e24', '--pairs', '3', '--json',
    );
    expect(status).toBe(0);
    const document = JSON.parse(stdout) as ToleranceDocument;
    expect(document.monteCarlo.yieldFraction).toBeGreaterThan(0);
    expect(document.monteCarlo.yieldFraction).toBeLessThan(1);
    // DOMAIN.md: G = 1 at 33.98 dB needs ε = 1 % (approximation), read backwards.
    expect(document.inverse?.approximationToleranceFraction).toBeCloseTo(0.01, 5);
    expect(document.series).toBe('E24');
    expect(document.pairs).toHaveLength(3);
    expect(document.pairs?.[0]).toMatchObject({ r1Ohms: 1000, r2Ohms: 1000, gain: 1 });
  });

  it('prints a readable table with normal-distribution wording without --json', async () => {
    const { status, stdout } = await cli('--gain', '10', '--tolerance', '0.001', '--trials', '5000', '--distribution', 'normal');
    expect(status).toBe(0);
    expect(stdout).toMatch(/worst case \(16 corners\)\s+68\.79 dB/);
    expect(stdout).toMatch(/Monte Carlo median\s+\d+\.\d\d dB/);
    expect(stdout).toMatch(/5000 trials, seed 1, normal, σ = 0\.03333 %/);
  });

  it('names the field for a tolerance outside (0, 0.5), a bad trial count, distribution, seed or series', async () => {
    const cases: [string[], RegExp][] = [
      [['--gain', '10', '--tolerance', '0.5'], /field "tolerance": .*between 0 and 0\.5/],
      [['--gain', '10', '--tolerance', '0'], /field "tolerance"/],
      [['--gain', '10', '--tolerance', 'abc'], /field "tolerance"/],
      [['--gain', '10', '--tolerance', '0.01', '--trials', '0'], /field "trials"/],
      [['--gain', '10', '--tolerance', '0.01', '--trials', '1000000000'], /field "trials": .*from 1 to 10000000/],
      [['--gain', '10', '--tolerance', '0.01', '--trials', '2.5'], /field "trials"/],
      [['--gain', '10', '--tolerance', '0.01', '--distribution', 'triangular'], /field "distribution"/],
      [['--gain', '10', '--tolerance', '0.01', '--seed=-4'], /field "seed"/],
      [['--gain', '10', '--tolerance', '0.01', '--series', 'E12'], /field "series"/],
      [['--gain', '10', '--tolerance', '0.01', '--pairs', '3'], /field "pairs": .*needs --series/],
      [['--gain', '0', '--tolerance', '0.01'], /field "gain"/],
      [['--tolerance', '0.01'], /field "gain": .*required/],
    ];
    const runs = await Promise.all(cases.map(([args]) => cli(...(args.includes('--trials') ? args : [...args, '--trials', '10']))));
    runs.forEach((run, index) => {
      expect(run.status).toBe(1);
      expect(run.stdout).toBe('');
      expect(run.stderr).toMatch(cases[index][1]);
    });
  });
});
