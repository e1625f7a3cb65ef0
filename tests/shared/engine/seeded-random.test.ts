import { describe, expect, it } from 'vitest';
import { EngineInputError } from '../../../shared/engine/errors';
import { createSeededRandom, SeededRandom } from '../../../shared/engine/seeded-random';
import { hasNumpy, runPython } from '../../helpers/reference-tools';

/** Five standard errors of a mean of uniforms (σ = 1/√12) over 100,000 draws: fails about once in 1.7 million runs. */
const MEAN_TOLERANCE = (5 * Math.sqrt(1 / 12)) / Math.sqrt(100_000);

describe('createSeededRandom', () => {
  it('repeats its sequence for the same seed and changes it for another seed', () => {
    const first = createSeededRandom(42);
    const again = createSeededRandom(42);
    const other = createSeededRandom(43);
    const draw = (generator: SeededRandom) => Array.from({ length: 8 }, () => generator.nextUint32());
    const sequence = draw(first);
    expect(draw(again)).toEqual(sequence);
    expect(draw(other)).not.toEqual(sequence);
  });

  it('accepts 0 and the largest safe integer as seeds, and tells seeds apart above 2^32', () => {
    expect(createSeededRandom(0).nextUint32()).toBeGreaterThanOrEqual(0);
    expect(createSeededRandom(Number.MAX_SAFE_INTEGER).nextUint32()).toBeGreaterThanOrEqual(0);
    expect(createSeededRandom(2 ** 32 + 5).nextUint32()).not.toBe(createSeededRandom(5).nextUint32());
  });

  for (const seed of [-1, 1.5, Number.NaN, 2 ** 60]) {
    it(`rejects the seed ${seed} naming the field`, () => {
      expect(() => createSeededRandom(seed)).toThrowError(EngineInputError);
      expect(() => createSeededRandom(seed)).toThrowError(/field "seed"/);
    });
  }
});

describe('SeededRandom', () => {
  it.skipIf(!hasNumpy)('follows the xoshiro128** reference algorithm (Blackman and Vigna), transcribed into Python', () => {
    const generator = createSeededRandom(2024);
    const state = Array.from(generator.state, (word) => word >>> 0);
    const expected = runPython<number[]>(
      `
import json, sys
s = json.load(sys.stdin)
M = 0xFFFFFFFF
def rotl(x, k): return ((x << k) | (x >> (32 - k))) & M
out = []
for _ in range(12):
    result = (rotl((s[1] * 5) & M, 7) * 9) & M
    t = (s[1] << 9) & M
    s[2] ^= s[0]; s[3] ^= s[1]; s[1] ^= s[2]; s[0] ^= s[3]; s[2] ^= t
    s[3] = rotl(s[3], 11)
    out.append(result)
print(json.dumps(out))
`,
      state,
    );
    expect(Array.from({ length: 12 }, () => generator.nextUint32())).toEqual(expected);
  });

  it('fills a block with the same values as repeated single draws', () => {
    const single = createSeededRandom(9);
    const block = createSeededRandom(9);
    const values = new Uint32Array(1000);
    block.fillUint32(values);
    expect(Array.from(values)).toEqual(Array.from({ length: 1000 }, () => single.nextUint32()));
    expect(block.nextUint32()).toBe(single.nextUint32());
  });

  it('draws fractions in [0, 1) whose mean is 1/2 within five standard errors', () => {
    // Mean of a uniform variable on [0, 1) is 1/2 (common practice, no source).
    const generator = createSeededRandom(5);
    let sum = 0;
    let smallest = 1;
    let largest = 0;
    for (let index = 0; index < 100_000; index++) {
      const value = index % 2 === 0 ? generator.nextUnit() : generator.nextFloat64();
      sum += value;
      smallest = Math.min(smallest, value);
      largest = Math.max(largest, value);
    }
    expect(Math.abs(sum / 100_000 - 0.5)).toBeLessThan(MEAN_TOLERANCE);
    expect(smallest).toBeGreaterThanOrEqual(0);
    expect(largest).toBeLessThan(1);
  });

  it('refuses an all-zero or wrongly sized state', () => {
    expect(() => new SeededRandom(new Int32Array(4))).toThrowError(/all zero/);
    expect(() => new SeededRandom(new Int32Array(3))).toThrowError(/4 state words/);
  });
});
