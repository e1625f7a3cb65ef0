import { describe, expect, it } from 'vitest';
import { drawCircuitTrials, monteCarloAtFrequency, TrialScratch } from '../../../shared/analysis';

import { BandRun } from '../../../src/workers/monte-carlo-runner';
import { differenceCircuit, instrumentationCircuit } from './fixtures';

// Reused arrays must change nothing but the allocations: every figure equals the run without a
// scratch, whatever ran on the scratch before (other circuits, trial counts, distributions, signs).
describe('TrialScratch', () => {
  it('hands back the same array for the same name and length, a new one for another length', () => {
    const scratch = new TrialScratch();
    const first = scratch.float64('values', 1000);
    expect(scratch.float64('values', 1000)).toBe(first);
    expect(scratch.float64('values', 999)).not.toBe(first);
    expect(scratch.float64('values', 999)).toHaveLength(999);
    expect(scratch.uint8('signs', 10)).toHaveLength(10);
    expect(scratch.bytes).toBe(999 * 8 + 10);
  });

  it('gives monteCarloAtFrequency the same answers as fresh arrays, run after run', () => {
    const scratch = new TrialScratch();
    const runs = [
      { circuit: instrumentationCircuit(0.001), frequencyHz: 1000, options: { trials: 20_000, seed: 3, limitDb: 80 } },
      { circuit: differenceCircuit(0.0005), frequencyHz: 10_000, options: { trials: 20_000, seed: 4, limitDb: 70 } },
      { circuit: instrumentationCircuit(0.0002), frequencyHz: 50, options: { trials: 5_000, seed: 5, distribution: 'normal' as const } },
      { circuit: differenceCircuit(0.001), frequencyHz: 100, options: { trials: 20_000, seed: 6, opAmpTermSign: -1 as const } },
      { circuit: instrumentationCircuit(0.001), frequencyHz: 1000, options: { trials: 20_000, seed: 3, limitDb: 80 } },
    ];
    for (const run of runs) {
      const fresh = monteCarloAtFrequency(run.circuit, run.frequencyHz, run.options);
      const reused = monteCarloAtFrequency(run.circuit, run.frequencyHz, { ...run.options, scratch });
      expect(reused).toEqual(fresh);
    }
  });

  it('draws the same trials into kept arrays as into new ones', () => {
    const scratch = new TrialScratch();
    const options = { trials: 1000, seed: 9, distribution: 'normal' as const, opAmpTermSign: 'random' as const };
    drawCircuitTrials(instrumentationCircuit(0.01), { ...options, seed: 1 }, scratch);
    const reused = drawCircuitTrials(instrumentationCircuit(0.001), options, scratch);
    const fresh = drawCircuitTrials(instrumentationCircuit(0.001), options);
    expect(Array.from(reused.gainResistorOhms!)).toEqual(Array.from(fresh.gainResistorOhms!));
    expect(Array.from(reused.r4Ohms)).toEqual(Array.from(fresh.r4Ohms));
    expect(Array.from(reused.signBits!)).toEqual(Array.from(fresh.signBits!));
  });

  it('gives the worker band the same points with and without a scratch', () => {
    const request = {
      type: 'run' as const,
      runId: 1,
      circuit: instrumentationCircuit(0.0005),
      frequencyHz: 1000,
      trials: 10_000,
      seed: 2,
      histogramBins: 40,
      limitDb: null,
      bandFrequenciesHz: [10, 100, 1000, 10_000],
      bandTrials: 4_000,
    };
    const scratch = new TrialScratch();
    const run = (band: BandRun) => {
      while (!band.done) band.step();
      return band.points;
    };
    run(new BandRun({ ...request, circuit: differenceCircuit(0.01) }, scratch));
    expect(run(new BandRun(request, scratch))).toEqual(run(new BandRun(request)));
  });
});
