/**
 * The digital phantom and its trilinear resampler.
 * 1. simulatePhantomRun on the demo spec cut to 60 volumes (44 x 52 x 34 voxels, all artefacts on,
 *    jerk moved to volume 30, one spike, one dropout):
 *    one warm-up call, then the median of 3. Reference in the same process: drawing the run's
 *    thermal noise alone (two normal draws per voxel and volume from the same seeded stream), the
 *    floor any Rician simulation of this size pays. Prints
 *      bench phantom-60-volumes-seconds <s> s, ratio phantom-vs-noise-draws <ours / floor>
 * 2. trilinearResample of one 64 x 64 x 36 volume through a rigid map (2 deg, sub-voxel shift)
 *    against scipy.ndimage.map_coordinates(order=1, mode='constant') (bench/reference/trilinear_scipy.py,
 *    Debian's /usr/bin/python3, scipy 1.10), same data and map; median of 5 each. Prints
 *      bench trilinear-volume-seconds <s> s, bench scipy-trilinear-volume-seconds <s> s,
 *      ratio trilinear-vs-scipy <ours / scipy>, bench trilinear-max-abs-diff-vs-scipy <d> value
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { invertAffine } from '../src/core/affine.js';
import { childSeed, createRng } from '../src/core/random.js';
import { trilinearResample } from '../src/resample/trilinear-resample.js';
import { demoPhantomSpec } from '../src/simulate/phantom-spec.js';
import { rigidMotionAffine } from '../src/acquire/rigid-motion-affine.js';
import { simulatePhantomRun } from '../src/simulate/simulate-phantom-run.js';
import { packageRoot, timeMedianSec } from './bench-kit.js';

/**
 * Run the phantom and trilinear benchmarks and print their lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  // 1. phantom
  const demo = demoPhantomSpec();
  const spec = {
    ...demo,
    nVolumes: 60,
    motion: { ...demo.motion!, jerk: { ...demo.motion!.jerk!, volume: 30 } },
    spikes: [{ volume: 37, amplitude: 2500 }],
    dropouts: [{ volume: 50, slice: 17, keptFraction: 0.15 }],
  };
  const [nx, ny, nz] = spec.dims;
  const phantom = await timeMedianSec(() => simulatePhantomRun(spec), { repeats: 3, warmUp: 1 });
  const floor = await timeMedianSec(() => {
    const rng = createRng(childSeed(spec.seed, 'thermal'));
    const buf = new Float32Array(nx * ny * nz);
    for (let t = 0; t < spec.nVolumes; t++) for (let v = 0; v < buf.length; v++) buf[v] = Math.hypot(rng.normal(), rng.normal());
  }, { repeats: 3, warmUp: 0 });
  console.log(`bench phantom-60-volumes-seconds ${phantom.toFixed(3)} s`);
  console.log(`ratio phantom-vs-noise-draws ${(phantom / floor).toFixed(2)}`);

  // 2. trilinear against scipy
  const dims: [number, number, number] = [64, 64, 36];
  const n = dims[0] * dims[1] * dims[2];
  const img = new Float32Array(n);
  createRng(9).fillNormal(img, 1000, 50);
  // output voxel -> source voxel: the inverse of a 2 deg, 0.4/0.3/0.2-voxel rigid move about the grid centre
  const move = rigidMotionAffine({ shiftXMm: 0.4, shiftYMm: -0.3, shiftZMm: 0.2, rotXDeg: 2, rotYDeg: -1, rotZDeg: 1.5 }, [31.5, 31.5, 17.5]);
  const map = invertAffine(move);
  const out = new Float32Array(n);
  const ours = await timeMedianSec(() => trilinearResample(img, dims, map, dims, out), { repeats: 5, warmUp: 1 });
  console.log(`bench trilinear-volume-seconds ${ours.toFixed(5)} s`);
  const tmp = mkdtempSync(join(tmpdir(), 'boldsweep-bench-trilinear-'));
  try {
    const rawIn = join(tmp, 'in.f32'), rawOut = join(tmp, 'out.f32');
    writeFileSync(rawIn, new Uint8Array(img.buffer));
    const script = join(packageRoot(), 'bench', 'reference', 'trilinear_scipy.py');
    const stdout = execFileSync('/usr/bin/python3', [script, rawIn, ...dims.map(String), ...Array.from(map, String), rawOut], { encoding: 'utf8' });
    const scipy = Number(stdout.trim());
    const ref = new Float32Array(new Uint8Array(readFileSync(rawOut)).buffer);
    let diff = 0;
    for (let i = 0; i < n; i++) diff = Math.max(diff, Math.abs(ref[i] - out[i]));
    console.log(`bench scipy-trilinear-volume-seconds ${scipy.toFixed(5)} s`);
    console.log(`ratio trilinear-vs-scipy ${(ours / scipy).toFixed(2)}`);
    console.log(`bench trilinear-max-abs-diff-vs-scipy ${diff.toExponential(2)} value`);
  } catch (e) {
    console.log(`bench scipy-trilinear-unavailable 1 flag (${(e as Error).message.split('\n')[0]})`);
  } finally {
    rmSync(tmp, { recursive: true, force: true });
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await main();
