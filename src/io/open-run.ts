import { fail } from '../core/fail.js';
import { makeVolume } from '../core/volume.js';
import { readEvents } from './events.js';
import { readNifti } from './nifti-read.js';
import { findRunSiblings } from './run-siblings.js';
import type { BoldEvent, Run, Sidecar } from './run-types.js';
import { readSidecar } from './sidecar.js';

/** Options of {@link openRun}. */
export interface OpenRunOptions {
  /** Sidecar JSON path; `null` reads none. __Default value:__ found beside the image (see findRunSiblings). */
  sidecar?: string | null;
  /** Events TSV path; `null` reads none. __Default value:__ found beside the image (see findRunSiblings). */
  events?: string | null;
  /** NaN/Inf voxels: `'error'` refuses the run, `'zero'` sets them to 0 and counts them. __Default value:__ `'error'`. */
  nonFinite?: 'error' | 'zero';
  /** Voxels on a SharedArrayBuffer (for a sweep's worker threads; no second copy). __Default value:__ `false`. */
  sharedMemory?: boolean;
}

/**
 * Open a 4D fMRI run: the NIfTI image, its BIDS sidecar JSON and events TSV (found beside the image
 * unless given or disabled with null). The TR is the sidecar's RepetitionTime when present, else the
 * header's pixdim[4]; `volume.trSec` is set to it. Checks: the image is 4D with at least 2 volumes;
 * SliceTiming has one entry per slice (nz) and each is inside the TR; no event starts at or after the
 * end of the run (nt * TR). Nothing on disk is changed.
 * @param path - the .nii or .nii.gz image
 * @param options - sidecar and events paths (or null), NaN/Inf handling
 * @returns the run with the paths of the files actually read
 * @throws BoldsweepError any readNifti/readSidecar/readEvents error; NOT_4D, TR_MISSING, SLICE_TIMING_LENGTH, SIDECAR_INVALID, EVENTS_BEYOND_RUN
 * @example const run = await openRun('sub-01_task-faces_bold.nii.gz'); run.volume.trSec
 */
export async function openRun(path: string, options: OpenRunOptions = {}): Promise<Run> {
  const found = options.sidecar === undefined || options.events === undefined ? await findRunSiblings(path) : { sidecar: null, events: null };
  const sidecarPath = options.sidecar === undefined ? found.sidecar : options.sidecar;
  const eventsPath = options.events === undefined ? found.events : options.events;

  const { volume, info } = await readNifti(path, { nonFinite: options.nonFinite, sharedMemory: options.sharedMemory });
  const [, , nz, nt] = volume.dims;
  if (nt < 2) fail('NOT_4D', `the image has dims [${volume.dims.join(', ')}] (${nt} volume)`, { file: path });

  const sidecar: Sidecar | null = sidecarPath === null ? null : await readSidecar(sidecarPath);
  let trSec: number;
  let trSource: Run['trSource'];
  if (sidecar?.RepetitionTime !== undefined) {
    trSec = sidecar.RepetitionTime;
    trSource = 'sidecar';
  } else if ((info.headerTrSec ?? 0) > 0) {
    trSec = info.headerTrSec!;
    trSource = 'header';
  } else {
    const why = sidecarPath === null ? 'no sidecar was read' : `the sidecar ${sidecarPath} has no RepetitionTime`;
    fail('TR_MISSING', `pixdim[4] of the header is ${info.headerTrSec ?? 0} (time unit ${info.timeUnit ?? 'unknown'}) and ${why}`, { file: path });
  }

  const sliceTiming = sidecar?.SliceTiming;
  if (sliceTiming) {
    if (sliceTiming.length !== nz) fail('SLICE_TIMING_LENGTH', `SliceTiming has ${sliceTiming.length} entries but the image has ${nz} slices`, { file: sidecarPath!, details: { entries: sliceTiming.length, slices: nz } });
    const late = sliceTiming.findIndex((t) => t >= trSec);
    if (late >= 0) fail('SIDECAR_INVALID', `SliceTiming[${late}]: ${sliceTiming[late]} s is not inside the repetition time ${trSec} s (from the ${trSource})`, { file: sidecarPath! });
  }

  const events: BoldEvent[] | null = eventsPath === null ? null : await readEvents(eventsPath);
  if (events) {
    const endSec = nt * trSec;
    const beyond = events.map((e, i) => ({ e, i })).filter(({ e }) => e.onsetSec >= endSec);
    if (beyond.length > 0) {
      const first = beyond[0];
      fail('EVENTS_BEYOND_RUN', `${beyond.length} event(s) start at or after the end of the run (${nt} volumes x ${trSec} s = ${endSec} s); the first is event #${first.i + 1} (file order) at ${first.e.onsetSec} s`, {
        file: eventsPath!, details: { count: beyond.length, runEndSec: endSec, firstEvent: first.i + 1 },
      });
    }
  }

  return {
    volume: makeVolume({ ...volume, trSec }),
    sidecar,
    events,
    info,
    trSource,
    files: { image: path, sidecar: sidecarPath, events: eventsPath },
  };
}
