import { affineSpacing, applyAffine, composeAffine, identityAffine, type Affine } from '../core/affine.js';
import type { BoundaryMode } from '../core/boundary-mode.js';
import { fail } from '../core/fail.js';
import { makeVolume, type Volume } from '../core/volume.js';
import { childSeed, createRng } from '../core/random.js';
import { highFrequencyEnergy } from './high-frequency-energy.js';
import { imageFwhmMm } from './image-fwhm.js';
import { checkKernel, INTERPOLATION_KERNELS, type InterpolationKernel } from './interpolation-kernel.js';
import { resampleVolume } from './resample-volume.js';

/** Options of {@link repeatedResampling}. */
export interface RepeatedResamplingOptions {
  /** Total rotation in degrees. __Default value:__ 9 */
  totalDeg?: number;
  /** Number of equal steps of the chain. __Default value:__ 36 */
  steps?: number;
  /** World axis of the rotation (through the volume centre). __Default value:__ `'z'` */
  axis?: 'x' | 'y' | 'z';
  /** Kernels compared. __Default value:__ all (nearest, linear, cubic, lanczos3) */
  kernels?: readonly InterpolationKernel[];
  /** Boundary mode of every resampling. __Default value:__ `'nearest'` (the region stays away from the edges anyway) */
  mode?: BoundaryMode;
  /** Kernel of the one resampling that brings each result back to the original pose. __Default value:__ `'cubic'` */
  returnKernel?: InterpolationKernel;
  /** Seed of the white-noise image that measures the added smoothness. __Default value:__ 1 */
  noiseSeed?: number;
}

/** One kernel and route of {@link repeatedResampling}. */
export interface RepeatedResamplingRow {
  kernel: InterpolationKernel;
  /** `chain`: `steps` successive resamplings; `one-step`: one resampling through the total rotation. */
  route: 'chain' | 'one-step';
  /** Resamplings before the return: `steps` or 1. */
  resamplings: number;
  /** Pearson correlation with the original inside the region, after the return. */
  correlation: number;
  /** Image FWHM (mm) after the return, mean of the two in-plane axes (reads anatomy as well as blur). */
  fwhmMm: number;
  /**
   * Smoothness the route adds (mm, in-plane mean): the same route applied to a white-noise image on
   * the same grid, FWHM estimated after the return, less in quadrature the FWHM of the noise sent
   * forward and back in one step each with the return kernel (0 when not wider).
   */
  addedFwhmMm: number;
  /** Share of the original's energy above half Nyquist that is gone: 1 - E_hf(result) / E_hf(original). */
  highFrequencyLost: number;
}

/** Result of {@link repeatedResampling}. */
export interface RepeatedResamplingResult {
  rows: RepeatedResamplingRow[];
  /** The settings used. */
  totalDeg: number;
  steps: number;
  axis: 'x' | 'y' | 'z';
  mode: BoundaryMode;
  returnKernel: InterpolationKernel;
  /** Voxels in the comparison region. */
  regionVoxels: number;
  /** Image FWHM (mm, in-plane mean) of the original, and of the original sent forward and back in one step each with the return kernel (the reference for addedFwhmMm). */
  originalFwhmMm: number;
  referenceFwhmMm: number;
  /** Share of the original's spectral energy above half Nyquist. */
  originalHighFrequencyFraction: number;
  /** FWHM (mm, in-plane mean) of the white noise sent forward and back in one step each with the return kernel. */
  referenceNoiseFwhmMm: number;
}

/** Rotation by `deg` about a world axis through `centre`. */
function rotationAbout(axis: 'x' | 'y' | 'z', deg: number, centre: readonly number[]): Affine {
  const t = (deg * Math.PI) / 180, c = Math.cos(t), s = Math.sin(t);
  const r = identityAffine();
  const [a, b] = axis === 'x' ? [1, 2] : axis === 'y' ? [2, 0] : [0, 1];
  r[5 * a] = c; r[4 * a + b] = -s; r[4 * b + a] = s; r[5 * b] = c;
  const to = identityAffine(), back = identityAffine();
  for (let d = 0; d < 3; d++) { to[4 * d + 3] = -centre[d]; back[4 * d + 3] = centre[d]; }
  return composeAffine(back, composeAffine(r, to));
}

