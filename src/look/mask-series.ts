import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';

/** Per-volume traces inside a mask, from {@link maskSeries}. */
export interface MaskSeries {
  /** Mean signal in the mask per volume (signal units). */
  globalMean: Float64Array;
  /**
   * DVARS per volume: sqrt(mean over mask voxels of (I_t - I_{t-1})^2), signal units (Smyser et al.
   * 2010 Cereb Cortex 20:2852; Power et al. 2012 NeuroImage 59:2142). NaN for volume 0.
   */
  dvars: Float64Array;
  /** Mean signal of the mask voxels of slice z in volume t at [z * nt + t]; NaN for slices with too few mask voxels. */
  sliceMean: Float64Array;
  /** Mask voxels in each slice. */
  sliceVoxels: Int32Array;
  /** Slices with fewer mask voxels than this get NaN slice means. */
  minSliceVoxels: number;
}

/**
 * Global mean, DVARS and per-slice means of the voxels in a mask, one pass over the run in memory
 * order: the mask voxels are visited as contiguous runs, slice by slice, four volumes at a time with
 * the sums in registers (each value is read once; V8 neither unrolls nor reorders additions, so this
 * is done by hand).
 * @param run - the run (not modified)
 * @param mask - nonzero = in, length nx*ny*nz; voxels must be finite in every volume
 * @param options - minSliceVoxels (default 10): slices with fewer mask voxels are not summarised
 * @returns the per-volume traces
 * @throws BoldsweepError INVALID_ARGUMENT when the mask is empty or of the wrong length
 * @example const { globalMean, dvars } = maskSeries(run.volume, brain.mask)
 */
export function maskSeries(run: Volume, mask: ArrayLike<number>, options: { minSliceVoxels?: number } = {}): MaskSeries {
  const n = voxelsPerVolume(run);
  const [nx, ny, nz, nt] = run.dims;
  if (mask.length !== n) fail('INVALID_ARGUMENT', `mask length ${mask.length} does not match the run's ${nx}x${ny}x${nz} grid`);
  const minSliceVoxels = options.minSliceVoxels ?? 10;
  // maximal runs of consecutive mask voxels within each slice
  const sliceVoxels = new Int32Array(nz);
  const sliceFirstRun = new Int32Array(nz + 1);
  const found = maskRuns(mask, nx * ny, nz, sliceVoxels, sliceFirstRun);
  const m = sliceVoxels.reduce((a, b) => a + b, 0);
  if (m === 0) fail('INVALID_ARGUMENT', 'the mask is empty');
  const runStart = found.start, runEnd = found.end;
  const sliceSum = new Float64Array(nz * nt);
  const d2 = new Float64Array(nt);
  const data = run.data;
  // volume 0 (no DVARS), then four volumes per sweep
  sumFirstVolume(data, nt, sliceFirstRun, runStart, runEnd, sliceSum);
  let t = 1;
  for (; t + 4 <= nt; t += 4) sumFourVolumes(data, n, nt, t, sliceFirstRun, runStart, runEnd, sliceSum, d2);
  for (; t < nt; t++) sumOneVolume(data, n, nt, t, sliceFirstRun, runStart, runEnd, sliceSum, d2);
  const globalMean = new Float64Array(nt);
  const dvars = new Float64Array(nt);
  const sliceMean = new Float64Array(nz * nt);
  for (let t = 0; t < nt; t++) {
    let total = 0;
    for (let z = 0; z < nz; z++) {
      const s = sliceSum[z * nt + t];
      total += s;
      sliceMean[z * nt + t] = sliceVoxels[z] >= minSliceVoxels ? s / sliceVoxels[z] : NaN;
    }
    globalMean[t] = total / m;
    dvars[t] = t > 0 ? Math.sqrt(d2[t] / m) : NaN;
  }
  return { globalMean, dvars, sliceMean, sliceVoxels, minSliceVoxels };
}

/**
 * Slice sums and summed squared differences from the volume before, for volumes t..t+3 (t >= 1): each
 * value is loaded once and serves as the previous volume of the next; eight independent sums keep the
 * adder busy.
 */
function sumFourVolumes(data: Float32Array, n: number, nt: number, t: number, sliceFirstRun: Int32Array, runStart: Int32Array, runEnd: Int32Array, sliceSum: Float64Array, d2: Float64Array): void {
  const nz = sliceFirstRun.length - 1;
  const acc = new Float64Array(8);
  for (let z = 0; z < nz; z++) {
    sliceFourVolumes(data, t * n, n, sliceFirstRun[z], sliceFirstRun[z + 1], runStart, runEnd, acc);
    const o = z * nt + t;
    sliceSum[o] = acc[0]; sliceSum[o + 1] = acc[1]; sliceSum[o + 2] = acc[2]; sliceSum[o + 3] = acc[3];
  }
  d2[t] = acc[4]; d2[t + 1] = acc[5]; d2[t + 2] = acc[6]; d2[t + 3] = acc[7];
}

