import { makeVolume, type Volume } from '../core/volume.js';

/**
 * The same run with its voxels on a SharedArrayBuffer, so worker threads read it without copies.
 * Returns the input unchanged when it already lives in shared memory. Drop your reference to the
 * original afterwards to keep one copy of the run in memory.
 * @param volume - the run
 * @returns a volume whose data is a view on a SharedArrayBuffer
 * @example let run = await openRun(path); run = { ...run, volume: shareVolume(run.volume) }
 */
export function shareVolume(volume: Volume): Volume {
  if (volume.data.buffer instanceof SharedArrayBuffer) return volume;
  const data = new Float32Array(new SharedArrayBuffer(volume.data.byteLength));
  data.set(volume.data);
  return makeVolume({ ...volume, spacingMm: [...volume.spacingMm], affine: new Float64Array(volume.affine), data });
}

/**
 * Copy bytes to shared memory (masks are small; sharing keeps every worker on one copy).
 * @param a - bytes
 * @returns a Uint8Array on a SharedArrayBuffer
 * @example const mask = sharedBytes(brainMask)
 */
export function sharedBytes(a: Uint8Array): Uint8Array {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const out = new Uint8Array(new SharedArrayBuffer(a.byteLength));
  out.set(a);
  return out;
}
