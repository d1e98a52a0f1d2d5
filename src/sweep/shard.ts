import { fail } from '../core/fail.js';
import type { SweepPlan } from './plan.js';

/** Which part of a sweep this process runs: shard `index` (1-based) of `count`. */
export interface Shard {
  index: number;
  count: number;
}

/**
 * Parse "i/N" (1-based, as a cluster job array numbers its tasks).
 * @param text - e.g. "2/8"
 * @returns the shard
 * @throws BoldsweepError INVALID_ARGUMENT unless 1 <= i <= N
 * @example parseShard('2/8') // { index: 2, count: 8 }
 */
export function parseShard(text: string): Shard {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!m || !(count >= 1) || !(index >= 1) || index > count) fail('INVALID_ARGUMENT', `--shard must be "i/N" with 1 <= i <= N, got "${text}"`);
  return { index, count };
}

/**
 * The cells of one shard. Whole groups are dealt out round-robin, so a shard plants each of its
 * repeats once and no two shards compute the same group.
 * @param plan - the full plan
 * @param shard - which shard
 * @returns the cell indices of that shard, ascending
 * @example shardCells(plan, { index: 1, count: 4 })
 */
export function shardCells(plan: SweepPlan, shard: Shard): number[] {
  return plan.cells.filter((c) => c.group % shard.count === shard.index - 1).map((c) => c.index);
}
