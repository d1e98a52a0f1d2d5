import { fail } from '../core/fail.js';
import { makeVolume, type Volume } from '../core/volume.js';
import type { GlmFit } from './glm-fit.js';

/**
 * The beta of one design column as a 3D map on the run's grid (0 where no voxel was fitted).
 * @param fit - a GLM fit
 * @param column - column name or index
 * @returns a Float32 volume
 * @throws BoldsweepError INVALID_ARGUMENT for an unknown column
 * @example const taskBeta = betaMap(fit, 'task')
 */
export function betaMap(fit: GlmFit, column: string | number): Volume {
  const { columns, p } = fit.design;
  const j = typeof column === 'number' ? column : columns.indexOf(column);
  if (!Number.isInteger(j) || j < 0 || j >= p) fail('INVALID_ARGUMENT', `no design column ${JSON.stringify(column)}; columns: ${columns.join(', ')}`);
  const [nx, ny, nz] = fit.grid.dims;
  const data = new Float32Array(nx * ny * nz);
  const n = fit.voxels.length;
  for (let i = 0; i < n; i++) data[fit.voxels[i]] = fit.betas[j * n + i];
  return makeVolume({ dims: [nx, ny, nz, 1], spacingMm: [...fit.grid.spacingMm], trSec: fit.grid.trSec, affine: new Float64Array(fit.grid.affine), data });
}
