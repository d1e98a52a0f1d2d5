import { createHash } from 'node:crypto';

/**
 * JSON text with object keys sorted at every level, so two equal objects always give the same text
 * (and so the same cache key) whatever order their keys were written in.
 * @param x - any JSON-serialisable value (typed arrays are written as plain arrays)
 * @returns canonical JSON text
 * @example canonicalJson({ b: 1, a: [2, { d: 3, c: 4 }] }) // '{"a":[2,{"c":4,"d":3}],"b":1}'
 */
export function canonicalJson(x: unknown): string {
  if (x === null || typeof x !== 'object') {
    if (typeof x === 'number' && !Number.isFinite(x)) return JSON.stringify(String(x));
    return JSON.stringify(x) ?? 'null';
  }
  if (ArrayBuffer.isView(x)) return canonicalJson(Array.from(x as unknown as ArrayLike<number>));
  if (Array.isArray(x)) return `[${x.map(canonicalJson).join(',')}]`;
  const o = x as Record<string, unknown>;
  const keys = Object.keys(o).filter((k) => o[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`).join(',')}}`;
}

/**
 * SHA-256 (hex) of the canonical JSON of a value: the key of a cached stage.
 * @param x - the inputs and parameters that determine a stage's output
 * @returns 64 hex characters
 * @example stableHash({ stage: 'plant', runHash, seed: 7 })
 */
export function stableHash(x: unknown): string {
  return createHash('sha256').update(canonicalJson(x)).digest('hex');
}
