import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { fail } from '../core/fail.js';
import type { Volume } from '../core/volume.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { writeNifti } from '../io/nifti-write.js';
import type { PhantomSpec } from './phantom-spec.js';

/** File name of the phantom template (boldsweep's own template, not a subject's file). */
export const PHANTOM_TEMPLATE_FILE = 'boldsweep-phantom-template_2mm.nii.gz';

/** Paths of the files {@link writePhantomAnatomy} wrote. */
export interface PhantomAnatomyFiles {
  /** `<subject>_T1w.nii.gz` (BIDS naming, beside the run): the structural image, int16. */
  structural?: string;
  /** `<subject>_T1w.json`: its BIDS sidecar (RepetitionTime, EchoTime, FlipAngle). */
  structuralSidecar?: string;
  /** {@link PHANTOM_TEMPLATE_FILE}: the template, int16. */
  template?: string;
}

/** Whole signal units as int16 (both images are scaled so white matter is about 1000). */
function rounded(v: Volume, what: string): Volume {
  const data = new Float32Array(v.data.length);
  for (let i = 0; i < data.length; i++) {
    const x = Math.round(v.data[i]);
    if (!(x >= -32768 && x <= 32767)) fail('INVALID_ARGUMENT', `${what} value ${v.data[i]} at index ${i} does not fit int16 storage; lower whiteMatterSignal`);
    data[i] = x;
  }
  return { ...v, data };
}

/**
 * Write the phantom's structural image (BIDS naming, `<subject>_T1w.nii.gz` with its sidecar, in
 * `dir` beside the run) and its template ({@link PHANTOM_TEMPLATE_FILE} in `dir`), each rounded to
 * whole signal units as int16. Output bytes depend only on the images (gzip without a timestamp).
 * @param dir - output folder (created if missing)
 * @param spec - the spec they were made from (for the structural sidecar)
 * @param images - the structural image and/or the template (simulatePhantomStructural, simulatePhantomTemplate)
 * @param subject - BIDS subject entity, e.g. `sub-phantom01`
 * @returns the paths written
 * @throws BoldsweepError INVALID_ARGUMENT for a bad subject or values beyond int16; WRITE_FAILED
 * @example await writePhantomAnatomy('data-demo', spec, { structural: simulatePhantomStructural(spec) }, 'sub-phantom01')
 */
export async function writePhantomAnatomy(dir: string, spec: PhantomSpec, images: { structural?: Volume; template?: Volume }, subject: string): Promise<PhantomAnatomyFiles> {
  if (!/^sub-[A-Za-z0-9]+$/.test(subject)) fail('INVALID_ARGUMENT', `subject must be a BIDS subject entity like 'sub-01', got '${subject}'`);
  try {
    await mkdir(dir, { recursive: true });
  } catch (cause) {
    fail('WRITE_FAILED', `cannot create the output folder ${dir}`, { file: dir, cause });
  }
  const files: PhantomAnatomyFiles = {};
  if (images.structural) {
    files.structural = join(dir, `${subject}_T1w.nii.gz`);
    files.structuralSidecar = join(dir, `${subject}_T1w.json`);
    await writeNifti(files.structural, rounded(images.structural, 'structural'), { datatype: 'int16', description: 'boldsweep digital phantom T1w' });
    const seq = spec.structural?.sequence;
    const sidecar = seq ? { RepetitionTime: seq.trSec, EchoTime: seq.teSec, FlipAngle: seq.flipAngleDeg, MagneticFieldStrength: spec.acquisition.fieldStrengthT } : {};
    await writeFileAtomic(files.structuralSidecar, `${JSON.stringify(sidecar, null, 2)}\n`);
  }
  if (images.template) {
    files.template = join(dir, PHANTOM_TEMPLATE_FILE);
    await writeNifti(files.template, rounded(images.template, 'template'), { datatype: 'int16', description: 'boldsweep phantom template, 2 mm' });
  }
  return files;
}
