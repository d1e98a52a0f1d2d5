/**
 * A 32-bit Mersenne Twister (MT19937; Matsumoto & Nishimura 1998, ACM Transactions on Modeling and
 * Computer Simulation 8:3-30), seeded the way the authors' reference code `init_genrand` seeds it, with
 * `res53` uniforms (two words, 27 + 26 bits, to a double on [0, 1)). The words and uniforms are the
 * ones @stdlib/random-base-mt19937 0.2.3 gives for the same integer seed, which boldsweep used before
 * (test/core/random-streams.test.ts checks both against that package and the words against numpy).
 */
export interface Mt19937 {
  /** Next tempered 32-bit word, as an unsigned integer. */
  word(): number;
  /** Next uniform on [0, 1) with 53 random bits (two words). */
  uniform(): number;
}

const N = 624;
const M = 397;
const UPPER_MASK = 0x80000000;
const LOWER_MASK = 0x7fffffff;
const MATRIX_A = 0x9908b0df;
const TWO_26 = 67108864;
const TWO_53_INV = 1 / 9007199254740992;

/**
 * Create a generator from an integer seed.
 * @param seed - integer in [1, 2^32) (0 is refused, as @stdlib refuses it, so every stream this
 *   project ever made stays the same)
 * @returns the generator
 * @throws RangeError for a seed outside [1, 2^32)
 * @example const g = mt19937(5489); g.word() // 3499211612, the reference code's first output
 */
export function mt19937(seed: number): Mt19937 {
  if (!Number.isInteger(seed) || seed < 1 || seed >= 2 ** 32) throw new RangeError(`MT19937 seed must be an integer in [1, 2^32), got ${seed}`);
  const mt = new Uint32Array(N);
  mt[0] = seed >>> 0;
  for (let i = 1; i < N; i++) {
    const s = mt[i - 1] ^ (mt[i - 1] >>> 30);
    mt[i] = (Math.imul(s, 1812433253) + i) >>> 0;
  }
  let index = N;
  const twist = (): void => {
    let i = 0;
    for (; i < N - M; i++) {
      const y = (mt[i] & UPPER_MASK) | (mt[i + 1] & LOWER_MASK);
      mt[i] = mt[i + M] ^ (y >>> 1) ^ (y & 1 ? MATRIX_A : 0);
    }
    for (; i < N - 1; i++) {
      const y = (mt[i] & UPPER_MASK) | (mt[i + 1] & LOWER_MASK);
      mt[i] = mt[i + M - N] ^ (y >>> 1) ^ (y & 1 ? MATRIX_A : 0);
    }
    const y = (mt[N - 1] & UPPER_MASK) | (mt[0] & LOWER_MASK);
    mt[N - 1] = mt[M - 1] ^ (y >>> 1) ^ (y & 1 ? MATRIX_A : 0);
    index = 0;
  };
  const word = (): number => {
    if (index >= N) twist();
    let y = mt[index++];
    y ^= y >>> 11;
    y ^= (y << 7) & 0x9d2c5680;
    y ^= (y << 15) & 0xefc60000;
    y ^= y >>> 18;
    return y >>> 0;
  };
  return {
    word,
    uniform: () => {
      const a = word() >>> 5;
      const b = word() >>> 6;
      return (a * TWO_26 + b) * TWO_53_INV;
    },
  };
}
