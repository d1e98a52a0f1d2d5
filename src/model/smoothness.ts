import { fail } from '../core/fail.js';
import { fwhmFromDerivativeVariance, fwhmFromLag1 } from './smoothness-formulas.js';

/**
 * How residual roughness becomes a FWHM:
 * - `derivative-variance`: FWHM = sqrt(4 ln 2 / lambda) (Kiebel SJ et al. 1999, NeuroImage 10:756-766),
 *   lambda approximated by the variance of first differences; slightly overestimates FWHM on a lattice
 *   (a 4.7-voxel Gaussian reads 1.6 % wide) because 2(1 - rho(1)) < -2 ln rho(1).
 * - `lag1-autocorrelation`: FWHM = dx sqrt(-2 ln 2 / ln rho(1)), rho(1) = 1 - lambda/2 (Forman SD et al.
 *   1995, Magn Reson Med 33:636-647); exact on a lattice when the autocorrelation is Gaussian.
 */
export type SmoothnessMethod = 'derivative-variance' | 'lag1-autocorrelation';

/** Options of {@link estimateSmoothness}. */
export interface SmoothnessOptions {
  /**
   * Residual degrees of freedom nu (volumes minus the rank of the design). Sets the bias correction
   * (nu - 2)/(nu - 1). __Default value:__ the number of volumes (residuals of pure noise, nothing fitted).
   */
  dof?: number;
  /** Which FWHM formula fills `fwhmMm`. __Default value:__ `'derivative-variance'`. */
  method?: SmoothnessMethod;
  /**
   * The residuals hold the mask's voxels only, volume by volume (the j-th mask voxel, in storage
   * order, of volume t at t * count + j), as a GLM fit with `packed` keeps them.
   * __Default value:__ false (residuals on the whole grid)
   */
  packed?: boolean;
}

/** Result of {@link estimateSmoothness}. */
export interface SmoothnessEstimate {
  /** FWHM in mm along x, y, z by the chosen method. */
  fwhmMm: [number, number, number];
  method: SmoothnessMethod;
  /** FWHM in mm by the derivative-variance formula. */
  fwhmMmDerivative: [number, number, number];
  /** FWHM in mm by the lag-1 autocorrelation formula. */
  fwhmMmLag1: [number, number, number];
  /** lambda per axis: variance of first differences of the unit-variance residuals, per voxel step, bias-corrected. */
  derivativeVariance: [number, number, number];
  /** Estimated lag-1 autocorrelation per axis, 1 - lambda/2. */
  lag1: [number, number, number];
  /** Residual degrees of freedom used. */
  dof: number;
  /** Factor (nu - 2)/(nu - 1) applied to the raw difference variance. */
  dofCorrection: number;
  /** In-mask neighbour pairs used per axis. */
  pairs: [number, number, number];
  /** In-mask voxels with non-zero residuals (used). */
  voxelsUsed: number;
  /** In-mask voxels left out because their residuals are all zero. */
  constantVoxels: number;
}

