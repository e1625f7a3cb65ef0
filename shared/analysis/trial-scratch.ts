// Typed arrays kept between Monte Carlo runs of one caller. A 100,000-trial run of an
// instrumentation amplifier needs about 7 MB of arrays; allocating them afresh every run costs
// more than the run itself (the pages are zeroed and faulted in, and the external memory they add
// brings on garbage collections: ~37 ms against ~1 ms reused, measured in Chromium's worker).
// A worker that answers run after run keeps one of these. Arrays handed out hold the previous
// run's values: callers overwrite every element they read.

/**
 * Named typed arrays, each reallocated only when asked for a different length. One run at a time:
 * two runs interleaved on one scratch would overwrite each other's arrays.
 *
 * @example const scratch = new TrialScratch(); scratch.float64('values', 100_000).length // → 100000
 */
export class TrialScratch {
  private readonly float64Arrays = new Map<string, Float64Array>();
  private readonly uint32Arrays = new Map<string, Uint32Array>();
  private readonly uint8Arrays = new Map<string, Uint8Array>();

  float64(name: string, length: number): Float64Array {
    return kept(this.float64Arrays, name, length, (size) => new Float64Array(size));
  }

  uint32(name: string, length: number): Uint32Array {
    return kept(this.uint32Arrays, name, length, (size) => new Uint32Array(size));
  }

  uint8(name: string, length: number): Uint8Array {
    return kept(this.uint8Arrays, name, length, (size) => new Uint8Array(size));
  }

  /** Bytes held, for tests and diagnostics. */
  get bytes(): number {
    let total = 0;
    for (const map of [this.float64Arrays, this.uint32Arrays, this.uint8Arrays]) for (const array of map.values()) total += array.byteLength;
    return total;
  }
}

function kept<T extends { length: number }>(map: Map<string, T>, name: string, length: number, make: (size: number) => T): T {
  const existing = map.get(name);
  if (existing && existing.length === length) return existing;
  const made = make(length);
  map.set(name, made);
  return made;
}

/** A new Float64Array, or the scratch's array of that name. */
export const float64Of = (scratch: TrialScratch | undefined, name: string, length: number): Float64Array =>
  scratch ? scratch.float64(name, length) : new Float64Array(length);
