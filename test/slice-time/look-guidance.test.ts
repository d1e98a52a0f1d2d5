import { describe, expect, it } from 'vitest';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { lookPageHtml } from '../../src/report/look-page.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { resolvePhantomSpec } from '../../src/simulate/phantom-spec.js';
import { quietSpec } from '../simulate/phantom-helpers.js';

describe('the look shows the slice-timing guidance for the run\'s TR', () => {
  it('a TR 2 s phantom: shifting reasonable, cardiac and respiration aliased, on the look page', () => {
    const phantom = simulatePhantomRun(resolvePhantomSpec(quietSpec({ nVolumes: 30 })));
    const look = lookAtRun({ volume: phantom.volume, sidecar: phantom.sidecar, events: null } as never);
    expect(look.sliceTiming!.advised).toBe('shift');
    expect(look.sliceTiming!.rhythms.map((r) => r.aliasedHz)).toEqual([0, expect.closeTo(0.2, 12)]);
    const html = lookPageHtml(look, [], 'phantom_bold.nii.gz');
    expect(html).toMatch(/Slice timing at TR 2 s:/);
    expect(html).toMatch(/respiration fluctuations near 0\.3 Hz appear at 0\.2 Hz/);
  });
});
