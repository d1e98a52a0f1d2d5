import { composeAffine, invertAffine } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import type { Volume } from '../core/volume.js';
import { sameGridWithin } from '../resample/plan-resample.js';
import { trilinearResample } from '../resample/trilinear-resample.js';

/**
 * A field map (Hz) on a run's grid. A map on the run's grid is copied; a map on another grid is
 * carried through both voxel-to-world mappings (run voxel -> world -> field-map voxel) by trilinear
 * interpolation, with the field's edge value beyond its grid (`nearest`: a field map usually ends
 * just outside the head, where 0 Hz would put a false edge into the shift map). The field is smooth
 * over a few voxels, so trilinear interpolation keeps it to well within its measurement error.
 * @param field - one 3D field map, Hz
 * @param grid - the run's grid
 * @param hasAffine - whether the field map's and the run's headers gave a voxel-to-world mapping
 *   (NIfTI sform or qform code > 0: `transformSource` of readNifti's info is not 'pixdim')
 * @returns the field, Hz, on the run's grid
 * @throws BoldsweepError FIELD_MAP_INVALID for more than one volume or non-finite values;
 *   FIELD_MAP_NO_AFFINE for a map on another grid when either header has no mapping
 * @example fieldMapOnGrid(fieldVolume, { dims: [64, 64, 36], affine: run.affine }, { field: true, run: true })
 */
export function fieldMapOnGrid(field: Volume, grid: Grid, hasAffine: { field: boolean; run: boolean }): Float32Array {
  if (field.dims[3] !== 1) fail('FIELD_MAP_INVALID', `the field map has ${field.dims[3]} volumes; give one 3D map in Hz`);
  const bad = field.data.findIndex((x) => !Number.isFinite(x));
  if (bad >= 0) fail('FIELD_MAP_INVALID', `field map voxel ${bad} is ${field.data[bad]}`, { details: { voxel: bad } });
  const fieldGrid: Grid = { dims: [field.dims[0], field.dims[1], field.dims[2]], affine: field.affine };
  if (sameGridWithin(fieldGrid, grid)) return Float32Array.from(field.data);
  if (!hasAffine.field || !hasAffine.run) {
    const which = !hasAffine.field && !hasAffine.run ? 'neither the field map nor the run has' : !hasAffine.field ? 'the field map has' : 'the run has';
    fail('FIELD_MAP_NO_AFFINE', `the field map (${fieldGrid.dims.join(' x ')}) is on another grid than the run (${grid.dims.join(' x ')}) and ${which} a voxel-to-world mapping (sform/qform) to place it`);
  }
  const fieldFromRun = composeAffine(invertAffine(field.affine), grid.affine);
  return trilinearResample(field.data, fieldGrid.dims, fieldFromRun, grid.dims, undefined, { mode: 'nearest' });
}
