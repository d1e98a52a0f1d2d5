import { basename } from 'node:path';
import { fail } from '../core/fail.js';
import type { Affine } from '../core/affine.js';
import type { Grid } from '../core/grid-frame.js';
import { makeVolume, voxelsPerVolume, type Volume } from '../core/volume.js';
import { sameGridWithin } from '../resample/plan-resample.js';
import { fieldMapOnGrid } from './field-map-on-grid.js';
import { readNifti } from '../io/nifti-read.js';
import { b0Readout } from './b0-readout.js';
import { checkPhaseEncodePair, type PhaseEncodePair } from './phase-encode-pair.js';
import { sidecarBeside } from './sidecar-beside.js';

/**
 * Read a reversed phase-encode pair for a run: two EPI images (BIDS `_dir-<label>_epi`), each
 * averaged over its volumes, with PhaseEncodingDirection and TotalReadoutTime (or
 * EffectiveEchoSpacing) from their sidecars. An image on another grid is carried onto the run's
 * through both affines (trilinear, {@link fieldMapOnGrid}) when its phase-encode axis runs along the
 * same world direction as the run's axis of that index (within 8 degrees; its sense is then taken in
 * the run's voxel axes), so the displacement is still along the run's lines.
 * @param paths - the two images (.nii or .nii.gz; their .json sidecars beside them)
 * @param run - the run's volume
 * @param runHasAffine - whether the run's header gave an sform or qform. __Default value:__ true
 * @returns the pair on the run's grid, image A the first path's
 * @throws BoldsweepError GRID_MISMATCH for an image on another grid without affines or along another
 *   axis; PHASE_ENCODE_MISSING, PHASE_ENCODE_INVALID, READOUT_TIME_MISSING naming the image;
 *   PHASE_ENCODE_PAIR_INVALID
 * @example const pair = await readPhaseEncodePair(['sub-01_dir-AP_epi.nii.gz', 'sub-01_dir-PA_epi.nii.gz'], run.volume)
 */
export async function readPhaseEncodePair(paths: readonly [string, string], run: Volume, runHasAffine = true): Promise<PhaseEncodePair> {
  const n = voxelsPerVolume(run);
  const runGrid: Grid = { dims: [run.dims[0], run.dims[1], run.dims[2]], affine: run.affine };
  const parts = [];
  for (const path of paths) {
    const { volume, info } = await readNifti(path);
    const readout = b0Readout(await sidecarBeside(path), volume.dims, {}, basename(path));
    const m = voxelsPerVolume(volume);
    const nt = volume.dims[3];
    const own = new Float32Array(m);
    for (let t = 0; t < nt; t++) for (let v = 0; v < m; v++) own[v] += volume.data[t * m + v] / nt;
    const grid: Grid = { dims: [volume.dims[0], volume.dims[1], volume.dims[2]], affine: volume.affine };
    let mean = own;
    let sign = readout.phaseEncodeSign;
    if (!sameGridWithin(grid, runGrid)) {
      const hasAffine = runHasAffine && info.transformSource !== 'pixdim';
      const ax = readout.phaseEncodeAxis;
      const col = (a: Affine) => [a[ax], a[4 + ax], a[8 + ax]];
      const p = col(volume.affine), r = col(run.affine);
      const cos = (p[0] * r[0] + p[1] * r[1] + p[2] * r[2]) / (Math.hypot(...p) * Math.hypot(...r));
      if (!hasAffine || !(Math.abs(cos) >= Math.cos((8 * Math.PI) / 180))) {
        fail('GRID_MISMATCH', `${basename(path)} (${grid.dims.join(' x ')}) is not on the run's grid (${runGrid.dims.join(' x ')})${hasAffine ? ` and its phase-encode axis does not run along the run's axis ${['i', 'j', 'k'][ax]}` : ' and a header lacks the sform/qform to place it'}`, { file: path });
      }
      mean = fieldMapOnGrid(makeVolume({ dims: [...grid.dims, 1], spacingMm: [...volume.spacingMm], trSec: 0, affine: volume.affine, data: own }), runGrid, { field: true, run: true });
      // the image's axis may point the other way in world space than the run's axis of that index
      if (cos < 0) sign = sign === 1 ? -1 : 1;
    }
    parts.push({ mean, readout, direction: `${['i', 'j', 'k'][readout.phaseEncodeAxis]}${sign < 0 ? '-' : ''}` });
  }
  const [a, b] = parts;
  if (Math.abs(a.readout.totalReadoutTimeSec - b.readout.totalReadoutTimeSec) > 1e-6 * a.readout.totalReadoutTimeSec) {
    fail('PHASE_ENCODE_PAIR_INVALID', `the pair's TotalReadoutTime differ: ${a.readout.totalReadoutTimeSec} s and ${b.readout.totalReadoutTimeSec} s`);
  }
  const pair: PhaseEncodePair = { imageA: a.mean, imageB: b.mean, directionA: a.direction, directionB: b.direction, totalReadoutTimeSec: a.readout.totalReadoutTimeSec };
  checkPhaseEncodePair(pair, n);
  return pair;
}

