import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { decode } from 'fast-png';
import { describe, expect, it } from 'vitest';
import { affineFromRows } from '../../src/core/affine.js';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { colourTable } from '../../src/report/colour-map.js';
import { displayAxes, extractPlane } from '../../src/report/display-planes.js';
import { threePlanePng } from '../../src/report/three-plane-png.js';
import { writeLookFolder } from '../../src/report/write-look-folder.js';
import { syntheticRun } from '../look/synthetic-run.js';

describe('look figures', () => {
  it('puts the subject\'s left on the screen\'s left whatever the storage order (from the affine)', () => {
    // voxel i runs right-to-left in world x (negative first column, radiological storage)
    const affine = affineFromRows([[-3, 0, 0, 90], [0, 3, 0, -90], [0, 0, 3, -60]]);
    expect(displayAxes(affine)).toEqual({ axisOf: [0, 1, 2], positive: [false, true, true] });
    const values = new Float32Array(4 * 3 * 2).map((_, v) => v % 4); // value = i
    const plane = extractPlane(values, [4, 3, 2], [3, 3, 3], affine, 'axial', [0, 0, 0]);
    // leftmost screen column = most negative world x = largest i
    expect(plane.values[0]).toBe(3);
    expect(plane.edges).toEqual({ left: 'L', right: 'R', top: 'A', bottom: 'P' });
  });

  it('uses the published colour tables (viridis runs from #440154 to #fde725)', () => {
    // endpoints of viridis as published by van der Walt & Smith (2015) (from memory)
    const t = colourTable('viridis');
    expect(Array.from(t.subarray(0, 3))).toEqual([0x44, 0x01, 0x54]);
    expect(Array.from(t.subarray(765, 768))).toEqual([0xfd, 0xe7, 0x25]);
    expect(colourTable('diverging').length).toBe(768);
  });

  it('writes a three-plane PNG that decodes to an RGB image', () => {
    const run = syntheticRun({ dims: [20, 20, 10, 30] });
    const look = lookAtRun(run);
    const png = decode(threePlanePng(look.maps.tsnr, [10, 10, 5], { title: 'tSNR', unit: 'TSNR' }));
    expect(png.channels).toBe(3);
    expect(png.width).toBeGreaterThan(3 * 20 * 3 * 1.5 - 1);
  });

  it('writes the look folder whole: maps, figures, series and findings, no temp folder left', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'look-'));
    try {
      const run = syntheticRun({ dims: [20, 20, 10, 40], spikes: [{ ijk: [10, 10, 5], volume: 30, size: 200 }] });
      const look = lookAtRun(run);
      const out = join(dir, 'look');
      const files = await writeLookFolder(run, look, out, { source: 'synthetic' });
      for (const f of ['mean.nii.gz', 'sd.nii.gz', 'tsnr.nii.gz', 'mask.nii.gz', 'findings.json', 'series.tsv', 'voxel-raster.svg', 'tsnr-planes.png']) {
        expect(files).toContain(f);
        expect(existsSync(join(out, f))).toBe(true);
      }
      const json = JSON.parse(readFileSync(join(out, 'findings.json'), 'utf8'));
      const spike = json.findings.find((f: { kind: string }) => f.kind === 'voxel-spike');
      expect(spike.volumes).toEqual([30]);
      expect(spike.advice.length).toBeGreaterThan(10);
      expect(readFileSync(join(out, 'series.tsv'), 'utf8').split('\n')[0]).toMatch(/^volume\ttime_sec/);
      // a second write replaces the folder; nothing temporary remains beside it
      await writeLookFolder(run, look, out, { figures: false });
      expect(readdirSync(dir)).toEqual(['look']);
      expect(existsSync(join(out, 'tsnr-planes.png'))).toBe(false);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60000);
});
