import { fail } from '../core/fail.js';
import { assertSameGrid, type Volume } from '../core/volume.js';
import { closeMask, openMask } from './binary-morphology.js';
import { fillHoles } from './fill-holes.js';
import { largestComponent } from './largest-component.js';
import { openByConditionalDilation } from './open-by-conditional-dilation.js';
import { otsuThreshold, type OtsuResult } from './otsu-threshold.js';

/** Result of {@link brainMaskFromMean}. */
export interface BrainMask {
  /** 0/1 per voxel, NIfTI order. */
  mask: Uint8Array;
  /** Voxels in the mask. */
  voxels: number;
  /** Intensity threshold applied to the mean image (Otsu), or NaN for a user mask. */
  threshold: number;
  /** The Otsu result behind the threshold (null for a user mask). */
  otsu: OtsuResult | null;
  /** Voxel count after each step, to show what each step did (eroded: after the ball erosion, when used). */
  steps: { thresholded: number; eroded?: number; opened: number; largestComponent: number; closed: number; holesFilled: number } | null;
  /** How the mask was made, in words with its sources (for figures, findings.json and methods text). */
  method: string;
  /** 'otsu' when made from the image, 'user' when supplied. */
  source: 'otsu' | 'user';
}

/** Radius of the ball that cuts the eyes, optic nerves and scalp bridges off the brain, mm (see {@link brainMaskFromMean}). */
export const MASK_BRIDGE_RADIUS_MM = 8;

/**
 * Brain mask from an EPI mean image. With `spacingMm` (what the look uses):
 * 1. threshold at Otsu's value (Otsu N 1979 IEEE Trans Syst Man Cybern 9:62-66);
 * 2. erosion with a ball of `bridgeRadiusMm` (default {@link MASK_BRIDGE_RADIUS_MM}: the optic nerves,
 *    about 4-5 mm thick, and thin scalp bridges vanish, the eyes shrink to small islands), the largest
 *    6-connected component, and dilation with the same ball only into thresholded voxels
 *    (Lemieux et al. 1999 Magn Reson Med 42:127-135; {@link openByConditionalDilation});
 * 3. closing with the 6-neighbour cross and 3D hole filling (ventricles, signal voids stay in).
 * Without `spacingMm` (the sweep's masks, unchanged so their scorecards keep their bytes):
 * 1. threshold at Otsu's value on the histogram of the finite mean intensities; at Otsu's value (Otsu N 1979 IEEE Trans Syst Man Cybern 9:62-66) on the histogram of
 *    the finite mean intensities;
 * 2. opening with the 6-neighbour cross (drops noise specks and thin bridges to the scalp or eyes);
 * 3. the largest 6-connected component;
 * 4. closing with the same cross (fills one-voxel notches) and 3D hole filling (dark ventricles or
 *    signal voids inside the brain stay in).
 * When opening leaves nothing (a very thin object) the thresholded mask goes on unopened.
 * @param mean - mean image values, length nx*ny*nz (NaN = not usable, never in the mask)
 * @param dims - [nx, ny, nz]
 * @param options - bins: histogram bins for Otsu (default 256); spacingMm: voxel size (turns on the
 *   ball erosion and conditional dilation); bridgeRadiusMm: its ball radius
 * @returns the mask and how each step changed it
 * @throws BoldsweepError CONSTANT_DATA when the mean image has a single value
 * @example const { mask, threshold } = brainMaskFromMean(maps.mean.data, [64, 64, 36])
 */
