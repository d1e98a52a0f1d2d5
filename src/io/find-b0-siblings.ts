import { readdir } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';

/** B0 field inputs found beside a run by BIDS field-map naming. */
export interface B0Siblings {
  /** A `<subject>[_ses-...]..._fieldmap.nii[.gz]` (a field map, BIDS "direct field mapping"), or null. */
  fieldMap: string | null;
  /** `<subject>[_ses-...]..._dir-<label>_epi.nii[.gz]` images (reversed phase-encode candidates), sorted by name. */
  phaseEncodeImages: string[];
}

/**
 * Field-map files that belong with a run, by BIDS naming: in the run's own folder and in the sibling
 * `fmap/` folder of a BIDS tree (`sub-01/func/X_bold.nii.gz` -> `sub-01/fmap/`), files of the run's
 * subject (and session, when the run names one) ending `_fieldmap.nii[.gz]` or `_dir-<label>_epi.nii[.gz]`.
 * The BIDS `IntendedFor` field is not read: with several candidates, pass the files explicitly.
 * @param runPath - path of the run's .nii or .nii.gz
 * @returns what was found (nothing for a run whose name has no `sub-` entity)
 * @example const { phaseEncodeImages } = await findB0Siblings('data-demo/sub-phantom01_task-flicker_bold.nii.gz')
 */
export async function findB0Siblings(runPath: string): Promise<B0Siblings> {
  const name = basename(runPath);
  const subject = /^(sub-[A-Za-z0-9]+)(_ses-[A-Za-z0-9]+)?/.exec(name);
  if (!subject) return { fieldMap: null, phaseEncodeImages: [] };
  const prefix = subject[0];
  const folders = [dirname(runPath), join(dirname(runPath), '..', 'fmap')];
  const fieldMaps: string[] = [];
  const epi: string[] = [];
  for (const folder of folders) {
    let names: string[];
    try {
      names = await readdir(folder);
    } catch {
      continue; // no such folder: nothing there
    }
    for (const n of names.sort()) {
      if (!n.startsWith(`${prefix}_`)) continue;
      if (/_fieldmap\.nii(\.gz)?$/.test(n)) fieldMaps.push(join(folder, n));
      else if (/_dir-[A-Za-z0-9]+(_run-[0-9]+)?_epi\.nii(\.gz)?$/.test(n)) epi.push(join(folder, n));
    }
  }
  return { fieldMap: fieldMaps[0] ?? null, phaseEncodeImages: epi };
}