/**
 * One slice of sumFourVolumes (runs r0..r1-1): acc[0..3] = the slice's sums of volumes t..t+3,
 * acc[4..7] += their squared differences. A short function called per slice and group of volumes,
 * so V8 optimises it early and keeps it (long single calls were compiled mid-loop and then
 * deoptimised, over and over).
 */
function sliceFourVolumes(data: Float32Array, b0: number, n: number, r0: number, r1: number, runStart: Int32Array, runEnd: Int32Array, acc: Float64Array): void {
  const bp = b0 - n, b1 = b0 + n, b2 = b1 + n, b3 = b2 + n;
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, e0 = acc[4], e1 = acc[5], e2 = acc[6], e3 = acc[7];
  for (let r = r0; r < r1; r++) {
    for (let v = runStart[r], e = runEnd[r]; v < e; v++) {
      const yp = data[bp + v], y0 = data[b0 + v], y1 = data[b1 + v], y2 = data[b2 + v], y3 = data[b3 + v];
      s0 += y0; s1 += y1; s2 += y2; s3 += y3;
      const d0 = y0 - yp, d1 = y1 - y0, dd2 = y2 - y1, d3 = y3 - y2;
      e0 += d0 * d0; e1 += d1 * d1; e2 += dd2 * dd2; e3 += d3 * d3;
    }
  }
  acc[0] = s0; acc[1] = s1; acc[2] = s2; acc[3] = s3; acc[4] = e0; acc[5] = e1; acc[6] = e2; acc[7] = e3;
}

/** Slice sums of volume 0. */
function sumFirstVolume(data: Float32Array, nt: number, sliceFirstRun: Int32Array, runStart: Int32Array, runEnd: Int32Array, sliceSum: Float64Array): void {
  const nz = sliceFirstRun.length - 1;
  for (let z = 0; z < nz; z++) {
    let s = 0;
    for (let r = sliceFirstRun[z]; r < sliceFirstRun[z + 1]; r++) for (let v = runStart[r], e = runEnd[r]; v < e; v++) s += data[v];
    sliceSum[z * nt] = s;
  }
}

/** As sumFourVolumes for the single volume t (t >= 1). */
function sumOneVolume(data: Float32Array, n: number, nt: number, t: number, sliceFirstRun: Int32Array, runStart: Int32Array, runEnd: Int32Array, sliceSum: Float64Array, d2: Float64Array): void {
  const b0 = t * n, bp = b0 - n;
  const nz = sliceFirstRun.length - 1;
  let e0 = 0;
  for (let z = 0; z < nz; z++) {
    let s0 = 0;
    for (let r = sliceFirstRun[z], rEnd = sliceFirstRun[z + 1]; r < rEnd; r++) {
      for (let v = runStart[r], e = runEnd[r]; v < e; v++) {
        const y0 = data[b0 + v], d0 = y0 - data[bp + v];
        s0 += y0; e0 += d0 * d0;
      }
    }
    sliceSum[z * nt + t] = s0;
  }
  d2[t] = e0;
}

/**
 * Maximal runs of consecutive mask voxels within each slice: run r covers start[r]..end[r]-1, slice z
 * holds runs sliceFirstRun[z]..sliceFirstRun[z+1]-1 and sliceVoxels[z] mask voxels.
 */
function maskRuns(mask: ArrayLike<number>, nxy: number, nz: number, sliceVoxels: Int32Array, sliceFirstRun: Int32Array): { start: Int32Array; end: Int32Array } {
  let start = new Int32Array(1024), end = new Int32Array(1024);
  let runs = 0;
  for (let z = 0; z < nz; z++) {
    sliceFirstRun[z] = runs;
    const last = (z + 1) * nxy;
    for (let v = z * nxy; v < last;) {
      if (!mask[v]) { v++; continue; }
      const a = v;
      while (v < last && mask[v]) v++;
      if (runs === start.length) {
        const s2 = new Int32Array(2 * runs), e2 = new Int32Array(2 * runs);
        s2.set(start); e2.set(end); start = s2; end = e2;
      }
      start[runs] = a; end[runs] = v; runs++;
      sliceVoxels[z] += v - a;
    }
  }
  sliceFirstRun[nz] = runs;
  return { start: start.subarray(0, runs), end: end.subarray(0, runs) };
}
