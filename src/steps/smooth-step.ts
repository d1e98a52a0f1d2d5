import { fail } from '../core/fail.js';
import type { Volume } from '../core/volume.js';
import { BOUNDARY_MODES, type BoundaryMode } from '../core/boundary-mode.js';
import { DEFAULT_TRUNCATE, fwhmToSigma, gaussianKernel1d, sigmaVoxels } from '../filter/gaussian-kernel.js';
import { requireMask } from './require-mask.js';
import { smoothRun } from '../filter/smooth-run.js';
import type { StepFunction } from './step-types.js';

/** Parameters of {@link smoothStep}. */
export interface SmoothStepParams {
  /** Kernel FWHM in mm; 0 = no smoothing. Allowed: 0 to {@link maxFwhmMm} of the run. */
  fwhmMm: number;
  /** Boundary mode (scipy.ndimage names). __Default value:__ `'reflect'`. */
  mode?: BoundaryMode;
  /**
   * Smooth inside the context's brain mask by normalised convolution (outside becomes 0).
   * __Default value:__ `false` (smooth the whole image).
   */
  withinMask?: boolean;
}

/** Widest kernel accepted, whatever the field of view: 50 mm (wider blurs past any brain structure). */
export const MAX_FWHM_MM = 50;

/**
 * Widest kernel accepted for a run: the smaller of {@link MAX_FWHM_MM} and ten times the largest
 * field-of-view extent (nx*dx, ny*dy, nz*dz): beyond that the "smoothing" is a flat average.
 * @param volume - the run
 * @returns the limit in mm
 * @example maxFwhmMm(run.volume) // 50 for a 192 mm field of view
 */
export function maxFwhmMm(volume: Pick<Volume, 'dims' | 'spacingMm'>): number {
  const fov = Math.max(volume.dims[0] * volume.spacingMm[0], volume.dims[1] * volume.spacingMm[1], volume.dims[2] * volume.spacingMm[2]);
  return Math.min(MAX_FWHM_MM, 10 * fov);
}

const MODE_TEXT: Record<BoundaryMode, string> = {
  reflect: 'the image mirrored about its edge (edge voxel repeated)',
  mirror: 'the image mirrored about its edge voxel',
  nearest: 'the edge voxel repeated',
  constant: 'zeros',
  wrap: 'the opposite edge (periodic)',
};

/**
 * Preprocessing step: 3D Gaussian smoothing of every volume (see smoothRun). With `withinMask`,
 * smoothing is restricted to the brain mask by normalised convolution (Knutsson & Westin 1993):
 * smooth(data*mask) / smooth(mask), so voxels near the mask edge keep their level. Runs in worker
 * threads from the main thread and in the calling thread when already inside a worker (smoothRun's
 * default). Writes into the array the context's `outputBuffer` gives, when there is one (in place
 * when that is the input's own data).
 * @param volume - the run (not modified, unless the context's outputBuffer gives its own data)
 * @param params - fwhmMm, mode, withinMask
 * @param context - needs `mask` when withinMask is true; outputBuffer optional
 * @returns the smoothed run and its step note
 * @throws BoldsweepError INVALID_ARGUMENT for a negative, non-finite or too large FWHM (> maxFwhmMm), an unknown
 *   mode, or withinMask without a mask; GRID_MISMATCH for a mask of another size
 * @example const { volume, note } = await smoothStep(run.volume, { fwhmMm: 6 }, context)
 */
export const smoothStep: StepFunction<SmoothStepParams> = async (volume, params, context) => {
  const { fwhmMm } = params;
  const mode = params.mode ?? 'reflect';
  const withinMask = params.withinMask ?? false;
  const limit = maxFwhmMm(volume);
  if (typeof fwhmMm !== 'number' || !Number.isFinite(fwhmMm) || fwhmMm < 0) fail('INVALID_ARGUMENT', `smooth: fwhmMm must be a finite number >= 0 mm, got ${String(fwhmMm)}`);
  if (fwhmMm > limit) fail('INVALID_ARGUMENT', `smooth: fwhmMm ${fwhmMm} mm exceeds the limit of ${limit} mm (the smaller of ${MAX_FWHM_MM} mm and 10x the field of view)`);
  if (!BOUNDARY_MODES.includes(mode)) fail('INVALID_ARGUMENT', `smooth: mode must be one of ${BOUNDARY_MODES.join(', ')}, got ${String(mode)}`);
  let mask: Uint8Array | undefined;
  if (withinMask) mask = requireMask(volume, context, 'smooth (withinMask)');
  const out = await smoothRun(volume, { fwhmMm, mode, mask, out: context.outputBuffer?.(volume.data.length) });

  const sv = sigmaVoxels(fwhmMm, volume.spacingMm);
  const taps = sv.map((s) => gaussianKernel1d(s).length);
  const maskVoxels = mask ? mask.reduce((a, b) => a + (b ? 1 : 0), 0) : 0;
  const where = withinMask ? ' inside the brain mask' : '';
  const summary = fwhmMm === 0 ? 'No smoothing (FWHM 0 mm)' : `Gaussian smoothing, FWHM ${fwhmMm} mm${where}`;
  const voxelText = sv.map((s) => s.toFixed(2)).join(' x ');
  const methodsText = fwhmMm === 0
    ? 'Images were not spatially smoothed.'
    : `Images were smoothed with a 3D Gaussian kernel of ${fwhmMm} mm FWHM (sigma ${fwhmToSigma(fwhmMm).toFixed(2)} mm, i.e. ${voxelText} voxels), ` +
      `truncated at ${DEFAULT_TRUNCATE} sigma, with ${MODE_TEXT[mode]} beyond the image edges` +
      (withinMask ? '; smoothing was restricted to the brain mask by normalised convolution (smoothed data divided by the smoothed mask), and voxels outside the mask were set to zero.' : '.');
  return {
    volume: out,
    note: {
      step: 'smooth',
      params: { fwhmMm, mode, withinMask },
      summary,
      diagnostics: { fwhmMm, sigmaMm: fwhmToSigma(fwhmMm), sigmaVoxels: sv, kernelTaps: taps, truncateSigma: DEFAULT_TRUNCATE, mode, withinMask, maskVoxels, fwhmLimitMm: limit },
      methodsText,
      // Knutsson & Westin, normalised convolution (from memory; cited only when the mask is used)
      citations: withinMask ? ['Knutsson H, Westin C-F (1993) Normalized and differential convolution. Proc IEEE CVPR, 515-523'] : [],
    },
  };
};
