/**
 * Resampling a whole run: resampleRun (workers = cores) with the trilinear and the cubic B-spline
 * kernel against scipy.ndimage.affine_transform with order 1 and 3 applied volume by volume
 * (bench/reference/resample_scipy.py, Debian's /usr/bin/python3 with scipy 1.10), on the same
 * seeded 64 x 64 x 36 x 200 float32 run, through the same small rigid transform (1.5 deg about z,
 * 1 deg about x, a sub-voxel shift), mode 'constant', cval 0, the cubic prefilter included on both
 * sides. Ours: one warm-up call (starts the worker threads), then the median of 3 timed calls;
 * scipy: median of 3 passes over the run. Prints
 *   bench resample-linear-seconds <s> s, bench scipy-resample-linear-seconds <s> s,
 *   ratio resample-linear-vs-scipy <ours / scipy>, bench resample-linear-max-abs-diff-vs-scipy <d> value,
 *   and the same four lines for cubic.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { composeAffine, invertAffine, type Affine } from '../src/core/affine.js';
import { closeSharedWorkerPools } from '../src/core/worker-pool.js';
import type { Volume } from '../src/core/volume.js';
import { resampleRun } from '../src/resample/resample-run.js';
import { noisyHeadRun, packageRoot, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const SPACING: [number, number, number] = [3, 3, 3];

/** A small rigid movement about the grid centre (world mm): 1.5 deg about z, 1 deg about x, shift (0.4, -0.3, 0.2) mm. */
function smallRigid(): Affine {
  const c = DIMS.slice(0, 3).map((n, d) => ((n - 1) / 2) * SPACING[d]);
  const rz = (1.5 * Math.PI) / 180, rx = (1 * Math.PI) / 180;
  const z = new Float64Array([Math.cos(rz), -Math.sin(rz), 0, 0, Math.sin(rz), Math.cos(rz), 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);
  const x = new Float64Array([1, 0, 0, 0, 0, Math.cos(rx), -Math.sin(rx), 0, 0, Math.sin(rx), Math.cos(rx), 0, 0, 0, 0, 1]);
  const to = new Float64Array([1, 0, 0, -c[0], 0, 1, 0, -c[1], 0, 0, 1, -c[2], 0, 0, 0, 1]);
  const back = new Float64Array([1, 0, 0, c[0] + 0.4, 0, 1, 0, c[1] - 0.3, 0, 0, 1, c[2] + 0.2, 0, 0, 0, 1]);
  return composeAffine(back, composeAffine(z, composeAffine(x, to)));
}

/**
 * Run the resampling benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const cores = availableParallelism();
  const run = noisyHeadRun({ dims: DIMS, spacingMm: SPACING, seed: 20261202, noiseSd: 20, trSec: 2 });
  const transform = smallRigid();
  // the voxel map scipy gets: output voxel -> source voxel
  const srcFromOut = composeAffine(invertAffine(run.affine), composeAffine(transform, run.affine));
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-bench-resample-'));
  try {
    const rawIn = join(dir, 'run.f32');
    writeFileSync(rawIn, new Uint8Array(run.data.buffer, run.data.byteOffset, run.data.byteLength));
    for (const [kernel, order] of [['linear', 1], ['cubic', 3]] as const) {
      let ours: Volume = run;
      const oursSec = await timeMedianSec(async () => {
        ours = await resampleRun(run, { kernel, transform, mode: 'constant', workers: cores });
      }, { repeats: 3, warmUp: 1 });
      const rawOut = join(dir, `out-${order}.f32`);
      const script = join(packageRoot(), 'bench', 'reference', 'resample_scipy.py');
      const stdout = execFileSync('/usr/bin/python3', [script, rawIn, ...DIMS.map(String), String(order), ...Array.from(srcFromOut, String), rawOut], { encoding: 'utf8', maxBuffer: 1 << 20 });
      const m = /seconds ([0-9.eE+-]+)/.exec(stdout);
      if (!m) throw new Error(`resample_scipy.py printed no timing: ${stdout}`);
      const scipySec = Number(m[1]);
      const ref = new Float32Array(readFileSync(rawOut).buffer.slice(0));
      let maxDiff = 0;
      for (let i = 0; i < ref.length; i++) maxDiff = Math.max(maxDiff, Math.abs(ref[i] - ours.data[i]));
      console.log(`bench resample-${kernel}-seconds ${oursSec.toFixed(4)} s`);
      console.log(`bench scipy-resample-${kernel}-seconds ${scipySec.toFixed(4)} s`);
      console.log(`ratio resample-${kernel}-vs-scipy ${(oursSec / scipySec).toFixed(3)}`);
      console.log(`bench resample-${kernel}-max-abs-diff-vs-scipy ${maxDiff.toExponential(2)} value`);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
    await closeSharedWorkerPools();
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
