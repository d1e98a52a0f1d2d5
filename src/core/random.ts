import mt19937 from '@stdlib/random-base-mt19937';
import normalDist from '@stdlib/random-base-normal';

/**
 * A seeded random stream (MT19937 from stdlib-js): the only source of randomness in boldsweep, so
 * the same seed gives byte-identical outputs.
 */
export interface Rng {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Normal with the given mean and standard deviation (default standard normal). */
  normal(mean?: number, sd?: number): number;
  /** Integer uniform on 0..n-1. */
  int(n: number): number;
  /** Fill an array with independent normal draws. */
  fillNormal(out: Float32Array | Float64Array, mean?: number, sd?: number): Float32Array | Float64Array;
  /** The seed this stream started from. */
  readonly seed: number;
}

/**
 * Create a seeded random stream.
 * @param seed - a non-negative integer below 2^32
 * @returns the stream
 * @example const rng = createRng(42); rng.normal()
 */
export function createRng(seed: number): Rng {
  if (!Number.isInteger(seed) || seed < 0 || seed >= 2 ** 32) throw new RangeError(`seed must be an integer in [0, 2^32), got ${seed}`);
  // stdlib's MT19937 rejects seed 0; shift by one so every uint32 (but the last) is usable
  const gen = mt19937.factory({ seed: seed + 1 === 2 ** 32 ? seed : seed + 1 }) as unknown as { normalized: () => number };
  // `normalized` (uniform on [0,1)) exists at run time; stdlib's type file omits it
  const uniform = gen.normalized;
  const normal = normalDist.factory({ prng: uniform }) as (mu: number, sigma: number) => number;
  return {
    seed,
    uniform: () => uniform(),
    normal: (mean = 0, sd = 1) => normal(mean, sd),
    int: (n: number) => Math.floor(uniform() * n),
    fillNormal(out, mean = 0, sd = 1) {
      for (let i = 0; i < out.length; i++) out[i] = normal(mean, sd);
      return out;
    },
  };
}

// childSeed has its own file so code that only derives seeds (the sweep's planner on the main
// thread) does not load the random generators
export { childSeed } from './child-seed.js';
