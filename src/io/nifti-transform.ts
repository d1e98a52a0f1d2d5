import { affineFromQuaternion, affineFromRows, affineDeterminant, type Affine } from '../core/affine.js';
import type { TransformSource } from './run-types.js';
import type { NiftiHeaderFacts } from './nifti-header.js';

/**
 * Voxel->world affine of a NIfTI header by the rule of nifti1.h: the sform (srow_x/y/z) when
 * sform_code > 0, else the qform (quaternion + pixdim + qfac) when qform_code > 0, else the voxel
 * sizes alone ("method 1": x = pixdim[1] i, y = pixdim[2] j, z = pixdim[3] k). The result is scaled to
 * mm by `toMm` (the header's spatial unit).
 * @param h - checked header facts
 * @param toMm - factor from the header's length unit to mm
 * @returns the affine in mm and which method gave it
 * @example const { affine, source } = niftiTransform(header, 1)
 */
export function niftiTransform(h: NiftiHeaderFacts, toMm: number): { affine: Affine; source: TransformSource } {
  let affine: Affine;
  let source: TransformSource;
  if (h.sformCode > 0) {
    affine = affineFromRows(h.srow);
    source = 'sform';
  } else if (h.qformCode > 0) {
    affine = affineFromQuaternion({
      quaternB: h.quatern.b, quaternC: h.quatern.c, quaternD: h.quatern.d,
      qoffsetX: h.quatern.x, qoffsetY: h.quatern.y, qoffsetZ: h.quatern.z,
      pixdimMm: [h.pixdim[1], h.pixdim[2], h.pixdim[3]],
      qfac: h.pixdim[0],
    });
    source = 'qform';
  } else {
    affine = affineFromRows([[h.pixdim[1], 0, 0, 0], [0, h.pixdim[2], 0, 0], [0, 0, h.pixdim[3], 0]]);
    source = 'pixdim';
  }
  if (toMm !== 1) for (let r = 0; r < 3; r++) for (let c = 0; c < 4; c++) affine[4 * r + c] *= toMm;
  return { affine, source };
}

/**
 * True when an affine can map voxels to world: finite entries and a non-zero determinant.
 * @param a - the affine
 * @returns whether it is usable
 * @example usableAffine(identityAffine()) // true
 */
export function usableAffine(a: Affine): boolean {
  for (let i = 0; i < 16; i++) if (!Number.isFinite(a[i])) return false;
  return affineDeterminant(a) !== 0;
}