/**
 * The repeated-resampling study: rotate a 3D image by `totalDeg` in `steps` equal steps (each a
 * resampling onto the same grid) with each kernel, and in one step through the total rotation;
 * bring every result back to the original pose by one resampling through the inverse total
 * rotation with `returnKernel` (the same for every row, so differences between rows come from the
 * routes and kernels), then compare with the original inside the region that stays in the field of
 * view at every pose (a cylinder about the axis, 3 voxels inside the nearest edge):
 * - correlation with the original (Pearson);
 * - added smoothness: the same routes applied to a seeded white-noise image on the same grid; its
 *   FWHM (imageFwhmMm: derivative variance of the standardised image, Kiebel et al. 1999) after the
 *   return, less in quadrature (Gaussian widths add as squares) that of the noise sent forward and
 *   back in one step each with the return kernel. On the image itself the same estimate reads
 *   anatomy as well as blur, so it is reported (fwhmMm) but not used for this;
 * - high-frequency energy lost: share of the original's spectral energy above half Nyquist (a
 *   separable DFT, highFrequencyEnergy) that is missing from the result.
 * Rotations turn the image content by +angle: each resampling reads the source at the inverse
 * rotation of the target position.
 * @param image - a 3D image (nt = 1), e.g. a run's mean image (not modified)
 * @param options - totalDeg, steps, axis, kernels, mode, returnKernel
 * @returns one row per kernel and route, and the reference values
 * @throws BoldsweepError INVALID_ARGUMENT for a 4D input, steps < 1, a non-finite angle or a region too small; UNKNOWN_KERNEL
 * @example const study = repeatedResampling(meanVolume, { totalDeg: 9, steps: 36 })
 */
