import { describe, expect, it } from 'vitest';
import { blockResponseAt } from '../../src/simulate/block-response-at.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { quietSpec } from './phantom-helpers.js';

describe('the planted task response of the phantom', () => {
  const nVolumes = 40;
  const on = simulatePhantomRun(quietSpec({ nVolumes, activation: {} }));
  const off = simulatePhantomRun(quietSpec({ nVolumes }));
  const [nx, ny, nz] = on.volume.dims;
  const nVox = nx * ny * nz;
  const act = on.truth.activationPercent.data;
  const slices = on.sidecar.SliceTiming as number[];

  it('responds only in occipital grey matter, below the pure-grey-matter 2 % (partial volume at 7 mm)', () => {
    let peak = 0, peakY = 0;
    for (let v = 0; v < nVox; v++) {
      if (act[v] > peak) { peak = act[v]; peakY = Math.floor(v / nx) % ny; }
      if (act[v] > 0) expect(on.truth.tissueFractions['grey-matter'][v]).toBeGreaterThan(0);
    }
    // the patch is 2 % in pure grey matter at its centre; 7 mm voxels hold at most part grey matter
    expect(peak).toBeGreaterThan(0.5);
    expect(peak).toBeLessThan(2);
    // posterior: the patch lies in the back third of the grid (y grows to the front)
    expect(peakY).toBeLessThan(ny / 3);
  });

  it('each voxel changes by truth% x the HRF-convolved design read at its slice time', () => {
    const times = new Float64Array(nVolumes * nz);
    for (let n = 0; n < nVolumes; n++) for (let k = 0; k < nz; k++) times[n * nz + k] = 2 * n + slices[k];
    const x = blockResponseAt(on.events, times);
    let checked = 0;
    // from volume 10 on, every tissue is within 1e-8 of steady state, so the ratio isolates the response
    for (let n = 10; n < nVolumes; n++) {
      for (let v = 0; v < nVox; v++) {
        if (act[v] === 0) continue;
        const k = Math.floor(v / (nx * ny));
        const ratio = on.volume.data[n * nVox + v] / off.volume.data[n * nVox + v] - 1;
        // float32 voxel values: a few 1e-7 of the signal
        expect(Math.abs(ratio - (act[v] / 100) * x[n * nz + k])).toBeLessThan(1e-6);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(100);
  });

  it('slices read at different times within a TR see different responses on a rising edge', () => {
    // volume 12 (24 s) is 4 s into the first block (onset 20 s): the response is rising steeply
    const early = blockResponseAt(on.events, [24 + slices[0]])[0];
    const late = blockResponseAt(on.events, [24 + slices[1]])[0];
    expect(late - early).toBeGreaterThan(0.05);
  });
});
