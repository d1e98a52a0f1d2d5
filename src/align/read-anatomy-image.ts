import { affineDeterminant, affineSpacing } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { readNifti } from '../io/nifti-read.js';
import type { ImageOnGrid } from '../register/registration-types.js';

/**
 * Read a 3D image that alignment needs (a structural image or a template) with a usable
 * voxel-to-world mapping: an sform or qform (not the voxel sizes alone, which place every image at
 * the same corner and so say nothing about where the head is), finite and not degenerate.
 * @param path - the NIfTI file
 * @param role - 'structural' or 'template', for messages
 * @returns the image and its grid
 * @throws BoldsweepError STRUCTURAL_AFFINE_UNUSABLE for a missing or degenerate mapping;
 *   INVALID_ARGUMENT for a 4D image of more than one volume; the reader's errors (FILE_NOT_FOUND, ...)
 * @example const t1w = await readAnatomyImage('sub-01/anat/sub-01_T1w.nii.gz', 'structural')
 */
export async function readAnatomyImage(path: string, role: 'structural' | 'template'): Promise<ImageOnGrid> {
  const { volume, info } = await readNifti(path);
  if (volume.dims[3] !== 1) fail('INVALID_ARGUMENT', `the ${role} image ${path} has ${volume.dims[3]} volumes; give a 3D image`);
  const a = volume.affine;
  const det = affineDeterminant(a);
  const spacing = affineSpacing(a);
  if (info.transformSource === 'pixdim') fail('STRUCTURAL_AFFINE_UNUSABLE', `the ${role} image ${path} has neither an sform nor a qform (sform_code ${info.sformCode}, qform_code ${info.qformCode})`, { file: path });
  // voxels under 0.05 mm or over 20 mm are no head image's (a header written in the wrong units)
  if (!Array.from(a).every(Number.isFinite) || !(Math.abs(det) > 0) || spacing.some((s) => !(s >= 0.05 && s <= 20))) {
    fail('STRUCTURAL_AFFINE_UNUSABLE', `the ${role} image ${path} has a degenerate voxel-to-world mapping (voxel sizes ${spacing.map((s) => s.toPrecision(3)).join(' x ')} mm, determinant ${det.toPrecision(3)})`, { file: path });
  }
  return { data: volume.data, grid: { dims: [volume.dims[0], volume.dims[1], volume.dims[2]], affine: new Float64Array(a) } };
}
