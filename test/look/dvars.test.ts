import { describe, expect, it } from 'vitest';
import { diagonalAffine } from '../../src/core/affine.js';
import { makeVolume } from '../../src/core/volume.js';
import { maskSeries } from '../../src/look/mask-series.js';
import { dvarsNullExpectation, standardisedDvars } from '../../src/look/standardised-dvars.js';
import { trimmedDvars } from '../../src/look/trimmed-dvars.js';

describe('DVARS', () => {
  it('matches the worked example from the published definition', () => {
    // Smyser et al. 2010 Cereb Cortex 20:2852; Power et al. 2012 NeuroImage 59:2142: DVARS_i =
    // sqrt(mean over voxels (I_i - I_{i-1})^2); REFERENCES.md §4: [100,200,300,400] -> [101,198,303,400]
    // gives differences 1, -2, 3, 0 -> sqrt(14/4) = sqrt(3.5) = 1.8708287.
    const data = new Float32Array([100, 200, 300, 400, 101, 198, 303, 400]);
    const run = makeVolume({ dims: [4, 1, 1, 2], spacingMm: [1, 1, 1], trSec: 2, affine: diagonalAffine([1, 1, 1]), data });
    const s = maskSeries(run, new Uint8Array([1, 1, 1, 1]), { minSliceVoxels: 1 });
    expect(s.dvars[0]).toBeNaN();
    expect(s.dvars[1]).toBeCloseTo(1.8708287, 7);
    expect(s.globalMean[1]).toBeCloseTo(250.5, 10);
    // leaving out the largest change (voxel 2: 3^2) leaves sqrt((1 + 4 + 0)/3)
    expect(trimmedDvars(run, new Uint8Array([1, 1, 1, 1]), 1, 1).dvars).toBeCloseTo(Math.sqrt(5 / 3), 10);
  });

  it('standardises by the Afyouni & Nichols (2018) null expectation', () => {
    // Afyouni S & Nichols TE (2018) NeuroImage 172:291-312: E[DVARS^2] = mean_i 2 sigma_i^2 (1 - rho_i);
    // REFERENCES.md §4: sigma (10, 20), rho (0.5, 0.8) -> (100 + 160) / 2 = 130; 17.1 / sqrt(130) = 1.49977.
    const e = dvarsNullExpectation([10, 20], [0.5, 0.8]);
    expect(e).toBeCloseTo(130, 12);
    expect(standardisedDvars([NaN, 17.1], e)[1]).toBeCloseTo(1.49977, 5);
  });

  it('refuses a null expectation when nothing varies', () => {
    expect(() => dvarsNullExpectation([0, 0], [0, 0])).toThrowError(/no voxel/);
  });
});
