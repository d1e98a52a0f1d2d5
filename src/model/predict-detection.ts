import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import { fail } from '../core/fail.js';

/** What {@link predictDetection} needs: the blob, the kernel, the noise and the design. */
export interface DetectionTheoryInput {
  /** FWHM of the planted Gaussian blob, mm. */
  blobFwhmMm: number;
  /** Peak amplitude of the blob, % of the local baseline. */
  amplitudePct: number;
  /** FWHM of the Gaussian smoothing kernel, mm (0 = none). */
  kernelFwhmMm: number;
  /** Temporal SD of the unsmoothed noise at a voxel, % of the baseline (100 / tSNR). */
  noiseSdPct: number;
  /** Intrinsic smoothness of the unsmoothed noise, FWHM mm (0 = spatially white). */
  noiseFwhmMm: number;
  /** Voxel size, mm. */
  spacingMm: readonly number[];
  /** sqrt(p' M p) of the planted time course (peak 1) against the other regressors (residualNorm). */
  designNorm: number;
  /** Statistic threshold the detection is called at (NaN: no probability). */
  threshold: number;
}

/** The theory's prediction for one setting. */
export interface DetectionPrediction {
  /** Peak of the smoothed blob, % (amplitude x attenuation). */
  signalPct: number;
  /** SD of the smoothed noise at a voxel, %. */
  noiseSdPct: number;
  /** Expected statistic at the blob centre. */
  expectedPeakT: number;
  /** Probability that the centre voxel reaches the threshold (normal approximation). */
  detectionProbability: number;
}

const SIGMA_PER_FWHM = 1 / (2 * Math.sqrt(2 * Math.LN2));

/**
 * Expected statistic at the centre of a planted Gaussian blob after Gaussian smoothing, by matched-filter
 * theory for a Gaussian signal in Gaussian noise (Rosenfeld A & Kak AC 1982, Digital Picture Processing,
 * 2nd ed., Academic Press, vol. 2 ch. 9), per axis:
 * - the blob's peak falls by sigma_b / sqrt(sigma_b^2 + sigma_k^2) (two Gaussians convolve to one of summed variance),
 *   computed on the voxel lattice (the kernel's sampled weights times the blob at those offsets, blob centre on a
 *   voxel) so that kernels narrower than a voxel act as on the data;
 * - the noise is modelled as white noise on the voxel lattice convolved with a Gaussian of width sigma_n
 *   (0 = white); a sampled unit-sum Gaussian of width s keeps the sum of its squared weights of white noise's
 *   variance along an axis (d / (sqrt(4 pi) s) when s is a voxel or more), so smoothing takes the noise variance
 *   from that at sigma_n to that at sqrt(sigma_n^2 + sigma_k^2); for smooth noise about sigma_n / sqrt(sigma_n^2 + sigma_k^2) per axis;
 * - the statistic is the smoothed peak times sqrt(p' M p) over the smoothed noise SD.
 * With white noise the peak's signal-to-noise ratio is largest at sigma_k = sigma_b, where it equals the
 * matched filter's A / sigma (pi sigma_b^2)^(3/4) / sqrt(v) (v the voxel volume). The probability of detecting the centre is Phi(E[t] - u), the statistic
 * taken as normal with unit variance (many degrees of freedom).
 * @param input - blob, kernel, noise, design and threshold
 * @returns the signal, the noise, the expected peak statistic and the probability of detection
 * @throws BoldsweepError INVALID_ARGUMENT for non-positive blob size, noise SD or voxel size, or a negative width
 * @example predictDetection({ blobFwhmMm: 8, amplitudePct: 1, kernelFwhmMm: 8, noiseSdPct: 2, noiseFwhmMm: 0, spacingMm: [3, 3, 3], designNorm: 5, threshold: 5 })
 */
export function predictDetection(input: DetectionTheoryInput): DetectionPrediction {
  const { blobFwhmMm, amplitudePct, kernelFwhmMm, noiseSdPct, noiseFwhmMm, spacingMm, designNorm, threshold } = input;
  if (!(blobFwhmMm > 0) || !(noiseSdPct > 0) || !(kernelFwhmMm >= 0) || !(noiseFwhmMm >= 0) || !(designNorm >= 0)) {
    fail('INVALID_ARGUMENT', `predictDetection needs a positive blob size and noise SD and non-negative widths, got blob ${blobFwhmMm} mm, noise ${noiseSdPct} %, kernel ${kernelFwhmMm} mm, noise FWHM ${noiseFwhmMm} mm`);
  }
  if (spacingMm.length < 3 || spacingMm.slice(0, 3).some((s) => !(s > 0))) fail('INVALID_ARGUMENT', `spacingMm must hold three positive sizes, got [${spacingMm.join(', ')}]`);
  const sb2 = (blobFwhmMm * SIGMA_PER_FWHM) ** 2;
  const sk2 = (kernelFwhmMm * SIGMA_PER_FWHM) ** 2;
  const sn2 = (noiseFwhmMm * SIGMA_PER_FWHM) ** 2;
  let signal = amplitudePct, variance = 1;
  for (let a = 0; a < 3; a++) {
    const d = spacingMm[a];
    signal *= sampledPeak(d, sk2, sb2);
    variance *= sumOfSquares(d, sn2 + sk2) / sumOfSquares(d, sn2);
  }
  const noise = noiseSdPct * Math.sqrt(variance);
  const expectedPeakT = (signal * designNorm) / noise;
  const detectionProbability = Number.isFinite(threshold) ? normalCdf(expectedPeakT - threshold, 0, 1) : NaN;
  return { signalPct: signal, noiseSdPct: noise, expectedPeakT, detectionProbability };
}

/** Weights of a unit-sum Gaussian of variance s2 (mm^2) sampled at spacing d, offsets 0, +-d, ... (a delta when s2 = 0). */
function sampledGaussian(d: number, s2: number): { offsets: number[]; weights: number[] } {
  if (!(s2 > 0)) return { offsets: [0], weights: [1] };
  const reach = Math.ceil((6 * Math.sqrt(s2)) / d);
  const offsets: number[] = [], weights: number[] = [];
  let sum = 0;
  for (let i = -reach; i <= reach; i++) {
    const w = Math.exp(-((i * d) ** 2) / (2 * s2));
    offsets.push(i * d);
    weights.push(w);
    sum += w;
  }
  return { offsets, weights: weights.map((w) => w / sum) };
}

/** Sum of squared weights of the sampled unit-sum Gaussian: the fraction of white noise's variance it keeps along one axis. */
function sumOfSquares(d: number, s2: number): number {
  return sampledGaussian(d, s2).weights.reduce((a, w) => a + w * w, 0);
}

/** Peak of a Gaussian blob (variance sb2, centred on a voxel, peak 1) after the sampled kernel of variance sk2, along one axis. */
function sampledPeak(d: number, sk2: number, sb2: number): number {
  const { offsets, weights } = sampledGaussian(d, sk2);
  let peak = 0;
  for (let i = 0; i < offsets.length; i++) peak += weights[i] * Math.exp(-(offsets[i] ** 2) / (2 * sb2));
  return peak;
}
