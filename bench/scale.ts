/**
 * Full-size run: a 2 mm multiband run of 104 x 104 x 72 voxels and 600 volumes (1.87 GB as float32),
 * generated here into a temp folder (never committed) and opened from disk as a user's run would be.
 * Each measurement runs in a fresh child process, so its peak memory is its own:
 *   bench scale-look-seconds <s> s        the look (no figures) on the full-size run
 *   bench scale-cell-seconds <s> s        one sweep cell (planting, smoothing, AR(1) GLM, scoring), 1 worker
 *   bench scale-peak-gb <g> GB            peak resident memory (maxRSS) of a 2-worker sweep (2 cells at once)
 *   bench scale-peak-x-run <x> x          the same peak / the run's float32 size
 *   bench scale-demo-cell-seconds <s> s   the same cell on the demo run (median of 3 plantings)
 *   ratio scale-cell-per-voxel-vs-demo <x>  (full-size cell s / its voxel-volumes) / (demo cell s / its
 *                                            voxel-volumes); goal at most 1.5 (the cell's cost grows with
 *                                            the data, not faster)
 * The machine's cores and memory are printed first, since the figures depend on them.
 * BOLDSWEEP_SCALE_DIMS=nx,ny,nz,nt runs the same at another size (to try the bench quickly).
 * Memory: the generating child holds the run and its bytes (about 2 x 1.9 GB); the sweep child about
 * 3 x the run plus Node's own memory. Run it alone on a shared machine.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { cpus, tmpdir, totalmem } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Dims4 } from '../src/core/volume.js';
import { runBytes } from '../src/core/volume.js';
import { writeNifti } from '../src/io/nifti-write.js';
import { openRun } from '../src/io/open-run.js';
import { lookAtRun } from '../src/look/look-at-run.js';
import type { SweepSpec } from '../src/sweep/spec.js';
import { buildMask } from '../src/sweep/mask-source.js';
import { runSweep } from '../src/sweep/runner.js';
import { shareVolume } from '../src/sweep/shared-volume.js';
import { median, noisyHeadRun, packageRoot } from './bench-kit.js';

const FULL_DIMS: Dims4 = [104, 104, 72, 600];
const SPACING_MM: [number, number, number] = [2, 2, 2];
/** Multiband runs sample fast; 600 volumes at 0.8 s is an 8-minute run. */
const TR_SEC = 0.8;
const DEMO_RUN = 'data-demo/sub-phantom01_task-flicker_bold.nii.gz';

interface CellOut { cellSeconds: number[]; maxRssBytes: number; runBytes: number; voxelVolumes: number; wallSeconds: number }

/** One smoothing setting on random block timing, so the same cell runs on any run (no events file needed). */
function cellSpec(repeats: number, workers: number): SweepSpec {
  return {
    version: 1,
    recipe: [{ step: 'drop-initial-volumes', params: { count: 3 } }, { step: 'smooth', params: { fwhmMm: 6, mode: 'reflect', withinMask: false } }],
    vary: { 'smooth.fwhmMm': [6] },
    plant: { shape: 'gaussian', sizesFwhmMm: [8], amplitudesPct: [1], count: 6, marginMm: null, separation: 2 },
    acquisition: { sliceTiming: 'sidecar' },
    repeats,
    threshold: { kind: 'fwe-rft', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 },
    model: { ar1: true, ar1SmoothFwhmMm: 15, highpassCutoffSec: 128, trialType: null, censorVolumes: [] },
    events: { kind: 'random-blocks', onSec: 20, offMinSec: 20, offMaxSec: 30, trialType: 'null-task' },
    seed: 11,
    workers,
  };
}

