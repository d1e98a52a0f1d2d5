import { isMainThread } from 'node:worker_threads';

let buffer: Float32Array | null = null;

interface WasmMemoryApi { Memory: new (descriptor: { initial: number; maximum: number }) => { readonly buffer: ArrayBuffer } }
const wasm = (globalThis as unknown as { WebAssembly: WasmMemoryApi }).WebAssembly;

/**
 * A zeroed Float32Array in memory of its own mapping (a WebAssembly memory of the size needed, never
 * grown), not from the C library's allocator: a worker thread's allocations otherwise come from its
 * malloc arena, which keeps its highest extent resident, so a long-lived buffer there holds the
 * arena's top up under every short-lived array allocated after it.
 */
function outsideMalloc(length: number): Float32Array {
  const pages = Math.max(1, Math.ceil((length * 4) / 65536));
  // a WebAssembly memory holds at most 4 GiB (65536 pages); a larger run's array comes from malloc
  if (pages > MAX_WASM_PAGES) return new Float32Array(length);
  return new Float32Array(new wasm.Memory({ initial: pages, maximum: pages }).buffer, 0, length);
}

/** Largest WebAssembly memory, in 64 KiB pages (4 GiB: 32-bit addresses). */
const MAX_WASM_PAGES = 65536;

/**
 * This thread's reusable run-sized array: a sweep worker rebuilds each cell's group stage in it and
 * the varied step (smoothing) writes its output over it, so a cell allocates no run-sized array of
 * its own besides the model's residuals. Reusing one array also spares the page faults of touching
 * fresh memory (about a tenth of a cell's time when each cell allocated its own). The same array is
 * returned while the length stays the same; another length replaces it. On the packed path it holds
 * the brain mask's voxels only (count x nt values). In the main thread it lives in shared memory, so
 * a step that starts its own worker threads writes into it in place; in a worker thread it is a
 * memory of its own, outside the C library's allocator (about 5-15 MB less at a demo sweep's peak).
 * @param length - values needed (nx*ny*nz*nt)
 * @returns the array, exactly `length` values long
 * @example const work = workBuffer(stage.volume.data.length)
 */
export function workBuffer(length: number): Float32Array {
  if (!buffer || buffer.length !== length) {
    buffer = null; // let the old one go before the new one is allocated
    buffer = isMainThread ? new Float32Array(new SharedArrayBuffer(length * 4)) : outsideMalloc(length);
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
