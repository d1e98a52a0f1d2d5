import { basename } from 'node:path';
import { fail } from '../core/fail.js';
import { voxelsPerVolume, type Volume } from '../core/volume.js';
import { readNifti } from '../io/nifti-read.js';
import { b0Readout } from './b0-readout.js';
import { checkPhaseEncodePair, type PhaseEncodePair } from './phase-encode-pair.js';
import { sidecarBeside } from './sidecar-beside.js';

/**
 * Read a reversed phase-encode pair for a run: two EPI images (BIDS `_dir-<label>_epi`) on the run's
 * grid, each averaged over its volumes, with PhaseEncodingDirection and TotalReadoutTime (or
 * EffectiveEchoSpacing) from their sidecars.
 * @param paths - the two images (.nii or .nii.gz; their .json sidecars beside them)
 * @param run - the run's volume
 * @returns the pair, image A the first path's
 * @throws BoldsweepError GRID_MISMATCH for an image on another grid; PHASE_ENCODE_MISSING,
 *   PHASE_ENCODE_INVALID, READOUT_TIME_MISSING naming the image; PHASE_ENCODE_PAIR_INVALID
 * @example const pair = await readPhaseEncodePair(['sub-01_dir-AP_epi.nii.gz', 'sub-01_dir-PA_epi.nii.gz'], run.volume)
 */
export async function readPhaseEncodePair(paths: readonly [string, string], run: Volume): Promise<PhaseEncodePair> {
  const n = voxelsPerVolume(run);
  const parts = [];
  for (const path of paths) {
    const { volume } = await readNifti(path);
    if (voxelsPerVolume(volume) !== n || volume.dims.slice(0, 3).some((d, a) => d !== run.dims[a]) || Array.from(volume.affine).some((x, i) => Math.abs(x - run.affine[i]) > 1e-4)) {
      fail('GRID_MISMATCH', `${basename(path)} (${volume.dims.slice(0, 3).join(' x ')}) is not on the run's grid (${run.dims.slice(0, 3).join(' x ')})`, { file: path });
    }
    const readout = b0Readout(await sidecarBeside(path), volume.dims, {}, basename(path));
    const mean = new Float32Array(n);
    const nt = volume.dims[3];
    for (let t = 0; t < nt; t++) for (let v = 0; v < n; v++) mean[v] += volume.data[t * n + v] / nt;
    parts.push({ mean, readout, direction: `${['i', 'j', 'k'][readout.phaseEncodeAxis]}${readout.phaseEncodeSign < 0 ? '-' : ''}` });
  }
  const [a, b] = parts;
  if (Math.abs(a.readout.totalReadoutTimeSec - b.readout.totalReadoutTimeSec) > 1e-6 * a.readout.totalReadoutTimeSec) {
    fail('PHASE_ENCODE_PAIR_INVALID', `the pair's TotalReadoutTime differ: ${a.readout.totalReadoutTimeSec} s and ${b.readout.totalReadoutTimeSec} s`);
  }
  const pair: PhaseEncodePair = { imageA: a.mean, imageB: b.mean, directionA: a.direction, directionB: b.direction, totalReadoutTimeSec: a.readout.totalReadoutTimeSec };
  checkPhaseEncodePair(pair, n);
  return pair;
}

