import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { describe, expect, it } from 'vitest';
import { readPhaseEncodePair } from '../../src/acquire/read-phase-encode-pair.js';
import { makeVolume } from '../../src/core/volume.js';
import { readNifti } from '../../src/io/nifti-read.js';
import { writeNifti } from '../../src/io/nifti-write.js';
import { join } from 'node:path';
import { cliB0 } from '../../src/cli/b0-inputs.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { openRun } from '../../src/io/open-run.js';

const demo = new URL('../../data-demo/', import.meta.url).pathname;
const runPath = join(demo, 'sub-phantom01_task-flicker_bold.nii.gz');

describe('a reversed phase-encode pair on another grid', () => {
  it('is carried onto the run through both affines, its direction taken in the run\'s axes', async () => {
    const run = await openRun(runPath);
    const pa = join(demo, 'sub-phantom01_dir-PA_epi.nii.gz'), ap = join(demo, 'sub-phantom01_dir-AP_epi.nii.gz');
    const direct = await readPhaseEncodePair([pa, ap], run.volume);
    // the same acquisition stored with its j axis reversed: data flipped along j, the j column of the
    // affine negated and the origin moved to the old last row; its own voxel axes now run the other
    // way, so its sidecar says j- for the same physical direction
    const { volume } = await readNifti(pa);
    const [nx, ny, nz, nt] = volume.dims;
    const flipped = new Float32Array(volume.data.length);
    for (let t = 0; t < nt; t++) for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
      flipped[i + nx * (ny - 1 - j + ny * (k + nz * t))] = volume.data[i + nx * (j + ny * (k + nz * t))];
    }
    const a = Float64Array.from(volume.affine);
    for (const r of [0, 1, 2]) { a[4 * r + 3] += a[4 * r + 1] * (ny - 1); a[4 * r + 1] = -a[4 * r + 1]; }
    const dir = mkdtempSync(join(tmpdir(), 'boldsweep-flip-'));
    try {
      const path = join(dir, 'sub-x_dir-PA_epi.nii.gz');
      await writeNifti(path, makeVolume({ ...volume, affine: a, data: flipped }));
      const sidecar = JSON.parse(readFileSync(join(demo, 'sub-phantom01_dir-PA_epi.json'), 'utf8'));
      writeFileSync(join(dir, 'sub-x_dir-PA_epi.json'), JSON.stringify({ ...sidecar, PhaseEncodingDirection: 'j-' }));
      const carried = await readPhaseEncodePair([path, ap], run.volume);
      expect(carried.directionA).toBe('j');
      // a pure flip lands on whole voxels: the image comes back to float32 rounding
      let d = 0;
      for (let v = 0; v < direct.imageA.length; v++) d = Math.max(d, Math.abs(carried.imageA[v] - direct.imageA[v]));
      expect(d).toBeLessThan(1e-3);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('the command line\'s B0 inputs (--field-map, --pe-pair, found beside the run)', () => {
  it('takes a field map first, then a pair, then what it finds; nothing without a search', async () => {
    const run = await openRun(runPath);
    const field = await cliB0(runPath, run, { fieldMap: join(demo, 'sub-phantom01_task-flicker_truth-fieldmap-hz.nii.gz'), find: true });
    expect(field!.source).toBe('the field map sub-phantom01_task-flicker_truth-fieldmap-hz.nii.gz');
    expect(field!.pair).toBeNull();
    const found = await cliB0(runPath, run, { find: true });
    expect(found!.source).toMatch(/reversed phase-encode pair sub-phantom01_dir-AP_epi.nii.gz and sub-phantom01_dir-PA_epi.nii.gz \(found beside the run\)/);
    expect(found!.pairUnwarped).not.toBeNull();
    const given = await cliB0(runPath, run, { pePair: `${join(demo, 'sub-phantom01_dir-PA_epi.nii.gz')},${join(demo, 'sub-phantom01_dir-AP_epi.nii.gz')}`, find: false });
    expect([given!.pair!.directionA, given!.pair!.directionB]).toEqual(['j', 'j-']);
    // the same field whichever image comes first: the matching is symmetric in A and B (measured: 0 Hz;
    // 1e-3 Hz allows for float32 rounding)
    let d = 0;
    for (let v = 0; v < given!.fieldMapHz.length; v++) d = Math.max(d, Math.abs(given!.fieldMapHz[v] - found!.fieldMapHz[v]));
    expect(d).toBeLessThan(1e-3);
    expect(await cliB0(runPath, run, { find: false })).toBeNull();
    let code = '';
    try { await cliB0(runPath, run, { pePair: join(demo, 'sub-phantom01_dir-PA_epi.nii.gz'), find: false }); } catch (e) { code = isBoldsweepError(e) ? e.code : String(e); }
    expect(code).toBe('INVALID_ARGUMENT');
    // two images with the same direction are not a reversed pair
    code = '';
    try { await cliB0(runPath, run, { pePair: `${join(demo, 'sub-phantom01_dir-PA_epi.nii.gz')},${join(demo, 'sub-phantom01_dir-PA_epi.nii.gz')}`, find: false }); } catch (e) { code = isBoldsweepError(e) ? e.code : String(e); }
    expect(code).toBe('PHASE_ENCODE_PAIR_INVALID');
  }, 120_000);
});
