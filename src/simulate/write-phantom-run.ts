import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { fail } from '../core/fail.js';
import { makeVolume } from '../core/volume.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { writeEvents } from '../io/events.js';
import { writeNifti } from '../io/nifti-write.js';
import { writeSidecar } from '../io/sidecar.js';
import { phantomAnatomyGrids } from './phantom-anatomy-grids.js';
import type { PhantomRun } from './phantom-types.js';
import { PHANTOM_TEMPLATE_FILE } from './write-phantom-anatomy.js';
import { PHANTOM_TISSUES } from './tissue-properties.js';

/** Paths of the files {@link writePhantomRun} wrote. */
export interface PhantomRunFiles {
  /** `<base>_bold.nii.gz`: the run, int16 (values rounded to whole signal units). */
  bold: string;
  /** `<base>_bold.json`: BIDS sidecar. */
  sidecar: string;
  /** `<base>_events.tsv`: BIDS events. */
  events: string;
  /** `<base>_truth-tissue.nii.gz`: majority tissue label per voxel (int16). */
  tissue: string;
  /** `<base>_truth-fractions.nii.gz`: partial-volume fraction of each tissue, one volume per tissue (float32). */
  fractions: string;
  /** `<base>_truth-activation.nii.gz`: signal change on a sustained block's plateau, percent (float32). */
  activation: string;
  /** `<base>_truth-fieldmap-hz.nii.gz`: field offset, Hz (float32). */
  fieldMap: string;
  /** `<base>_truth.json`: motion table, spikes, dropouts, steady state, tissue parameters with sources, the spec. */
  truth: string;
}

/**
 * Write a simulated run as BIDS-like files plus its ground truth. The run is stored as int16 after
 * rounding to whole signal units (with grey matter at 1000 and thermal noise SD 11 by default, the
 * rounding adds noise of SD 1/sqrt(12) = 0.29, under 0.1 % of the noise variance), which keeps the
 * compressed file small. Output bytes depend only on the run (no dates or paths inside).
 * @param dir - output folder (created if missing)
 * @param run - result of simulatePhantomRun
 * @param baseName - file name stem, e.g. `sub-phantom01_task-flicker`
 * @returns the paths written
 * @throws BoldsweepError INVALID_ARGUMENT for a bad base name or values beyond int16; WRITE_FAILED
 * @example await writePhantomRun('data-demo', simulatePhantomRun(demoPhantomSpec()), 'sub-phantom01_task-flicker')
 */
