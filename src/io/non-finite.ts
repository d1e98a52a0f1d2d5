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
  // IEEE 754 binary32: NaN and +-Infinity are exactly the values whose 8 exponent bits are all ones;
  // testing the bits as integers is faster than a float comparison
  const bits = new Int32Array(data.buffer, data.byteOffset, data.length);
  for (let i = 0; i < bits.length; i++) {
    if ((bits[i] & 0x7f800000) === 0x7f800000) {
      if (count === 0) firstIndex = i;
      count++;
      if (replaceWithZero) data[i] = 0;
    }
  }
  return { count, firstIndex };
}
