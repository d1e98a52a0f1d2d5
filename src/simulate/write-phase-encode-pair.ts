import { join } from 'node:path';
import { fail } from '../core/fail.js';
import { writeNifti } from '../io/nifti-write.js';
import type { Sidecar } from '../io/run-types.js';
import { writeSidecar } from '../io/sidecar.js';
import type { PhantomPhaseEncodePair } from './simulate-phase-encode-pair.js';

/**
 * Write a phantom's reversed phase-encode pair in BIDS field-map naming, `<subject>_dir-<label>_epi`
 * (.nii.gz, int16 after rounding to whole signal units as the run is, and a .json sidecar with
 * PhaseEncodingDirection, TotalReadoutTime, EffectiveEchoSpacing, EchoTime, RepetitionTime). The
 * files sit beside the run (the demo folder is flat; in a BIDS tree they go in `fmap/`).
 * @param dir - output folder (must exist)
 * @param pair - from simulatePhaseEncodePair
 * @param subject - subject entity, e.g. `sub-phantom01`
 * @returns the paths written, images first
 * @throws BoldsweepError INVALID_ARGUMENT for a bad subject label or values beyond int16; WRITE_FAILED
 * @example await writePhaseEncodePair('data-demo', simulatePhaseEncodePair(demoPhantomSpec()), 'sub-phantom01')
 */
export async function writePhaseEncodePair(dir: string, pair: PhantomPhaseEncodePair, subject: string): Promise<string[]> {
  if (!/^sub-[A-Za-z0-9]+$/.test(subject)) fail('INVALID_ARGUMENT', `subject must be a BIDS subject entity like sub-01, got '${subject}'`);
  const written: string[] = [];
  for (const [run, label] of [[pair.same, pair.labels.same], [pair.reversed, pair.labels.reversed]] as const) {
    const stem = join(dir, `${subject}_dir-${label}_epi`);
    const rounded = new Float32Array(run.volume.data.length);
    for (let i = 0; i < rounded.length; i++) {
      const v = Math.round(run.volume.data[i]);
      if (!(v >= -32768 && v <= 32767)) fail('INVALID_ARGUMENT', `value ${run.volume.data[i]} at index ${i} does not fit int16 storage`);
      rounded[i] = v;
    }
    await writeNifti(`${stem}.nii.gz`, { ...run.volume, data: rounded }, { datatype: 'int16', description: 'boldsweep phantom, reversed phase-encode pair' });
    const s = run.sidecar;
    const sidecar: Sidecar = {
      PhaseEncodingDirection: s.PhaseEncodingDirection!, TotalReadoutTime: s.TotalReadoutTime!, EffectiveEchoSpacing: s.EffectiveEchoSpacing!,
      EchoTime: s.EchoTime!, RepetitionTime: s.RepetitionTime!, MagneticFieldStrength: s.MagneticFieldStrength!,
    };
    await writeSidecar(`${stem}.json`, sidecar);
    written.push(`${stem}.nii.gz`, `${stem}.json`);
  }
  return written;
}
