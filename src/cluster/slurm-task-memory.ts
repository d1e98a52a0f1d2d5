import { fail } from '../core/fail.js';

/** What one sweep task's memory request is derived from. */
export interface TaskMemoryInput {
  /** Voxels of the run: nx * ny * nz * nt. */
  voxels4d: number;
  /** Voxels of one volume: nx * ny * nz (the model keeps a few maps of this size per worker). */
  voxels3d: number;
  /** Bytes per stored voxel in the file (2 for int16, 4 for float32). */
  fileBytesPerVoxel: number;
  /** Size of the file on disk (the compressed size for .nii.gz). */
  fileBytes: number;
  /** Whether the file is gzip-compressed (opening it then briefly holds the compressed and decompressed bytes). */
  compressed: boolean;
  /** Worker threads per task. */
  workers: number;
}

/** A task's memory request and the terms it is made of (MiB), so the job script can state them. */
export interface TaskMemory {
  /** What to request (`--mem`), MiB: the larger phase plus the margin, rounded up to 256 MiB. */
  requestMib: number;
  /** The run as 32-bit floats, MiB. */
  runMib: number;
  /** Peak while opening: for .nii.gz the compressed and decompressed bytes, the run (read straight into shared memory), plus the baseline. */
  openMib: number;
  /** Peak while sweeping: the run, one run-sized work array per worker, per-voxel maps, baseline. */
  sweepMib: number;
  /** The terms in words, one line each, for the script's comments. */
  lines: string[];
}

const MIB = 1024 * 1024;
/** Node's main thread with the engine loaded (measured RSS before opening a run: about 150 MiB; rounded up). */
export const MAIN_BASELINE_MIB = 200;
/** One worker thread's own heap and code (a V8 isolate with the engine loaded; rounded up from measurements). */
export const WORKER_BASELINE_MIB = 64;
/** Bytes per 3D voxel that a worker's model keeps (design fit maps, t/z maps, masks, rho groups; estimate from the map count). */
export const MODEL_BYTES_PER_VOXEL = 256;
/** Margin over the estimate: allocator slack and garbage not yet collected. */
export const MEMORY_MARGIN = 1.25;

/**
 * Memory to request for one task of a sweep job array (one shard): the larger of the opening peak
 * and the sweeping peak, times a margin. A sweep holds the run once (shared by its workers) and one
 * run-sized work array per worker (README, Memory).
 * @param m - the run's size and the task's worker count
 * @returns the request and its terms in MiB
 * @throws BoldsweepError INVALID_ARGUMENT for non-positive sizes or workers
 * @example taskMemory({ voxels4d: 104*104*72*600, voxels3d: 104*104*72, fileBytesPerVoxel: 4, fileBytes: 1.87e9, compressed: false, workers: 1 }).requestMib
 */
export function taskMemory(m: TaskMemoryInput): TaskMemory {
  if (!(m.voxels4d > 0 && m.voxels3d > 0 && m.fileBytesPerVoxel > 0 && m.fileBytes > 0)) fail('INVALID_ARGUMENT', 'the run size must be positive');
  if (!Number.isInteger(m.workers) || m.workers < 1) fail('INVALID_ARGUMENT', `workers must be a positive integer, got ${m.workers}`);
  const runMib = (m.voxels4d * 4) / MIB;
  const decompressedMib = m.compressed ? (m.voxels4d * m.fileBytesPerVoxel) / MIB : 0;
  const packedMib = m.compressed ? m.fileBytes / MIB : 0;
  const openMib = MAIN_BASELINE_MIB + packedMib + decompressedMib + runMib;
  const mapsMib = (m.workers * m.voxels3d * MODEL_BYTES_PER_VOXEL) / MIB;
  const sweepMib = MAIN_BASELINE_MIB + m.workers * WORKER_BASELINE_MIB + (1 + m.workers) * runMib + mapsMib;
  const requestMib = Math.ceil((Math.max(openMib, sweepMib) * MEMORY_MARGIN) / 256) * 256;
  const f = (x: number) => `${Math.ceil(x)} MiB`;
  const lines = [
    `run as float32: ${f(runMib)} (${m.voxels4d} voxel-volumes x 4 bytes)`,
    `sweeping: the run once (shared) + ${m.workers} run-sized work array(s), one per worker + per-voxel model maps ${f(mapsMib)} + Node ${MAIN_BASELINE_MIB} MiB + ${m.workers} x ${WORKER_BASELINE_MIB} MiB per worker = ${f(sweepMib)}`,
    m.compressed
      ? `opening (.nii.gz): compressed ${f(packedMib)} + decompressed ${f(decompressedMib)} + the run ${f(runMib)} + Node = ${f(openMib)}`
      : `opening: the run ${f(runMib)} + Node = ${f(openMib)}`,
    `request: the larger x ${MEMORY_MARGIN} margin, rounded up to 256 MiB = ${requestMib} MiB`,
  ];
  return { requestMib, runMib, openMib, sweepMib, lines };
}
