/**
 * Smoothing a whole run: smoothRun (6 mm FWHM, 3 mm voxels, workers = cores) against
 * scipy.ndimage.gaussian_filter applied volume by volume (bench/reference/smooth_scipy.py, Debian's
 * /usr/bin/python3 with scipy 1.10) on the same seeded 64 x 64 x 36 x 200 float32 run, same sigma,
 * truncate 4 and boundary mode. Ours: one warm-up call (starts the worker threads), then the median
 * of 5 timed calls; scipy: median of 3 passes over the run. Prints
 *   bench smooth-seconds <s> s, bench cores <n> count, ratio smooth-vs-scipy <ours / scipy>,
 *   bench smooth-max-abs-diff-vs-scipy <d> value  (scipy keeps float32 between passes; we keep Float64)
 * The headline call is the plain one (input in ordinary memory, copied once into shared memory;
 * new output). A second timing, smooth-shared-seconds, passes the run already in shared memory and a
 * reused output, as the scipy script does with its preallocated output array.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { makeVolume } from '../src/core/volume.js';
import { closeSharedWorkerPools } from '../src/core/worker-pool.js';
import { smoothRun } from '../src/filter/smooth-run.js';
import { noisyHeadRun, packageRoot, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const SPACING: [number, number, number] = [3, 3, 3];
const FWHM_MM = 6;
const MODE = 'reflect';

/**
 * Run the smoothing benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const cores = availableParallelism();
  // a smooth ellipsoidal "head" of intensity ~1000 plus Gaussian noise (sd 20)
  const run = noisyHeadRun({ dims: DIMS, spacingMm: SPACING, seed: 20240601, noiseSd: 20, trSec: 2 });
  let ours = run;
  // the warm-up call starts the threads and compiles the code; `ours` keeps the last timed result
  const oursSec = await timeMedianSec(async () => {
    ours = await smoothRun(run, { fwhmMm: FWHM_MM, mode: MODE, workers: cores });
  }, { repeats: 5, warmUp: 1 });
  const sharedRun = makeVolume({ ...run, data: new Float32Array(new SharedArrayBuffer(run.data.byteLength)) });
  sharedRun.data.set(run.data);
  const out = new Float32Array(new SharedArrayBuffer(run.data.byteLength));
  // the warm-up call is the first touch of `out`
  const sharedSec = await timeMedianSec(() => smoothRun(sharedRun, { fwhmMm: FWHM_MM, mode: MODE, workers: cores, out }), { repeats: 5, warmUp: 1 });

  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-bench-smooth-'));
  try {
    const rawIn = join(dir, 'run.f32');
    const rawOut = join(dir, 'smoothed.f32');
    writeFileSync(rawIn, new Uint8Array(run.data.buffer, run.data.byteOffset, run.data.byteLength));
    const script = join(packageRoot(), 'bench', 'reference', 'smooth_scipy.py');
    const stdout = execFileSync('/usr/bin/python3', [script, rawIn, ...DIMS.map(String), ...SPACING.map(String), String(FWHM_MM), MODE, rawOut], { encoding: 'utf8' });
    const m = /seconds ([0-9.eE+-]+)/.exec(stdout);
    if (!m) throw new Error(`smooth_scipy.py printed no timing: ${stdout}`);
    const scipySec = Number(m[1]);
    const ref = new Float32Array(readFileSync(rawOut).buffer.slice(0));
    let maxDiff = 0;
    for (let i = 0; i < ref.length; i++) maxDiff = Math.max(maxDiff, Math.abs(ref[i] - ours.data[i]));
    console.log(`bench smooth-seconds ${oursSec.toFixed(4)} s`);
    console.log(`bench cores ${cores} count`);
    console.log(`bench scipy-smooth-seconds ${scipySec.toFixed(4)} s`);
    console.log(`ratio smooth-vs-scipy ${(oursSec / scipySec).toFixed(3)}`);
    console.log(`bench smooth-shared-seconds ${sharedSec.toFixed(4)} s`);
    console.log(`ratio smooth-shared-vs-scipy ${(sharedSec / scipySec).toFixed(3)}`);
    console.log(`bench smooth-max-abs-diff-vs-scipy ${maxDiff.toExponential(2)} value`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
    await closeSharedWorkerPools();
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
