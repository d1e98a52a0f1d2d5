import { DEFAULT_AR1_SMOOTH_FWHM_MM } from '../model/glm-ar1.js';
import type { SweepSpec } from './spec.js';

/** Options of {@link defaultSmoothingSpec}. */
export interface DefaultSmoothingOptions {
  /** Initial volumes to drop before anything else (from a look); 0 leaves the step out. __Default value:__ 0 */
  dropInitialVolumes?: number;
  /** Volumes to censor in the model (from a look), 0-based in the run as opened. __Default value:__ [] */
  censorVolumes?: number[];
  /** Candidate smoothing widths, mm. __Default value:__ [0, 2, 4, 6, 8, 10, 12, 14] */
  fwhmsMm?: number[];
  /** Planted blob sizes (FWHM, mm). __Default value:__ [8] */
  sizesFwhmMm?: number[];
  /** Planted peak amplitude, percent signal change. __Default value:__ 1 */
  amplitudePct?: number;
  /** Blobs per planting. __Default value:__ 6 */
  count?: number;
  /** Centre margin inside the placement mask, mm; null: half the blob size. __Default value:__ null */
  marginMm?: number | null;
  /** Repeated plantings per setting. __Default value:__ 20 */
  repeats?: number;
  /** Seed. __Default value:__ 1 */
  seed?: number;
  /** Worker threads. __Default value:__ 2 */
  workers?: number;
}

/**
 * The default smoothing sweep: Gaussian smoothing FWHM over 0-14 mm in 2 mm steps, 20 plantings of six
 * 8 mm FWHM Gaussian activations at 1 % peak signal change, GLM with AR(1) (autocorrelation map
 * smoothed at 15 mm FWHM) and a 128 s cosine drift set, family-wise error 0.05 by random-field
 * theory. (A 1-2 % BOLD change at 3 T and a 128 s drift cutoff are common practice, no source.)
 * @param o - overrides
 * @returns a complete spec
 * @example const spec = defaultSmoothingSpec({ dropInitialVolumes: look.recommendation.dropInitialVolumes })
 */
export function defaultSmoothingSpec(o: DefaultSmoothingOptions = {}): SweepSpec {
  const drop = o.dropInitialVolumes ?? 0;
  const fwhms = o.fwhmsMm ?? [0, 2, 4, 6, 8, 10, 12, 14];
  return {
    version: 1,
    recipe: [
      ...(drop > 0 ? [{ step: 'drop-initial-volumes', params: { count: drop } }] : []),
      { step: 'smooth', params: { fwhmMm: fwhms[0], mode: 'reflect', withinMask: false } },
    ],
    vary: { 'smooth.fwhmMm': fwhms },
    plant: { shape: 'gaussian', sizesFwhmMm: o.sizesFwhmMm ?? [8], amplitudesPct: [o.amplitudePct ?? 1], count: o.count ?? 6, marginMm: o.marginMm ?? null, separation: 2 },
    acquisition: { sliceTiming: 'sidecar' },
    repeats: o.repeats ?? 20,
    threshold: { kind: 'fwe-rft', alpha: 0.05, q: 0.05, clusterFormingP: 0.001 },
    model: { ar1: true, ar1SmoothFwhmMm: DEFAULT_AR1_SMOOTH_FWHM_MM, highpassCutoffSec: 128, trialType: null, censorVolumes: o.censorVolumes ?? [] },
    events: { kind: 'run' },
    seed: o.seed ?? 1,
    workers: o.workers ?? 2,
  };
}
