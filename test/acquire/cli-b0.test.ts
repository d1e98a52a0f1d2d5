import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { cliB0 } from '../../src/cli/b0-inputs.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { openRun } from '../../src/io/open-run.js';

const demo = new URL('../../data-demo/', import.meta.url).pathname;
const runPath = join(demo, 'sub-phantom01_task-flicker_bold.nii.gz');

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
