import { describe, expect, it } from 'vitest';
import { makeVolume } from '../../src/core/volume.js';
import { openRun } from '../../src/io/open-run.js';
import { meanImage } from '../../src/look/mean-image.js';
import { repeatedResampling, type RepeatedResamplingRow } from '../../src/resample/repeated-resampling.js';
import { highFrequencyEnergy } from '../../src/resample/high-frequency-energy.js';

// Fact of the trade (common practice, no source): after many successive resamplings nearest
// neighbour degrades most, trilinear blurs clearly, higher-order kernels least; one concatenated
// resampling of the whole transform beats any chain.
describe('repeated resampling of the demo mean image (9 degrees about z in 36 steps)', async () => {
  const run = await openRun(new URL('../../data-demo/sub-phantom01_task-flicker_bold.nii.gz', import.meta.url).pathname);
  const mean = Float32Array.from(meanImage(run.volume));
  const image = makeVolume({ ...run.volume, dims: [run.volume.dims[0], run.volume.dims[1], run.volume.dims[2], 1], data: mean });
  const study = repeatedResampling(image, { totalDeg: 9, steps: 36 });
  const row = (kernel: string, route: string) => study.rows.find((r) => r.kernel === kernel && r.route === route) as RepeatedResamplingRow;
  const chains = study.rows.filter((r) => r.route === 'chain');

  it('prints the table (for the record)', () => {
    console.log(study.rows.map((r) => `${r.kernel} ${r.route}: r ${r.correlation.toFixed(4)}, +FWHM ${r.addedFwhmMm.toFixed(2)} mm, high-frequency lost ${(100 * r.highFrequencyLost).toFixed(1)} %`).join('\n'));
    expect(study.rows).toHaveLength(8);
  });
  it('nearest neighbour degrades most: the lowest correlation of the chains', () => {
    for (const r of chains) if (r.kernel !== 'nearest') expect(row('nearest', 'chain').correlation).toBeLessThan(r.correlation);
  });
  it('trilinear blurs clearly: more added smoothness and more high-frequency energy lost than cubic and lanczos3', () => {
    for (const k of ['cubic', 'lanczos3']) {
      expect(row('linear', 'chain').addedFwhmMm).toBeGreaterThan(row(k, 'chain').addedFwhmMm);
      expect(row('linear', 'chain').highFrequencyLost).toBeGreaterThan(row(k, 'chain').highFrequencyLost);
      expect(row('linear', 'chain').correlation).toBeLessThan(row(k, 'chain').correlation);
    }
    // "clearly": the linear chain widens the image by more than a quarter voxel
    expect(row('linear', 'chain').addedFwhmMm).toBeGreaterThan(run.volume.spacingMm[0] / 4);
  });
  it('one concatenated resampling beats any chain, kernel by kernel and overall', () => {
    for (const k of ['nearest', 'linear', 'cubic', 'lanczos3']) expect(row(k, 'one-step').correlation).toBeGreaterThan(row(k, 'chain').correlation);
    const bestOneStep = Math.max(...study.rows.filter((r) => r.route === 'one-step').map((r) => r.correlation));
    for (const r of chains) expect(bestOneStep).toBeGreaterThan(r.correlation);
  });
});

describe('highFrequencyEnergy', () => {
  it('puts a checkerboard (Nyquist on every axis) all above half Nyquist and a slow cosine all below', () => {
    const dims: [number, number, number] = [8, 8, 4];
    const checker = Float64Array.from({ length: 256 }, (_, p) => ((p % 8) + Math.floor(p / 8) % 8 + Math.floor(p / 64)) % 2 ? 1 : -1);
    // exact sums of a few hundred terms: 1e-9
    expect(highFrequencyEnergy(checker, dims, null).fraction).toBeCloseTo(1, 9);
    const slow = Float64Array.from({ length: 256 }, (_, p) => Math.cos((2 * Math.PI * (p % 8)) / 8));
    expect(highFrequencyEnergy(slow, dims, null).fraction).toBeCloseTo(0, 9);
  });
});
