import type { Sidecar } from '../io/run-types.js';
import { readSidecar } from '../io/sidecar.js';

/**
 * The BIDS sidecar beside an image (`X.nii[.gz]` -> `X.json`), or null when there is none.
 * @param path - the image's path
 * @returns the sidecar or null
 * @throws BoldsweepError SIDECAR_INVALID and the reading errors of readSidecar other than a missing file
 * @example const sidecar = await sidecarBeside('sub-01_dir-AP_epi.nii.gz')
 */
export async function sidecarBeside(path: string): Promise<Sidecar | null> {
  const json = path.replace(/\.nii(\.gz)?$/i, '.json');
  try {
    return await readSidecar(json);
  } catch (e) {
    if ((e as { code?: string }).code === 'FILE_NOT_FOUND') return null;
    throw e;
  }
}
