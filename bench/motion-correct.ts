/**
 * Motion correction of a whole run: the `motion-correct` step (rigid, least squares, levels 4, 2, 1,
 * trilinear resampling; estimateRunMotion and resampleRun on worker threads, workers = cores) on a
 * 64 x 64 x 36 x 200 float32 run of the digital phantom at 3 mm with its default head motion,
 * noise, physiology and distortion, made on the fly (not committed, not timed). The reference is
 * one scipy.ndimage.gaussian_filter pass over the same run (bench/reference/smooth_scipy.py with
 * Debian's /usr/bin/python3, FWHM 6 mm, mode reflect, volume by volume; median of 3 passes).
 * Ours: median of 3 calls after one warm-up call (worker start-up). Prints
 *   bench motion-correct-seconds <s> s, bench motion-correct-cpu-seconds <s> s (processor time of all
 *   threads per call: on a loaded machine the wall time is several times what the work needs),
 *   bench scipy-smooth-seconds <s> s,
 *   ratio motion-correct-vs-scipy-smooth <ours / scipy>,
 *   bench motion-correct-max-shift-error-mm <mm> mm and bench motion-correct-max-rotation-error-deg <deg> deg
 *   (the estimate against the phantom's own motion table relative to volume 0).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { rigidMotionAffine } from '../src/acquire/rigid-motion-affine.js';
import { gridCentreMm } from '../src/acquire/grid-centre-mm.js';
import { composeAffine, invertAffine } from '../src/core/affine.js';
import { closeSharedWorkerPools } from '../src/core/worker-pool.js';
import { affineMotionParameters } from '../src/register/affine-motion-parameters.js';
import { simulatePhantomRun } from '../src/simulate/simulate-phantom-run.js';
import { motionCorrectEstimate, motionCorrectStep, type MotionEstimate } from '../src/steps/motion-correct-step.js';
import { packageRoot, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number] = [64, 64, 36];
const SPACING: [number, number, number] = [3, 3, 3];
const VOLUMES = 200;

/**
 * Run the motion-correction benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const phantom = simulatePhantomRun({ dims: DIMS, spacingMm: SPACING, nVolumes: VOLUMES });
  const run = phantom.volume;
  const params = { model: 'rigid', cost: 'least-squares', reference: 'first', kernel: 'linear' } as const;
  const context = { sidecar: null, events: null, mask: null };
  const cpu0 = process.cpuUsage();
  const sec = await timeMedianSec(async () => { await motionCorrectStep(run, params, context); }, { repeats: 3, warmUp: 1 });
  // processor time of every thread of this process over the 4 calls, per call (what an idle machine would need)
  const cpuSec = (process.cpuUsage(cpu0).user + process.cpuUsage(cpu0).system) / 1e6 / 4;
  const dir = mkdtempSync(join(tmpdir(), 'boldsweep-bench-motion-'));
  let scipySec: number;
  try {
    const raw = join(dir, 'run.f32');
    writeFileSync(raw, new Uint8Array(run.data.buffer, run.data.byteOffset, run.data.byteLength));
    const script = join(packageRoot(), 'bench', 'reference', 'smooth_scipy.py');
    const stdout = execFileSync('/usr/bin/python3', [script, raw, ...DIMS.map(String), String(VOLUMES), ...SPACING.map(String), '6', 'reflect'], { encoding: 'utf8' });
    const m = /seconds ([0-9.eE+-]+)/.exec(stdout);
    if (!m) throw new Error(`smooth_scipy.py printed no timing: ${stdout}`);
    scipySec = Number(m[1]);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  // accuracy against the phantom's motion table (poses relative to volume 0, about the grid centre)
  const estimate: MotionEstimate = await motionCorrectEstimate(run, params, context);
  const c = gridCentreMm({ dims: DIMS, affine: run.affine });
  const table = phantom.truth.motionTable;
  const pose0 = invertAffine(rigidMotionAffine(table[0], c));
  let shiftErr = 0, rotErr = 0;
  for (let t = 0; t < VOLUMES; t++) {
    const truth = affineMotionParameters(composeAffine(rigidMotionAffine(table[t], c), pose0), c, 'rigid');
    for (let i = 0; i < 3; i++) shiftErr = Math.max(shiftErr, Math.abs(estimate.parameters[t][i] - truth[i]));
    for (let i = 3; i < 6; i++) rotErr = Math.max(rotErr, Math.abs(estimate.parameters[t][i] - truth[i]));
  }
  await closeSharedWorkerPools();
  console.log(`bench motion-correct-seconds ${sec.toFixed(3)} s`);
  console.log(`bench motion-correct-cpu-seconds ${cpuSec.toFixed(3)} s`);
  console.log(`bench scipy-smooth-seconds ${scipySec.toFixed(3)} s`);
  console.log(`ratio motion-correct-vs-scipy-smooth ${(sec / scipySec).toFixed(3)}`);
  console.log(`bench motion-correct-max-shift-error-mm ${shiftErr.toFixed(4)} mm`);
  console.log(`bench motion-correct-max-rotation-error-deg ${rotErr.toFixed(4)} deg`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
