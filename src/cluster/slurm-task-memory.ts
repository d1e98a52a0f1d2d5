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
  /** Whether the file is gzip-compressed (it is inflated in small pieces straight into the run, so this adds nothing of the run's size; stated in the lines). */
  compressed: boolean;
  /** Worker threads per task. */
  workers: number;
  /** A study (spec `study`): the further runs every task opens, and what each worker keeps per subject. */
  study?: StudyMemoryInput;
}

/** What a study adds to a task: its further runs (held once, shared) and each subject's effect map per setting. */
export interface StudyMemoryInput {
  /** Voxel-volumes (nx * ny * nz * nt) of each further run in `study.runs` (empty: subjects cycle through the sweep's own run). */
  otherRunsVoxels4d: number[];
  /** Voxels of one volume of the largest run (the subjects' effect maps have this size). */
  largestVoxels3d: number;
  /** Simulated subjects (`study.subjects`). */
  subjects: number;
  /** Most settings one task fits (cells per planting group): a worker keeps every subject's effect map for each. */
  settingsPerTask: number;
}

/** A task's memory request and the terms it is made of (MiB), so the job script can state them. */
export interface TaskMemory {
  /** What to request (`--mem`), MiB: the larger phase plus the margin, rounded up to 256 MiB. */
  requestMib: number;
  /** The run as 32-bit floats, MiB. */
  runMib: number;
  /** Peak while opening: the run(s), read straight into shared memory (a .nii.gz is inflated in 64 KiB pieces), plus the baseline. */
  openMib: number;
  /** Peak while sweeping: the run(s), one run-sized work array per worker (two for a study), per-voxel maps, a study's subject maps, baseline. */
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
 * run-sized work array per worker (README, Memory); a study also holds its further runs, a second
 * run-sized array per worker and each subject's effect map per setting (measured: the demo study
 * bench, 12 subjects x 24 settings on 2 workers, peaked at 469 MB, under this estimate's 759 MiB).
 * @param m - the run's size and the task's worker count
 * @returns the request and its terms in MiB
 * @throws BoldsweepError INVALID_ARGUMENT for non-positive sizes or workers
 * @example taskMemory({ voxels4d: 104*104*72*600, voxels3d: 104*104*72, fileBytesPerVoxel: 4, fileBytes: 1.87e9, compressed: false, workers: 1 }).requestMib
 */
export function taskMemory(m: TaskMemoryInput): TaskMemory {
  if (!(m.voxels4d > 0 && m.voxels3d > 0 && m.fileBytesPerVoxel > 0 && m.fileBytes > 0)) fail('INVALID_ARGUMENT', 'the run size must be positive');
  if (!Number.isInteger(m.workers) || m.workers < 1) fail('INVALID_ARGUMENT', `workers must be a positive integer, got ${m.workers}`);
  const study = m.study;
  if (study && !(study.subjects >= 1 && study.settingsPerTask >= 1 && study.largestVoxels3d > 0 && study.otherRunsVoxels4d.every((v) => v > 0))) fail('INVALID_ARGUMENT', 'a study needs positive subjects, settings and run sizes');
  const runMib = (m.voxels4d * 4) / MIB;
  const otherMib = study ? (study.otherRunsVoxels4d.reduce((a, b) => a + b, 0) * 4) / MIB : 0;
  const largestMib = (Math.max(m.voxels4d, ...(study?.otherRunsVoxels4d ?? [])) * 4) / MIB;
  // the reader inflates a .nii.gz piece by piece straight into the run, so opening holds the runs alone
  const openMib = MAIN_BASELINE_MIB + runMib + otherMib;
  const mapsMib = (m.workers * Math.max(m.voxels3d, study?.largestVoxels3d ?? 0) * MODEL_BYTES_PER_VOXEL) / MIB;
  // a study worker holds the subject's planted run beside its work array, and every subject's effect map (float32) per setting of its task
  const workArrays = study ? 2 : 1;
  const subjectMapsMib = study ? (m.workers * study.settingsPerTask * study.subjects * study.largestVoxels3d * 4) / MIB : 0;
  const sweepMib = MAIN_BASELINE_MIB + m.workers * WORKER_BASELINE_MIB + runMib + otherMib + m.workers * workArrays * largestMib + mapsMib + subjectMapsMib;
  const requestMib = Math.ceil((Math.max(openMib, sweepMib) * MEMORY_MARGIN) / 256) * 256;
  const f = (x: number) => `${Math.ceil(x)} MiB`;
  const runsWords = study && study.otherRunsVoxels4d.length ? `the run ${f(runMib)} and ${study.otherRunsVoxels4d.length} study run(s) ${f(otherMib)}, held once (shared)` : 'the run once (shared)';
  const lines = [
    `run as float32: ${f(runMib)} (${m.voxels4d} voxel-volumes x 4 bytes)`,
    study
      ? `sweeping: ${runsWords} + ${m.workers} x 2 run-sized arrays (work array and the subject's planted run), one pair per worker + per-voxel model maps ${f(mapsMib)} + subject effect maps ${f(subjectMapsMib)} (${study.subjects} subjects x ${study.settingsPerTask} settings per worker) + Node ${MAIN_BASELINE_MIB} MiB + ${m.workers} x ${WORKER_BASELINE_MIB} MiB per worker = ${f(sweepMib)}`
      : `sweeping: ${runsWords} + ${m.workers} run-sized work array(s), one per worker + per-voxel model maps ${f(mapsMib)} + Node ${MAIN_BASELINE_MIB} MiB + ${m.workers} x ${WORKER_BASELINE_MIB} MiB per worker = ${f(sweepMib)}`,
    `opening${m.compressed ? ' (.nii.gz, inflated in pieces straight into the run)' : ''}: ${study && study.otherRunsVoxels4d.length ? 'the runs' : 'the run'} ${f(runMib + otherMib)} + Node = ${f(openMib)}`,
    `request: the larger x ${MEMORY_MARGIN} margin, rounded up to 256 MiB = ${requestMib} MiB`,
  ];
  return { requestMib, runMib, openMib, sweepMib, lines };
}
