import { access } from 'node:fs/promises';

/** The files that belong with an image by name. */
export interface RunSiblings {
  /** Sidecar JSON found beside the image, or null. */
  sidecar: string | null;
  /** Events TSV found beside the image, or null. */
  events: string | null;
}

/**
 * Candidate sibling names of a NIfTI image, in the order they are tried.
 * BIDS naming: `X_bold.nii[.gz]` -> `X_bold.json` and `X_events.tsv`. Any other name:
 * `name.nii[.gz]` -> `name.json` and `name_events.tsv`. (BIDS inheritance of sidecars from parent
 * folders is not followed: pass the sidecar explicitly in that case.)
 * @param imagePath - path of the .nii or .nii.gz file
 * @returns candidate paths for the sidecar and the events
 * @example siblingCandidates('sub-01_task-faces_bold.nii.gz') // { sidecar: ['sub-01_task-faces_bold.json'], events: ['sub-01_task-faces_events.tsv'] }
 */
export function siblingCandidates(imagePath: string): { sidecar: string[]; events: string[] } {
  const stem = imagePath.replace(/\.nii(\.gz)?$/i, '');
  const bids = /_bold$/.exec(stem);
  if (bids) return { sidecar: [`${stem}.json`], events: [`${stem.slice(0, bids.index)}_events.tsv`] };
  return { sidecar: [`${stem}.json`], events: [`${stem}_events.tsv`] };
}

/**
 * Find the sidecar and events files that sit beside an image (see {@link siblingCandidates}).
 * @param imagePath - path of the .nii or .nii.gz file
 * @returns the paths found, or null for each missing one
 * @example const { sidecar, events } = await findRunSiblings('sub-01_task-faces_bold.nii.gz')
 */
export async function findRunSiblings(imagePath: string): Promise<RunSiblings> {
  const c = siblingCandidates(imagePath);
  return { sidecar: await firstExisting(c.sidecar), events: await firstExisting(c.events) };
}

async function firstExisting(paths: string[]): Promise<string | null> {
  for (const p of paths) {
    try {
      await access(p);
      return p;
    } catch {
      // not there: try the next name
    }
  }
  return null;
}
