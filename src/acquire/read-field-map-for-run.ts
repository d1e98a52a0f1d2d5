import { basename } from 'node:path';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import type { Volume } from '../core/volume.js';
import { readNifti } from '../io/nifti-read.js';
import { fieldMapOnGrid } from './field-map-on-grid.js';
import { sidecarBeside } from './sidecar-beside.js';

/**
 * Read a field map for a run: a NIfTI in Hz (BIDS `_fieldmap` with sidecar `Units` 'Hz', or 'rad/s'
 * converted by / 2 pi; no Units: Hz), on the run's grid or carried onto it through both affines
 * ({@link fieldMapOnGrid}).
 * @param path - the field map's .nii or .nii.gz (its sidecar .json beside it is read when present)
 * @param run - the run's volume and whether its header gave an affine (`info.transformSource`)
 * @returns the field, Hz, on the run's grid
 * @throws BoldsweepError FIELD_MAP_INVALID (several volumes, non-finite values, unknown Units),
 *   FIELD_MAP_NO_AFFINE, and the reading errors of readNifti
 * @example const hz = await readFieldMapForRun('sub-01_fieldmap.nii.gz', { volume: run.volume, transformSource: run.info.transformSource })
 */
export async function readFieldMapForRun(path: string, run: { volume: Volume; transformSource: string }): Promise<Float32Array> {
  const { volume, info } = await readNifti(path);
  const sidecar = await sidecarBeside(path);
  const units = (sidecar as Record<string, unknown> | null)?.Units;
  if (units !== undefined && units !== 'Hz' && units !== 'rad/s') fail('FIELD_MAP_INVALID', `${basename(path)}: sidecar Units is '${String(units)}'; give the field in Hz (or rad/s)`, { file: path });
  const grid: Grid = { dims: [run.volume.dims[0], run.volume.dims[1], run.volume.dims[2]], affine: run.volume.affine };
  const field = fieldMapOnGrid(volume, grid, { field: info.transformSource !== 'pixdim', run: run.transformSource !== 'pixdim' });
  if (units === 'rad/s') for (let v = 0; v < field.length; v++) field[v] /= 2 * Math.PI;
  return field;
}

