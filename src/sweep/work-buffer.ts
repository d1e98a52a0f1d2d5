import { isMainThread } from 'node:worker_threads';

let buffer: Float32Array | null = null;

/**
 * This thread's reusable run-sized array: a sweep worker rebuilds each cell's group stage in it and
 * the varied step (smoothing) writes its output over it, so a cell allocates no run-sized array of
 * its own besides the model's residuals. Reusing one array also spares the page faults of touching
 * fresh memory (about a tenth of a cell's time when each cell allocated its own). The same array is
 * returned while the length stays the same; another length replaces it. In the main thread it lives
 * in shared memory, so a step that starts its own worker threads writes into it in place.
 * @param length - values needed (nx*ny*nz*nt)
 * @returns the array, exactly `length` values long
 * @example const work = workBuffer(stage.volume.data.length)
 */
export function workBuffer(length: number): Float32Array {
  if (!buffer || buffer.length !== length) {
    buffer = null; // let the old one go before the new one is allocated
    buffer = isMainThread ? new Float32Array(new SharedArrayBuffer(length * 4)) : new Float32Array(length);
  }
  return buffer;
}

/**
 * Make an array this thread's work buffer (replacing the current one): a sweep worker hands over a
 * group's planted run once its patch is taken, so the planted run's memory becomes the work buffer
 * instead of sitting beside it. Nothing else may hold on to the array.
 * @param array - an array the caller owns and gives up
 * @returns nothing
 * @example adoptWorkBuffer(stage.volume.data)
 */
export function adoptWorkBuffer(array: Float32Array): void {
  buffer = array;
}

/**
 * This thread's work buffer as it is, without making one.
 * @returns the array, or null when none was made (or it was released)
 * @example const work = currentWorkBuffer()
 */
export function currentWorkBuffer(): Float32Array | null {
  return buffer;
}

/**
 * Drop this thread's work buffer (the main thread calls this when its sweep is done; a worker
 * thread's memory goes when the thread ends).
 * @returns nothing
 * @example releaseWorkBuffer()
 */
export function releaseWorkBuffer(): void {
  buffer = null;
}