/**
 * Estimate the smoothness (FWHM per axis, mm) of the noise from model residuals (Kiebel SJ et al.
 * 1999, NeuroImage 10(6):756-766).
 *
 * 1. Normalise each in-mask voxel's residual time series r to unit sum of squares, u = r / ||r||.
 * 2. For each axis j, take first differences between in-mask neighbours, du = u(x + e_j) - u(x), and pool
 *    lambda_j = mean over pairs of sum over time du^2 (the variance of the difference of
 *    unit-variance fields: 2 (1 - rho(1))).
 * 3. Multiply by (nu - 2)/(nu - 1). Normalising by the sample norm inflates the expected difference
 *    variance by (nu - 1)/(nu - 2) as rho(1) -> 1 (derivation: u-differences are angles between
 *    nu-dimensional Gaussian vectors, E 1/chi2_nu = 1/(nu - 2), and one of the nu directions is lost to
 *    the normalisation). The factor is from memory as the one in Kiebel et al.; at rho(1) = 0.94 it
 *    leaves a bias of -0.5 % in lambda at nu = 20 and -0.24 % at nu = 40 (exact finite-nu expectation
 *    in test/reference/make_smoothness_fixture.py).
 * 4. FWHM_j = sqrt(4 ln 2 / lambda_j) x spacing_j (or the lag-1 form; see {@link SmoothnessMethod}).
 *
 * Residuals are assumed to have mean zero over time (true for GLM residuals when the design has a
 * constant); fMRI noise is not exactly Gaussian-autocorrelated (Eklund A, Nichols TE & Knutsson H 2016,
 * PNAS 113:7900-7905), so the estimate is the FWHM of the best-matching Gaussian at lag one voxel.
 * @param residuals - residual time series, NIfTI order (x fastest, then y, z, t), length nx*ny*nz*nt (or count*nt when packed); not modified
 * @param dims - [nx, ny, nz, nt]
 * @param mask - nonzero = in the search region, length nx*ny*nz
 * @param spacingMm - voxel size in mm along x, y, z
 * @param options - dof, method, packed
 * @returns FWHM per axis and the numbers behind it
 * @throws BoldsweepError INVALID_ARGUMENT (bad dims, spacing, dof, or no neighbour pairs along an axis),
 *   GRID_MISMATCH (mask size), TOO_FEW_VOLUMES (nt < 3), NON_FINITE_VOXELS (NaN/infinite residuals in the mask)
 * @example const { fwhmMm } = estimateSmoothness(fit.residuals, [64, 64, 36, 200], mask, [3, 3, 3], { dof: 194 })
 */
