/**
 * Unwarping a whole run along phase encode (the unwarp step's kernels: planUnwarp once, then
 * applyUnwarp over every volume, 1-D along each line, in the calling thread) against one trilinear
 * resampling of the same run (resampleRun, workers = cores, a small rigid transform, mode
 * 'constant') in the same process, on the seeded 64 x 64 x 36 x 200 float32 run of bench-kit. The
 * field: a smooth bump of 80 Hz over the front of the head plus a gradient of 20 Hz across it,
 * readout 30 ms (shifts up to 2.4 voxels). Median of 3 timed calls after one warm-up each. Prints
 *   bench unwarp-linear-seconds <s> s, bench unwarp-cubic-seconds <s> s,
 *   bench resample-linear-seconds <s> s, ratio unwarp-vs-resample <linear unwarp / linear resampling>,
 *   ratio unwarp-cubic-vs-resample <cubic unwarp / linear resampling>.
 */
import { availableParallelism } from 'node:os';
import { pathToFileURL } from 'node:url';
import { applyUnwarp } from '../src/acquire/apply-unwarp.js';
import { planUnwarp } from '../src/acquire/plan-unwarp.js';
import { shiftMapVoxels } from '../src/acquire/shift-map-voxels.js';
import { composeAffine, type Affine } from '../src/core/affine.js';
import { closeSharedWorkerPools } from '../src/core/worker-pool.js';
import { resampleRun } from '../src/resample/resample-run.js';
import { noisyHeadRun, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const SPACING: [number, number, number] = [3, 3, 3];

/** 1.5 deg about z through the grid centre and a sub-voxel shift (world mm). */
function smallRigid(): Affine {
  const c = DIMS.slice(0, 3).map((n, d) => ((n - 1) / 2) * SPACING[d]);
  const rz = (1.5 * Math.PI) / 180;
  const z = new Float64Array([Math.cos(rz), -Math.sin(rz), 0, 0, Math.sin(rz), Math.cos(rz), 0, 0, 0, 0, 1, 0, 0, 0, 0, 1]);
  const to = new Float64Array([1, 0, 0, -c[0], 0, 1, 0, -c[1], 0, 0, 1, -c[2], 0, 0, 0, 1]);
  const back = new Float64Array([1, 0, 0, c[0] + 0.4, 0, 1, 0, c[1] - 0.3, 0, 0, 1, c[2] + 0.2, 0, 0, 0, 1]);
  return composeAffine(back, composeAffine(z, to));
}

/**
 * Run the unwarping benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const run = noisyHeadRun({ dims: DIMS, spacingMm: SPACING, seed: 20261203, noiseSd: 20, trSec: 2 });
  const [nx, ny, nz] = DIMS;
  const field = new Float32Array(nx * ny * nz);
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const r2 = ((i - nx / 2) / 12) ** 2 + ((j - 0.8 * ny) / 8) ** 2 + ((k - nz / 3) / 6) ** 2;
    field[i + nx * (j + ny * k)] = 80 * Math.exp(-r2 / 2) + (20 * (j - ny / 2)) / ny;
  }
  const shift = shiftMapVoxels(field, { totalReadoutTimeSec: 0.03, sign: 1 });
  const out = new Float32Array(run.data.length);
  const times: Record<string, number> = {};
  for (const kernel of ['linear', 'cubic'] as const) {
    times[kernel] = await timeMedianSec(() => {
      applyUnwarp(run.data, planUnwarp(shift, [nx, ny, nz], 1, { kernel, jacobian: true }), out);
    }, { repeats: 3, warmUp: 1 });
  }
  const transform = smallRigid();
  const resampleSec = await timeMedianSec(async () => {
    await resampleRun(run, { kernel: 'linear', transform, mode: 'constant', workers: availableParallelism() });
  }, { repeats: 3, warmUp: 1 });
  await closeSharedWorkerPools();
  console.log(`bench unwarp-linear-seconds ${times.linear.toFixed(4)} s`);
  console.log(`bench unwarp-cubic-seconds ${times.cubic.toFixed(4)} s`);
  console.log(`bench resample-linear-seconds ${resampleSec.toFixed(4)} s`);
  console.log(`ratio unwarp-vs-resample ${(times.linear / resampleSec).toFixed(3)}`);
  console.log(`ratio unwarp-cubic-vs-resample ${(times.cubic / resampleSec).toFixed(3)}`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
