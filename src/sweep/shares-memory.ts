/**
 * Whether two arrays share any byte of memory.
 * @param a - first array
 * @param b - second array
 * @returns true when their byte ranges in one buffer overlap
 * @example sharesMemory(run.data, run.data.subarray(10)) // true
 */
export function sharesMemory(a: ArrayBufferView, b: ArrayBufferView): boolean {
  if (a.buffer !== b.buffer) return false;
  return a.byteOffset < b.byteOffset + b.byteLength && b.byteOffset < a.byteOffset + a.byteLength;
}
