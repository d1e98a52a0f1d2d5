/**
 * Slice-timing correction by Fourier shift (shiftSliceSeries, method 'fourier': per voxel series a
 * least-squares line removed, point-reflected tapered ends, a complex transform of 256 points holding
 * two series, the phase ramp, the inverse) of a seeded 64 x 64 x 36 x 200 float32 run with an
 * interleaved slice order at TR 2 s, against the floor: one FFT pass over the same data, i.e. every
 * voxel's series gathered in the same blocks, transformed forward and back with fft.js at the
 * smallest power of two holding it (256: realTransform, completeSpectrum, inverseTransform) and
 * written back. Same process, same data, median of 3 after one warm-up each. Prints
 *   bench slice-time-fourier-seconds <s> s, bench fft-pass-seconds <s> s,
 *   ratio slice-time-vs-fft <ours / floor>,
 *   bench slice-time-linear-seconds <s> s, bench slice-time-cubic-seconds <s> s (for information)
 * and the cost of the model-based alternative: fitGlmBySliceTime with one design per slice time (36
 * interleaved slice times, OLS) against fitGlm with one design on the same run, median of 3:
 *   ratio glm-by-slice-time-vs-glm <x>
 */
import { pathToFileURL } from 'node:url';
import FFT from 'fft.js';
import { interleavedSliceTiming } from '../src/acquire/interleaved-slice-timing.js';
import { shiftSliceSeries } from '../src/steps/shift-slice-series.js';
import { buildDesign } from '../src/model/design.js';
import { fitGlm } from '../src/model/glm-ols.js';
import { fitGlmBySliceTime } from '../src/model/fit-glm-by-slice-time.js';
import type { BoldEvent } from '../src/io/run-types.js';
import { noisyHeadRun, timeMedianSec } from './bench-kit.js';

const DIMS: [number, number, number, number] = [64, 64, 36, 200];
const TR_SEC = 2;
const BLOCK = 64;

/** The floor: forward and inverse FFT of every voxel's series (gathered in blocks of a slice, as the shift does). */
function fftPass(data: Float32Array, dims: readonly number[], out: Float32Array): void {
  const [nx, ny, nz, nt] = dims;
  const nxy = nx * ny;
  const nvox = nxy * nz;
  let m = 4;
  while (m < nt) m *= 2;
  const fft = new FFT(m);
  const real = new Float64Array(m);
  const spec = new Float64Array(2 * m);
  const back = new Float64Array(2 * m);
  const block = new Float64Array(BLOCK * nt);
  for (let v0 = 0; v0 < nvox; v0 += BLOCK) {
    const c = Math.min(BLOCK, nvox - v0);
    for (let t = 0; t < nt; t++) for (let j = 0; j < c; j++) block[j * nt + t] = data[t * nvox + v0 + j];
    for (let j = 0; j < c; j++) {
      for (let t = 0; t < nt; t++) real[t] = block[j * nt + t];
      fft.realTransform(spec, real);
      fft.completeSpectrum(spec);
      fft.inverseTransform(back, spec);
      for (let t = 0; t < nt; t++) block[j * nt + t] = back[2 * t];
    }
    for (let t = 0; t < nt; t++) for (let j = 0; j < c; j++) out[t * nvox + v0 + j] = block[j * nt + t];
  }
}

/**
 * Run the slice-time benchmark and print its lines.
 * @returns when done
 * @example await main()
 */
export async function main(): Promise<void> {
  const run = noisyHeadRun({ dims: DIMS, spacingMm: [3, 3, 3], seed: 20261203, noiseSd: 20, trSec: TR_SEC });
  const times = interleavedSliceTiming(DIMS[2], TR_SEC);
  const shifts = Float64Array.from(times, (t) => (TR_SEC / 2 - t) / TR_SEC);
  const out = new Float32Array(run.data.length);
  const fourierSec = await timeMedianSec(() => shiftSliceSeries(run.data, run.dims, shifts, 'fourier', out), { repeats: 3, warmUp: 1 });
  const floorSec = await timeMedianSec(() => fftPass(run.data, run.dims, out), { repeats: 3, warmUp: 1 });
  const linearSec = await timeMedianSec(() => shiftSliceSeries(run.data, run.dims, shifts, 'linear', out), { repeats: 3, warmUp: 1 });
  const cubicSec = await timeMedianSec(() => shiftSliceSeries(run.data, run.dims, shifts, 'cubic', out), { repeats: 3, warmUp: 1 });
  console.log(`bench slice-time-fourier-seconds ${fourierSec.toFixed(4)} s`);
  console.log(`bench fft-pass-seconds ${floorSec.toFixed(4)} s`);
  console.log(`ratio slice-time-vs-fft ${(fourierSec / floorSec).toFixed(3)}`);
  console.log(`bench slice-time-linear-seconds ${linearSec.toFixed(4)} s`);
  console.log(`bench slice-time-cubic-seconds ${cubicSec.toFixed(4)} s`);

  const events: BoldEvent[] = Array.from({ length: 40 }, (_, k) => ({ onsetSec: 4 + 9.5 * k, durationSec: 1, trialType: 'task', modulation: 1 }));
  const distinct = [...new Set(times)].sort((a, b) => a - b);
  const designs = distinct.map((t) => buildDesign(events, { nt: DIMS[3], trSec: TR_SEC, sampleTimeSec: t, drift: { kind: 'dct', cutoffSec: 128 } }));
  const ofSlice = times.map((t) => distinct.indexOf(t));
  const one = buildDesign(events, { nt: DIMS[3], trSec: TR_SEC, drift: { kind: 'dct', cutoffSec: 128 } });
  const perSliceSec = await timeMedianSec(() => fitGlmBySliceTime(run, designs, ofSlice), { repeats: 3, warmUp: 1 });
  const oneSec = await timeMedianSec(() => fitGlm(run, one), { repeats: 3, warmUp: 1 });
  console.log(`bench glm-by-slice-time-seconds ${perSliceSec.toFixed(4)} s`);
  console.log(`bench glm-one-design-seconds ${oneSec.toFixed(4)} s`);
  console.log(`ratio glm-by-slice-time-vs-glm ${(perSliceSec / oneSec).toFixed(3)}`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
