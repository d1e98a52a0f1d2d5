/** Where NaN/Inf values are in an array. */
export interface NonFiniteScan {
  /** How many values are NaN or +-Infinity. */
  count: number;
  /** Index of the first one, or -1. */
  firstIndex: number;
}

/**
 * Count NaN and infinite values, optionally replacing them with 0 in place.
 * @param data - values to scan
 * @param replaceWithZero - when true, each NaN/Inf is set to 0
 * @returns count and first index
 * @example scanNonFinite(volume.data, false).count
 */
export function scanNonFinite(data: Float32Array, replaceWithZero: boolean): NonFiniteScan {
  let count = 0;
  let firstIndex = -1;
  for (let i = 0; i < data.length; i++) {
    const v = data[i];
    // v - v is 0 for finite v and NaN for NaN or +-Infinity
    if (v - v !== 0) {
      if (count === 0) firstIndex = i;
      count++;
      if (replaceWithZero) data[i] = 0;
    }
  }
  return { count, firstIndex };
}
