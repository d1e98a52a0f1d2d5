import { improvedZiggurat } from './improved-ziggurat.js';
import { mt19937 } from './mt19937.js';

/**
 * A seeded random stream (MT19937, normals by the improved ziggurat): the only source of randomness
 * in boldsweep, so the same seed gives byte-identical outputs. The streams are the ones the
 * @stdlib/random-base-mt19937 and @stdlib/random-base-normal packages gave for the same seed, which
 * boldsweep used until December 2026 (own code since, so worker threads do not load about 400 small
 * modules; test/core/random-streams.test.ts holds the two to the same bits).
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
  // MT19937 as @stdlib seeded it, which rejects seed 0: shift by one so every uint32 (but the last) is usable
  const gen = mt19937(seed + 1 === 2 ** 32 ? seed : seed + 1);
  const uniform = gen.uniform;
  // @stdlib's normal sampler, given a uniform stream, seeded its own MT19937 (for the block choice)
  // from the stream's first uniform: 1 + floor((2^32 - 1) u)
  const blocks = mt19937(Math.floor(1.0 + 4294967295 * uniform()));
  const standard = improvedZiggurat(uniform, blocks.word);
  // as @stdlib's normal(mu, sigma): NaN for a NaN parameter or sigma <= 0
  const normal = (mu: number, sigma: number): number => (Number.isNaN(mu) || Number.isNaN(sigma) || sigma <= 0.0 ? NaN : mu + sigma * standard());
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