async function child(args: string[]): Promise<void> {
  const [what, path, ...rest] = args;
  if (what === 'make') {
    const dims = rest[0].split(',').map(Number) as Dims4;
    const run = noisyHeadRun({ dims, spacingMm: SPACING_MM, seed: 20261202, noiseSd: 20, trSec: TR_SEC });
    await writeNifti(path, run);
    return;
  }
  if (what === 'look') {
    const run = await openRun(path);
    const t0 = performance.now();
    const look = lookAtRun(run);
    const seconds = (performance.now() - t0) / 1000;
    process.stdout.write(`${JSON.stringify({ seconds, findings: look.findings.length })}\n`);
    return;
  }
  const [workers, repeats, cacheDir] = rest;
  const t0 = performance.now();
  let run = await openRun(path, { sharedMemory: true });
  run = { ...run, volume: shareVolume(run.volume) };
  const brainMask = await buildMask({ kind: 'otsu-mean' }, run.volume);
  const r = await runSweep(run, cellSpec(Number(repeats), Number(workers)), { cacheDir, brainMask, placementMask: brainMask });
  const [nx, ny, nz, nt] = run.volume.dims;
  const out: CellOut = {
    cellSeconds: r.scorecard.seconds, maxRssBytes: process.resourceUsage().maxRSS * 1024, runBytes: runBytes(run.volume.dims),
    voxelVolumes: nx * ny * nz * nt, wallSeconds: (performance.now() - t0) / 1000,
  };
  process.stdout.write(`${JSON.stringify(out)}\n`);
}

function inChild<T>(args: string[]): T {
  const text = execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--child', ...args], { encoding: 'utf8', maxBuffer: 1 << 20 });
  return JSON.parse(text.trim().split('\n').pop() ?? 'null') as T;
}

/**
 * Run the benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const dims = (process.env.BOLDSWEEP_SCALE_DIMS?.split(',').map(Number) ?? FULL_DIMS) as Dims4;
  const scratch = mkdtempSync(join(tmpdir(), 'boldsweep-bench-scale-'));
  try {
    console.log(`bench scale-machine-cores ${cpus().length} count`);
    console.log(`bench scale-machine-memory-gb ${(totalmem() / 2 ** 30).toFixed(1)} GiB`);
    console.log(`bench scale-run-dims ${dims.join('x')} voxels`);
    const path = join(scratch, 'sub-scale_task-blocks_bold.nii');
    execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--child', 'make', path, dims.join(',')], { stdio: 'inherit' });
    console.log(`bench scale-run-gb ${(runBytes(dims) / 1e9).toFixed(2)} GB`);
    const look = inChild<{ seconds: number }>(['look', path]);
    console.log(`bench scale-look-seconds ${look.seconds.toFixed(1)} s`);
    const demo = inChild<CellOut>(['cell', join(packageRoot(), DEMO_RUN), '1', '3', join(scratch, 'cache-demo')]);
    const demoCell = median(demo.cellSeconds);
    console.log(`bench scale-demo-cell-seconds ${demoCell.toFixed(2)} s`);
    const one = inChild<CellOut>(['cell', path, '1', '1', join(scratch, 'cache-one')]);
    console.log(`bench scale-cell-seconds ${one.cellSeconds[0].toFixed(1)} s`);
    const two = inChild<CellOut>(['cell', path, '2', '2', join(scratch, 'cache-two')]);
    console.log(`bench scale-peak-gb ${(two.maxRssBytes / 1e9).toFixed(2)} GB`);
    console.log(`bench scale-peak-x-run ${(two.maxRssBytes / two.runBytes).toFixed(2)} x`);
    console.log(`bench scale-sweep-2-workers-seconds ${two.wallSeconds.toFixed(1)} s`);
    const perVoxel = one.cellSeconds[0] / one.voxelVolumes / (demoCell / demo.voxelVolumes);
    console.log(`ratio scale-cell-per-voxel-vs-demo ${perVoxel.toFixed(2)}`);
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}

if (process.argv[2] === '--child') await child(process.argv.slice(3));
else if (process.argv[1] === fileURLToPath(import.meta.url)) await main();