export function estimateSmoothness(
  residuals: Float32Array | Float64Array,
  dims: readonly number[],
  mask: ArrayLike<number>,
  spacingMm: readonly number[],
  options: SmoothnessOptions = {},
): SmoothnessEstimate {
  if (dims.length !== 4 || dims.some((d) => !Number.isInteger(d) || d < 1)) fail('INVALID_ARGUMENT', `dims must be four positive integers [nx, ny, nz, nt], got [${dims.join(', ')}]`);
  const [nx, ny, nz, nt] = dims;
  const n = nx * ny * nz;
  const packed = options.packed ?? false;
  if (!packed && residuals.length !== n * nt) fail('INVALID_ARGUMENT', `residuals have ${residuals.length} values, dims ${dims.join('x')} need ${n * nt}`);
  if (mask.length !== n) fail('GRID_MISMATCH', `mask has ${mask.length} voxels but the residual grid ${nx}x${ny}x${nz} has ${n}`);
  if (spacingMm.length !== 3 || spacingMm.some((s) => !(s > 0) || !Number.isFinite(s))) fail('INVALID_ARGUMENT', `spacingMm must be three positive numbers, got [${spacingMm.join(', ')}]`);
  if (nt < 3) fail('TOO_FEW_VOLUMES', `smoothness needs at least 3 residual volumes, got ${nt}`);
  const dof = options.dof ?? nt;
  if (!(dof > 2 && dof <= nt)) fail('INVALID_ARGUMENT', `dof must be > 2 and <= the number of volumes ${nt}, got ${dof}`);
  const method = options.method ?? 'derivative-variance';
  if (method !== 'derivative-variance' && method !== 'lag1-autocorrelation') fail('INVALID_ARGUMENT', `method must be 'derivative-variance' or 'lag1-autocorrelation', got ${String(method)}`);

  // 1. inverse norm of each in-mask voxel (0 = not used), on a compact list of those voxels
  let count = 0;
  for (let v = 0; v < n; v++) if (mask[v]) count++;
  const inMask = new Int32Array(count);
  for (let v = 0, j = 0; v < n; v++) if (mask[v]) inMask[j++] = v;
  if (packed && residuals.length !== count * nt) fail('INVALID_ARGUMENT', `packed residuals have ${residuals.length} values; ${count} mask voxels x ${nt} volumes need ${count * nt}`);
  // where voxel j of volume t is read: t * stride + at[j]
  const stride = packed ? count : n;
  const at = packed ? Int32Array.from({ length: count }, (_, j) => j) : inMask;
  const sumSq = new Float64Array(count);
  for (let t = 0; t < nt; t++) {
    const base = t * stride;
    for (let j = 0; j < count; j++) { const r = residuals[base + at[j]]; sumSq[j] += r * r; }
  }
  const invNorm = new Float64Array(count);
  let bad = 0, constantVoxels = 0;
  for (let j = 0; j < count; j++) {
    const s = sumSq[j];
    if (!Number.isFinite(s)) bad++;
    else if (s === 0) constantVoxels++;
    else invNorm[j] = 1 / Math.sqrt(s);
  }
  if (bad > 0) fail('NON_FINITE_VOXELS', `residuals hold non-finite values in ${bad} in-mask voxels`, { details: { count: bad } });

  // 2. neighbour pairs per axis (voxels v - stride and v both used), then the pooled squared
  // differences. Each used voxel knows the compact index of its used neighbour one step back along
  // x, y and z (-1: none), so one pass per volume computes u and closes every pair it ends; each
  // axis's pairs are then added in the order of their first voxel, in one sum per volume.
  const compact = new Int32Array(n).fill(-1);
  for (let j = 0; j < count; j++) if (invNorm[j] !== 0) compact[inMask[j]] = j;
  const strides = [1, nx, nx * ny] as const;
  const back = strides.map(() => new Int32Array(count).fill(-1));
  const pairs = [0, 0, 0];
  for (let j = 0; j < count; j++) {
    if (invNorm[j] === 0) continue;
    const v = inMask[j];
    const before = [v % nx > 0, Math.floor(v / nx) % ny > 0, Math.floor(v / (nx * ny)) > 0];
    for (let axis = 0; axis < 3; axis++) {
      const k = before[axis] ? compact[v - strides[axis]] : -1;
      if (k >= 0) { back[axis][j] = k; pairs[axis]++; }
    }
  }
  pairs.forEach((m, axis) => {
    if (m === 0) fail('INVALID_ARGUMENT', `no in-mask neighbour pairs along axis ${'xyz'[axis]}, so smoothness along it cannot be estimated`);
  });
  const [bx, by, bz] = back;
  const sums = [0, 0, 0];
  const u = new Float64Array(count);
  for (let t = 0; t < nt; t++) {
    const base = t * stride;
    let ax = 0, ay = 0, az = 0;
    for (let j = 0; j < count; j++) {
      const uj = residuals[base + at[j]] * invNorm[j];
      u[j] = uj;
      const kx = bx[j], ky = by[j], kz = bz[j];
      if (kx >= 0) { const d = uj - u[kx]; ax += d * d; }
      if (ky >= 0) { const d = uj - u[ky]; ay += d * d; }
      if (kz >= 0) { const d = uj - u[kz]; az += d * d; }
    }
    sums[0] += ax;
    sums[1] += ay;
    sums[2] += az;
  }

  // 3-4. bias correction and FWHM
  const dofCorrection = (dof - 2) / (dof - 1);
  const lambda = sums.map((s, axis) => (dofCorrection * s) / pairs[axis]) as [number, number, number];
  const lag1 = lambda.map((l) => 1 - l / 2) as [number, number, number];
  const fwhmMmDerivative = lambda.map((l, axis) => fwhmFromDerivativeVariance(l) * spacingMm[axis]) as [number, number, number];
  const fwhmMmLag1 = lag1.map((r, axis) => fwhmFromLag1(r, spacingMm[axis])) as [number, number, number];
  return {
    fwhmMm: method === 'derivative-variance' ? fwhmMmDerivative : fwhmMmLag1,
    method,
    fwhmMmDerivative,
    fwhmMmLag1,
    derivativeVariance: lambda,
    lag1,
    dof,
    dofCorrection,
    pairs: [pairs[0], pairs[1], pairs[2]],
    voxelsUsed: count - constantVoxels,
    constantVoxels,
  };
}
