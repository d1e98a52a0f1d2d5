import { stat } from 'node:fs/promises';
import { resolve } from 'node:path';
import { fail } from '../core/fail.js';
import { assertSameGrid, voxelsPerVolume, type Volume } from '../core/volume.js';
import { hashFile } from '../io/hash-file.js';
import { readNifti } from '../io/nifti-read.js';
import { dilateMask } from '../look/binary-morphology.js';
import { brainMaskFromMean } from '../look/brain-mask.js';
import { meanImage } from '../look/mean-image.js';

/** A file that went into a decision: where it was, its SHA-256 and size. */
export interface FileFacts {
  path: string;
  sha256: string;
  bytes: number;
}

/**
 * How a mask is made, so a re-run can make it again:
 * - 'otsu-mean': the look module's automatic brain mask of the run's mean image;
 * - 'brain': the same voxels as the brain mask (for the placement mask);
 * - 'file': voxels of a NIfTI image (same grid) whose value is one of `values` (e.g. a tissue
 *   label) or, when `above` is given, greater than it (e.g. a map of known activation in percent);
 *   `growVoxels` then grows the mask by that many steps of the 6-neighbour cross (a margin).
 */
export type MaskSource =
  | { kind: 'otsu-mean' }
  | { kind: 'brain' }
  | { kind: 'file'; file: FileFacts; values?: number[]; above?: number; growVoxels?: number };

/**
 * Facts about a file for a decision record.
 * @param path - the file
 * @returns path (as given), SHA-256 and size
 * @throws BoldsweepError FILE_NOT_FOUND / READ_FAILED
 * @example await fileFacts('data-demo/sub-phantom01_task-flicker_bold.nii.gz')
 */
export async function fileFacts(path: string): Promise<FileFacts> {
  const sha256 = await hashFile(path);
  return { path, sha256, bytes: (await stat(path)).size };
}

/**
 * A mask source reading a NIfTI file: voxels whose (rounded) value is one of `values`, or whose value
 * is greater than `above`.
 * @param path - image on the run's grid
 * @param rule - values (labels) counted as inside, or a threshold; growVoxels: margin in voxel steps.
 *   __Default value:__ { values: [1] }
 * @returns the source (with the file's hash)
 * @example const grey = await maskFromFile('data-demo/sub-phantom01_task-flicker_truth-tissue.nii.gz', { values: [3] })
 */
export async function maskFromFile(path: string, rule: { values?: number[]; above?: number; growVoxels?: number } = { values: [1] }): Promise<MaskSource> {
  return {
    kind: 'file', file: await fileFacts(path),
    ...(rule.above !== undefined ? { above: rule.above } : { values: rule.values ?? [1] }),
    ...(rule.growVoxels ? { growVoxels: rule.growVoxels } : {}),
  };
}

/**
 * Make a mask from its source on a run's grid.
 * @param source - how to make it
 * @param volume - the run
 * @param options - brain: the brain mask (for kind 'brain'); baseDir: folder relative paths are
 *   resolved from; verify: check the file's hash matches (default true)
 * @returns one byte per voxel (1 = in)
 * @throws BoldsweepError RECORD_INVALID when a file's hash differs from the recorded one; GRID_MISMATCH
 * @example const brain = await buildMask({ kind: 'otsu-mean' }, run.volume)
 */
export async function buildMask(source: MaskSource, volume: Volume, options: { brain?: Uint8Array; baseDir?: string; verify?: boolean } = {}): Promise<Uint8Array> {
  if (source.kind === 'otsu-mean') return brainMaskFromMean(meanImage(volume), volume.dims.slice(0, 3)).mask;
  if (source.kind === 'brain') {
    if (!options.brain) fail('INVALID_ARGUMENT', 'a placement mask of kind "brain" needs the brain mask');
    return options.brain;
  }
  const path = resolve(options.baseDir ?? '.', source.file.path);
  if (options.verify ?? true) {
    const sha = await hashFile(path);
    if (sha !== source.file.sha256) fail('RECORD_INVALID', `mask file ${path} has changed since it was recorded (SHA-256 ${sha.slice(0, 12)}..., recorded ${source.file.sha256.slice(0, 12)}...)`);
  }
  const { volume: img } = await readNifti(path);
  assertSameGrid(img, volume, ['mask image', 'run']);
  const n = voxelsPerVolume(volume);
  const out = new Uint8Array(n);
  let count = 0;
  if (source.above !== undefined) {
    for (let v = 0; v < n; v++) if (img.data[v] > source.above) { out[v] = 1; count++; }
    if (count === 0) fail('INVALID_ARGUMENT', `mask file ${path} has no voxel above ${source.above}`);
  } else {
    const wanted = new Set(source.values ?? [1]);
    for (let v = 0; v < n; v++) if (wanted.has(Math.round(img.data[v]))) { out[v] = 1; count++; }
    if (count === 0) fail('INVALID_ARGUMENT', `mask file ${path} has no voxel with value ${[...wanted].join(' or ')}`);
  }
  let grown = out;
  for (let k = 0; k < (source.growVoxels ?? 0); k++) grown = dilateMask(grown, volume.dims.slice(0, 3));
  return grown;
}
