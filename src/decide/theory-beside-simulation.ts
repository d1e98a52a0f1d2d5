import { predictDetection } from '../model/predict-detection.js';
import type { Scorecard } from '../sweep/scorecard.js';
import type { SweepSpec } from '../sweep/spec.js';
import { settingText } from '../sweep/settings-grid.js';
import type { MeanInterval } from './confidence.js';
import { summariseScorecard } from './summarise-scorecard.js';

/** The theory's prediction beside the simulation's result, for one setting and planted condition. */
export interface TheoryRow {
  settingIndex: number;
  label: string;
  kernelFwhmMm: number;
  plantSizeMm: number;
  plantAmplitudePct: number;
  /** Expected statistic at the planted centres by matched-filter theory. */
  predictedPeakT: number;
  /** Probability that a centre voxel reaches the setting's mean threshold, by the theory. */
  predictedDetection: number;
  /** The simulation's mean statistic at the planted centres across repeats, with its interval. */
  simulatedPeakT: MeanInterval;
  /** The simulation's fraction of planted blobs detected (any voxel), mean across repeats. */
  simulatedBlobHitRate: number;
  /** True when the prediction lies outside the simulated mean's 95 % interval. */
  disagrees: boolean;
}

/** The prediction for a whole sweep and the run's numbers it rests on. */
export interface TheoryBesideSimulation {
  /** Temporal SD of the unsmoothed noise, % of baseline, from the smallest kernel's tSNR. */
  noiseSdPct: number;
  /** Noise smoothness beyond white noise, FWHM mm, from the smallest kernel's residual smoothness. */
  noiseFwhmMm: number;
  designNorm: number;
  rows: TheoryRow[];
}

/**
 * Set the matched-filter prediction (predictDetection) beside the simulated statistic at the planted centres,
 * for a sweep of the Gaussian smoothing width with Gaussian blobs. The noise level and smoothness come from
 * the setting with the narrowest kernel (its tSNR, and its residual smoothness less the kernel and the
 * estimator's white-noise floor in quadrature), so the prediction for every other width is theory, not measurement.
 * @param card - the scorecard
 * @param spec - the sweep spec (plant shape, varied key)
 * @param designNorm - sqrt(p' M p) of the planted time course (the sweep result's designNorm)
 * @param spacingMm - voxel size of the run
 * @returns the rows, or null when the sweep does not vary 'smooth.fwhmMm' with Gaussian blobs or a number is missing
 * @example const theory = theoryBesideSimulation(card, spec, result.designNorm, run.spacingMm)
 */
export function theoryBesideSimulation(card: Scorecard, spec: SweepSpec, designNorm: number | null | undefined, spacingMm: readonly number[]): TheoryBesideSimulation | null {
  const key = 'smooth.fwhmMm';
  if (!card.varied.includes(key) || spec.plant.shape !== 'gaussian' || spec.plant.count === 0 || !(designNorm && designNorm > 0)) return null;
  const summaries = summariseScorecard(card);
  const widths = summaries.map((s) => Number(s.setting[key])).filter(Number.isFinite);
  if (!widths.length) return null;
  const k0 = Math.min(...widths);
  const base = summaries.filter((s) => Number(s.setting[key]) === k0);
  const tsnr = mean(base.map((s) => s.metrics.tsnrMedian?.mean ?? NaN));
  const fwhm0 = mean(base.map((s) => s.metrics.smoothnessFwhmMm?.mean ?? NaN));
  if (!(tsnr > 0) || !(fwhm0 > 0)) return null;
  // The residual smoothness estimate (finite differences) of white noise on a lattice of spacing d is not 0
  // but sqrt(2 ln 2) d = 1.177 d: first differences of white noise have twice its variance, so
  // lambda = 2 / d^2 and FWHM = sqrt(4 ln 2 / lambda) (Kiebel SJ et al. 1999, NeuroImage 10:756-766 for the
  // estimator). The smoothing beyond white noise is what is left after taking out that floor and the kernel.
  const voxel = Math.cbrt(spacingMm[0] * spacingMm[1] * spacingMm[2]);
  const floor = Math.sqrt(2 * Math.LN2) * voxel;
  const noiseFwhmMm = Math.sqrt(Math.max(0, fwhm0 * fwhm0 - k0 * k0 - floor * floor));
  // the tSNR at k0 is of noise already smoothed by k0: undo that with the same model
  const unit = predictDetection({ blobFwhmMm: 1, amplitudePct: 1, kernelFwhmMm: k0, noiseSdPct: 1, noiseFwhmMm, spacingMm, designNorm, threshold: NaN });
  const noiseSdPct = 100 / tsnr / unit.noiseSdPct;
  const rows: TheoryRow[] = [];
  for (const s of summaries) {
    const k = Number(s.setting[key]);
    const sim = s.metrics.centreStatisticMean;
    if (!Number.isFinite(k) || !sim) continue;
    const p = predictDetection({ blobFwhmMm: s.plantSizeMm, amplitudePct: s.plantAmplitudePct, kernelFwhmMm: k, noiseSdPct, noiseFwhmMm, spacingMm, designNorm, threshold: s.metrics.threshold?.mean ?? NaN });
    const outside = Number.isFinite(sim.low) && Number.isFinite(sim.high) && (p.expectedPeakT < sim.low || p.expectedPeakT > sim.high);
    rows.push({
      settingIndex: s.settingIndex, label: settingText(s.setting), kernelFwhmMm: k, plantSizeMm: s.plantSizeMm, plantAmplitudePct: s.plantAmplitudePct,
      predictedPeakT: p.expectedPeakT, predictedDetection: p.detectionProbability, simulatedPeakT: sim,
      simulatedBlobHitRate: s.metrics.blobHitRate?.mean ?? NaN, disagrees: outside,
    });
  }
  return { noiseSdPct, noiseFwhmMm, designNorm, rows };
}

function mean(xs: number[]): number {
  const f = xs.filter(Number.isFinite);
  return f.length ? f.reduce((a, b) => a + b, 0) / f.length : NaN;
}