export function brainMaskFromMean(mean: ArrayLike<number>, dims: readonly [number, number, number] | readonly number[], options: { bins?: number; spacingMm?: readonly number[]; bridgeRadiusMm?: number } = {}): BrainMask {
  const otsu = otsuThreshold(mean, options.bins ?? 256);
  const n = mean.length;
  const raw = new Uint8Array(n);
  const thresholded = thresholdInto(mean, otsu.threshold, raw);
  if (options.spacingMm) {
    const radius = options.bridgeRadiusMm ?? MASK_BRIDGE_RADIUS_MM;
    const cut = openByConditionalDilation(raw, dims, options.spacingMm, radius);
    const closed = closeMask(cut.mask, dims);
    clearNonFinite(mean, closed);
    const filled = fillHoles(closed, dims);
    clearNonFinite(mean, filled);
    const voxels = count(filled);
    return {
      mask: filled, voxels, threshold: otsu.threshold, otsu,
      steps: { thresholded, eroded: cut.eroded, opened: cut.dilated, largestComponent: cut.largestComponent, closed: count(closed), holesFilled: voxels },
      source: 'otsu',
      method: `mean image thresholded at Otsu's value (${otsu.threshold.toPrecision(4)}; Otsu 1979), eroded with a ball of radius ${radius} mm, largest connected part kept and dilated back with the same ball inside the thresholded voxels (Lemieux et al. 1999), then closed and holes filled`,
    };
  }
  let opened = openMask(raw, dims);
  let openedCount = count(opened);
  if (openedCount === 0) { opened = raw; openedCount = thresholded; }
  const largest = largestComponent(opened, dims, 6);
  const closed = closeMask(largest, dims);
  // closing can grow into voxels whose mean is not finite; keep those out
  clearNonFinite(mean, closed);
  const filled = fillHoles(closed, dims);
  clearNonFinite(mean, filled);
  const voxels = count(filled);
  return {
    mask: filled,
    voxels,
    threshold: otsu.threshold,
    otsu,
    steps: { thresholded, opened: openedCount, largestComponent: count(largest), closed: count(closed), holesFilled: voxels },
    source: 'otsu',
    method: `mean image thresholded at Otsu's value (${otsu.threshold.toPrecision(4)}; Otsu 1979), opened with the 6-neighbour cross, largest connected part kept, closed and holes filled`,
  };
}

/**
 * Check and binarise a user-supplied mask against a run: same grid, one volume, at least one voxel.
 * @param mask - the mask image (nonzero = in)
 * @param run - the run it must match
 * @returns a {@link BrainMask} with source 'user'
 * @throws BoldsweepError GRID_MISMATCH when the grids differ; INVALID_ARGUMENT when it is 4D or empty
 * @example const userMask = checkUserMask(await readNifti('brain.nii.gz'), run.volume)
 */
export function checkUserMask(mask: Volume, run: Volume): BrainMask {
  assertSameGrid(mask, run, ['mask', 'run']);
  if (mask.dims[3] !== 1) fail('INVALID_ARGUMENT', `the mask must be one 3D volume, it has ${mask.dims[3]} volumes`);
  const out = new Uint8Array(mask.data.length);
  for (let v = 0; v < out.length; v++) out[v] = mask.data[v] !== 0 && Number.isFinite(mask.data[v]) ? 1 : 0;
  const voxels = count(out);
  if (voxels === 0) fail('INVALID_ARGUMENT', 'the mask has no nonzero voxels');
  return { mask: out, voxels, threshold: NaN, otsu: null, steps: null, source: 'user', method: 'supplied by the user' };
}

// The loops over all voxels live in small functions: V8 then optimises each once, instead of
// compiling brainMaskFromMean mid-loop and discarding it at the first call that follows, every call.

/** out[v] = 1 where values[v] > threshold (else 0); returns how many. */
function thresholdInto(values: ArrayLike<number>, threshold: number, out: Uint8Array): number {
  let c = 0;
  for (let v = 0; v < out.length; v++) {
    const inside = values[v] > threshold ? 1 : 0;
    out[v] = inside;
    c += inside;
  }
  return c;
}

/** mask[v] = 0 where values[v] is not finite. */
function clearNonFinite(values: ArrayLike<number>, mask: Uint8Array): void {
  for (let v = 0; v < mask.length; v++) if (!Number.isFinite(values[v])) mask[v] = 0;
}

function count(m: Uint8Array): number {
  let c = 0;
  for (let i = 0; i < m.length; i++) c += m[i];
  return c;
}