export async function writePhantomRun(dir: string, run: PhantomRun, baseName: string): Promise<PhantomRunFiles> {
  if (!/^[A-Za-z0-9][A-Za-z0-9_-]*$/.test(baseName)) fail('INVALID_ARGUMENT', `baseName must be letters, digits, '-' and '_' (no folders or extension), got '${baseName}'`);
  try {
    await mkdir(dir, { recursive: true });
  } catch (cause) {
    fail('WRITE_FAILED', `cannot create the output folder ${dir}`, { file: dir, cause });
  }
  const path = (suffix: string) => join(dir, `${baseName}_${suffix}`);
  const files: PhantomRunFiles = {
    bold: path('bold.nii.gz'),
    sidecar: path('bold.json'),
    events: path('events.tsv'),
    tissue: path('truth-tissue.nii.gz'),
    fractions: path('truth-fractions.nii.gz'),
    activation: path('truth-activation.nii.gz'),
    fieldMap: path('truth-fieldmap-hz.nii.gz'),
    truth: path('truth.json'),
  };
  const { volume, truth } = run;

  const rounded = new Float32Array(volume.data.length);
  for (let i = 0; i < rounded.length; i++) {
    const v = Math.round(volume.data[i]);
    if (!(v >= -32768 && v <= 32767)) fail('INVALID_ARGUMENT', `run value ${volume.data[i]} at index ${i} does not fit int16 storage; lower greyMatterSignal or spike amplitudes`);
    rounded[i] = v;
  }
  await writeNifti(files.bold, { ...volume, data: rounded }, { datatype: 'int16', description: 'boldsweep digital phantom run' });
  await writeSidecar(files.sidecar, run.sidecar);
  await writeEvents(files.events, run.events);
  await writeNifti(files.tissue, truth.tissueLabels, { datatype: 'int16', description: `labels: ${truth.labelNames.map((n, i) => `${i} ${n}`).join(', ')}`.slice(0, 79) });
  const nVox = truth.tissueLabels.data.length;
  const fr = new Float32Array(nVox * PHANTOM_TISSUES.length);
  PHANTOM_TISSUES.forEach((t, idx) => fr.set(truth.tissueFractions[t], idx * nVox));
  const like = truth.tissueLabels;
  await writeNifti(files.fractions, makeVolume({ dims: [like.dims[0], like.dims[1], like.dims[2], PHANTOM_TISSUES.length], spacingMm: [...like.spacingMm], trSec: 0, affine: new Float64Array(like.affine), data: fr }), { description: `fractions: ${PHANTOM_TISSUES.join(', ')}` });
  await writeNifti(files.activation, truth.activationPercent, { description: 'signal change on a block plateau, percent' });
  await writeNifti(files.fieldMap, truth.fieldMapHz, { description: 'field offset, Hz' });

  const spec = truth.spec;
  const record = {
    about: 'Ground truth of a boldsweep digital phantom run (an invented head, not a scan of anyone).',
    files: Object.fromEntries(Object.entries(files).map(([k, p]) => [k, p.slice(dir.length + 1)])),
    frame: 'Truth images show the head at its volume-0 position, before the geometric shift along the phase-encode axis.',
    labelNames: truth.labelNames,
    fractionsVolumeOrder: [...PHANTOM_TISSUES],
    steadyState: truth.steadyState,
    motionTable: {
      about: 'Head position at each volume relative to volume 0: shifts in mm, rotations in degrees about rotationCentreMm, applied as p -> Rz Ry Rx (p - c) + c + shift (world RAS+ mm).',
      rotationCentreMm: truth.rotationCentreMm,
      jerk: spec.motion?.jerk ?? null,
      rows: truth.motionTable,
    },
    spikes: { about: 'Value added to one voxel (i, j, k, 0-based) in one volume (0-based), after noise.', list: truth.spikes },
    dropouts: { about: 'Slice (0-based) of a volume (0-based) whose signal was multiplied by keptFraction before noise.', list: truth.dropouts },
    tissueSignal: { about: 'Noise-free steady-state value of each pure tissue, signal units.', values: truth.tissueSignal },
    tissues: spec.tissues,
    sliceOrder: 'interleaved ascending: slices 0, 2, 4, ... (0-based, bottom up) then 1, 3, 5, ...; SliceTiming in the sidecar',
    totalReadoutTimeSec: truth.totalReadoutTimeSec,
    fieldShiftRule: 'shift (voxels along j) = field (Hz) x TotalReadoutTime (s), positive towards +j for PhaseEncodingDirection j (Jezzard & Balaban 1995)',
    ...anatomyTruth(),
    spec,
  };
  await writeFileAtomic(files.truth, `${JSON.stringify(record, null, 1)}\n`);
  return files;

  /** The structural image's and the template's grids and true transforms (only when the spec has them, so older truth files keep their bytes). */
  function anatomyTruth(): Record<string, unknown> {
    if (!spec.structural && !spec.template) return {};
    const g = phantomAnatomyGrids(spec);
    const rows = (a: Float64Array | null) => (a ? [0, 1, 2, 3].map((r) => Array.from(a.subarray(4 * r, 4 * r + 4), (x) => Number(x.toPrecision(12)))) : null);
    const subject = baseName.split('_')[0];
    return {
      anatomy: {
        about: 'True world-to-world maps (row-major 4x4, world mm RAS+) between the run\'s reference frame (volume 0 of the motion table), the structural image and the template; a point p of the first space is M p in the second.',
        structuralFile: spec.structural ? `${subject}_T1w.nii.gz` : null,
        templateFile: spec.template ? PHANTOM_TEMPLATE_FILE : null,
        structuralGrid: g.structural ? { dims: g.structural.dims, voxelToWorld: rows(g.structural.affine) } : null,
        templateGrid: g.template ? { dims: g.template.dims, voxelToWorld: rows(g.template.affine) } : null,
        structuralFromReference: rows(g.structuralFromReference),
        templateFromReference: rows(g.templateFromReference),
        templateFromStructural: rows(g.templateFromStructural),
      },
    };
  }
}
