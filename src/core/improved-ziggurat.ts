import { fdlibmExp } from './fdlibm-exp.js';
import { fdlibmLn } from './fdlibm-ln.js';

/*
 * Standard normal draws by the improved ziggurat method (Doornik 2005, "An Improved Ziggurat Method to
 * Generate Normal Random Samples", working paper, University of Oxford; the ziggurat itself: Marsaglia &
 * Tsang 2000, Journal of Statistical Software 5(8)), laid out exactly as @stdlib/random-base-improved-
 * ziggurat 0.2.2 does it (128 blocks, tail from 3.442619855899, block area 9.91256303526217e-3), so the
 * same uniforms give the same doubles as the @stdlib/random-base-normal streams boldsweep used before.
 */

const NUM_BLOCKS = 128;
const START_RIGHT_TAIL = 3.442619855899;
const BLOCK_AREA = 9.91256303526217e-3;

/** Block edges X[0..128] (X[0] = V / f(R) for the base block, X[1] = R, X[128] = 0) and ratios X[i+1]/X[i]. */
function zigguratTables(): { X: Float64Array; R: Float64Array } {
  const X = new Float64Array(NUM_BLOCKS + 1);
  let f = fdlibmExp(-0.5 * START_RIGHT_TAIL * START_RIGHT_TAIL);
  X[0] = BLOCK_AREA / f;
  X[1] = START_RIGHT_TAIL;
  for (let i = 2; i < NUM_BLOCKS; i++) {
    X[i] = Math.sqrt(-2.0 * fdlibmLn(BLOCK_AREA / X[i - 1] + f));
    f = fdlibmExp(-0.5 * X[i] * X[i]);
  }
  X[NUM_BLOCKS] = 0;
  const R = new Float64Array(NUM_BLOCKS);
  for (let i = 0; i < NUM_BLOCKS; i++) R[i] = X[i + 1] / X[i];
  return { X, R };
}

let tables: { X: Float64Array; R: Float64Array } | null = null;

/**
 * A standard normal sampler from a uniform stream (the sign and position) and a word stream (the block).
 * @param uniform - uniforms on [0, 1)
 * @param word - unsigned 32-bit words (only the low 7 bits are used)
 * @returns a function giving one standard normal draw per call
 * @example const g = mt19937(7); const z = improvedZiggurat(g.uniform, mt19937(9).word)()
 */
export function improvedZiggurat(uniform: () => number, word: () => number): () => number {
  const { X, R } = (tables ??= zigguratTables());
  const tail = (negative: boolean): number => {
    let x: number;
    let y: number;
    do {
      x = fdlibmLn(uniform()) / START_RIGHT_TAIL;
      y = fdlibmLn(uniform());
    } while (-2.0 * y < x * x);
    return negative ? x - START_RIGHT_TAIL : START_RIGHT_TAIL - x;
  };
  return () => {
    for (;;) {
      const u = 2.0 * uniform() - 1.0;
      const i = word() & 127;
      if (Math.abs(u) < R[i]) return u * X[i];
      if (i === 0) return tail(u < 0.0);
      const x = u * X[i];
      const x2 = x * x;
      const f0 = fdlibmExp(-0.5 * (X[i] * X[i] - x2));
      const f1 = fdlibmExp(-0.5 * (X[i + 1] * X[i + 1] - x2));
      if (f1 + uniform() * (f0 - f1) < 1.0) return x;
    }
  };
}
