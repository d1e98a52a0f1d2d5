/**
 * Byte encoders for hand-built WebAssembly modules (core spec 2.0, section 5 "Binary Format"):
 * LEB128 integers, names, vectors and sections. Shared by the generated SIMD kernels
 * (src/filter/conv-wasm.ts, src/look/voxel-sums-wasm.ts) so each kernel file holds only its code.
 */

/**
 * Unsigned LEB128 encoding of a non-negative integer below 2^32.
 * @param n - the integer
 * @returns its bytes
 * @example uleb(624485) // [0xe5, 0x8e, 0x26]
 */
export function uleb(n: number): number[] {
  const out: number[] = [];
  do {
    let b = n & 0x7f;
    n >>>= 7;
    if (n !== 0) b |= 0x80;
    out.push(b);
  } while (n !== 0);
  return out;
}

/**
 * Signed LEB128 encoding of a 32-bit integer.
 * @param n - the integer
 * @returns its bytes
 * @example sleb(-123456) // [0xc0, 0xbb, 0x78]
 */
export function sleb(n: number): number[] {
  const out: number[] = [];
  for (;;) {
    const b = n & 0x7f;
    n >>= 7;
    if ((n === 0 && (b & 0x40) === 0) || (n === -1 && (b & 0x40) !== 0)) { out.push(b); return out; }
    out.push(b | 0x80);
  }
}

/**
 * A vector: its length, then its items.
 * @param items - encoded items
 * @returns the bytes
 * @example vec([[0x7f], [0x7c]])
 */
export const vec = (items: number[][]): number[] => [...uleb(items.length), ...items.flat()];

/**
 * A section: id, byte length, body.
 * @param id - section id (1 type, 2 import, 3 function, 7 export, 10 code, ...)
 * @param body - encoded body
 * @returns the bytes
 * @example section(7, vec([...]))
 */
export const section = (id: number, body: number[]): number[] => [id, ...uleb(body.length), ...body];

/**
 * A name (ASCII): length, then bytes.
 * @param s - the name
 * @returns the bytes
 * @example wasmName('conv')
 */
export const wasmName = (s: string): number[] => [...uleb(s.length), ...Array.from(s, (c) => c.charCodeAt(0))];

/**
 * A SIMD instruction: the 0xfd prefix, the opcode as unsigned LEB128, then immediates.
 * @param op - SIMD opcode
 * @param imm - immediate bytes (memory alignment and offset, lane index)
 * @returns the bytes
 * @example simdOp(0x0b, 4, 0) // v128.store align=16 offset=0
 */
export const simdOp = (op: number, ...imm: number[]): number[] => [0xfd, ...uleb(op), ...imm];