export function repeatedResampling(image: Volume, options: RepeatedResamplingOptions = {}): RepeatedResamplingResult {
  const totalDeg = options.totalDeg ?? 9;
  const steps = options.steps ?? 36;
  const axis = options.axis ?? 'z';
  const mode = options.mode ?? 'nearest';
  const kernels = (options.kernels ?? INTERPOLATION_KERNELS).map(checkKernel);
  const returnKernel = checkKernel(options.returnKernel ?? 'cubic');
  if (image.dims[3] !== 1) fail('INVALID_ARGUMENT', `repeatedResampling takes one 3D image, got ${image.dims[3]} volumes (pass e.g. the run's mean image)`);
  if (!Number.isInteger(steps) || steps < 1 || steps > 1000) fail('INVALID_ARGUMENT', `steps must be an integer from 1 to 1000, got ${steps}`);
  if (!Number.isFinite(totalDeg) || Math.abs(totalDeg) > 180) fail('INVALID_ARGUMENT', `totalDeg must be a finite angle within +-180 degrees, got ${totalDeg}`);
  const dims: [number, number, number] = [image.dims[0], image.dims[1], image.dims[2]];
  const centre = applyAffine(image.affine, [(dims[0] - 1) / 2, (dims[1] - 1) / 2, (dims[2] - 1) / 2]);
  const region = cylinderRegion(image, axis, centre);
  const regionVoxels = region.reduce((a, b) => a + b, 0);
  if (regionVoxels < 27) fail('INVALID_ARGUMENT', `the region that stays in the field of view has ${regionVoxels} voxels; use a larger image`);
  const spacing = affineSpacing(image.affine) as [number, number, number];
  const inPlane = axis === 'x' ? [1, 2] : axis === 'y' ? [0, 2] : [0, 1];
  const fwhmOf = (data: Float32Array | Float64Array) => {
    const f = imageFwhmMm(data, dims, spacing, region);
    return (f[inPlane[0]] + f[inPlane[1]]) / 2;
  };
  const original = image.data;
  const originalFwhmMm = fwhmOf(original);
  const hfOriginal = highFrequencyEnergy(original, dims, region).above;
  const resample = (v: Volume, kernel: InterpolationKernel, deg: number) => resampleVolume(v, { kernel, mode, transform: rotationAbout(axis, -deg, centre) });
  const back = (v: Volume) => resample(v, returnKernel, -totalDeg);
  const reference = back(resample(image, returnKernel, totalDeg));
  const referenceFwhmMm = fwhmOf(reference.data);
  // white noise on the same grid: its FWHM after a route is the blur of the route itself
  const rng = createRng(childSeed(options.noiseSeed ?? 1, 'repeated-resampling-noise'));
  const noise = makeVolume({ ...image, data: Float32Array.from({ length: image.data.length }, () => rng.normal()) });
  const referenceNoiseFwhmMm = fwhmOf(back(resample(noise, returnKernel, totalDeg)).data);
  const chain = (v: Volume, kernel: InterpolationKernel) => {
    for (let s = 0; s < steps; s++) v = resample(v, kernel, totalDeg / steps);
    return v;
  };

  const rows: RepeatedResamplingRow[] = [];
  const describe = (kernel: InterpolationKernel, route: 'chain' | 'one-step', result: Volume, noiseResult: Volume): RepeatedResamplingRow => {
    const returned = back(result).data;
    const noiseFwhmMm = fwhmOf(back(noiseResult).data);
    return {
      kernel, route, resamplings: route === 'chain' ? steps : 1,
      correlation: correlationIn(returned, original, region),
      fwhmMm: fwhmOf(returned),
      addedFwhmMm: Math.sqrt(Math.max(0, noiseFwhmMm * noiseFwhmMm - referenceNoiseFwhmMm * referenceNoiseFwhmMm)),
      highFrequencyLost: hfOriginal > 0 ? 1 - highFrequencyEnergy(returned, dims, region).above / hfOriginal : 0,
    };
  };
  for (const kernel of kernels) {
    rows.push(describe(kernel, 'chain', chain(image, kernel), chain(noise, kernel)));
    rows.push(describe(kernel, 'one-step', resample(image, kernel, totalDeg), resample(noise, kernel, totalDeg)));
  }
  return {
    rows, totalDeg, steps, axis, mode, returnKernel, regionVoxels, originalFwhmMm, referenceFwhmMm, referenceNoiseFwhmMm,
    originalHighFrequencyFraction: highFrequencyEnergy(original, dims, region).fraction,
  };
}

/** Voxels within a cylinder about the axis through the centre, 3 voxels inside the nearest edge. */
function cylinderRegion(image: Volume, axis: 'x' | 'y' | 'z', centre: readonly number[]): Uint8Array {
  const [nx, ny, nz] = image.dims;
  const spacing = affineSpacing(image.affine);
  const planeAxes = axis === 'x' ? [1, 2] : axis === 'y' ? [0, 2] : [0, 1];
  const radiusMm = Math.min(...planeAxes.map((d) => ((image.dims[d] - 1) / 2 - 3) * spacing[d]));
  const along = axis === 'x' ? 0 : axis === 'y' ? 1 : 2;
  const region = new Uint8Array(nx * ny * nz);
  for (let k = 0, p = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, p++) {
    const w = applyAffine(image.affine, [i, j, k]);
    let r2 = 0;
    for (let d = 0; d < 3; d++) if (d !== along) r2 += (w[d] - centre[d]) ** 2;
    region[p] = r2 <= radiusMm * radiusMm ? 1 : 0;
  }
  return region;
}

/** Pearson correlation of two images inside a region. */
function correlationIn(a: ArrayLike<number>, b: ArrayLike<number>, region: Uint8Array): number {
  let n = 0, sa = 0, sb = 0;
  for (let p = 0; p < region.length; p++) if (region[p]) { n++; sa += a[p]; sb += b[p]; }
  const ma = sa / n, mb = sb / n;
  let sab = 0, saa = 0, sbb = 0;
  for (let p = 0; p < region.length; p++) if (region[p]) { const x = a[p] - ma, y = b[p] - mb; sab += x * y; saa += x * x; sbb += y * y; }
  return sab / Math.sqrt(saa * sbb);
}
