/**
 * A child seed derived from a parent seed and labels, so independent parts of a job (repeat 3 of
 * setting 5, say) get independent streams without sharing state.
 * @param seed - parent seed
 * @param labels - any strings or numbers naming the child
 * @returns a uint32 seed
 * @example createRng(childSeed(spec.seed, 'plant', repeat))
 */
export function childSeed(seed: number, ...labels: Array<string | number>): number {
  // FNV-1a over the text; a hash, not a random generator: it only spreads labels over uint32
  let h = 0x811c9dc5;
  const text = [seed, ...labels].join('\u0000');
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}
