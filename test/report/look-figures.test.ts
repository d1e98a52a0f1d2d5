import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { decode } from 'fast-png';
import { describe, expect, it } from 'vitest';
import { affineFromRows } from '../../src/core/affine.js';
import { lookAtRun } from '../../src/look/look-at-run.js';
import { colourTable } from '../../src/report/colour-map.js';
import { displayAxes, extractPlane } from '../../src/report/display-planes.js';
import { OUTSIDE_MASK_RGB, renderPlane } from '../../src/report/plane-panel.js';
import { sliceGridSvg } from '../../src/report/slice-grid-svg.js';
import { threePlaneSvg } from '../../src/report/three-plane-svg.js';
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

  it('sets every word of a map figure as vector text in a real font, case kept, around embedded section images', () => {
    const run = syntheticRun({ dims: [20, 20, 10, 30] });
    const look = lookAtRun(run);
    const svg = threePlaneSvg(look.maps.tsnr, [10, 10, 5], { title: 'tSNR inside the mask', unit: 'tSNR (mean / temporal SD), dimensionless', mask: look.mask.mask });
    const texts = [...svg.matchAll(/<text[^>]*font-family="([^"]*)"[^>]*>([^<]*)<\/text>/g)];
    expect(texts.map((m) => m[2])).toEqual(expect.arrayContaining(['tSNR inside the mask', 'tSNR (mean / temporal SD), dimensionless', 'brain mask outline', 'L', 'R', 'A', 'P', 'S', 'I']));
    expect(texts.every((m) => m[1].includes('DejaVu Sans'))).toBe(true);
    const images = [...svg.matchAll(/href="data:image\/png;base64,([^"]+)"/g)].map((m) => decode(Buffer.from(m[1], 'base64')));
    expect(images.length).toBe(4); // three sections and the colour strip
    expect(images[0].width).toBeGreaterThan(20 * 3 * 1.5 - 2);
  });

  it('draws voxels outside the mask as background (not the lowest colour) and the mask outline, in every map', () => {
    const values = new Float32Array([5, 5, 5, 5, 1, 9, 5, 5, 5]); // 3 x 3 section
    const mask = new Uint8Array([0, 0, 0, 0, 1, 1, 0, 0, 0]);
    const plane = { plane: 'axial' as const, values, width: 3, height: 3, pixelMm: [2, 2] as [number, number], edges: { left: 'L', right: 'R', top: 'A', bottom: 'P' }, index: 0, pointColumn: 1, pointRow: 1 };
    const img = renderPlane(plane, { min: 1, max: 9, colourMap: 'viridis' }, { pixelsPerMm: 4, maskPlane: mask });
    const px = (x: number, y: number) => Array.from(img.data.subarray(3 * (y * img.width + x), 3 * (y * img.width + x) + 3));
    expect(px(2, 2)).toEqual([...OUTSIDE_MASK_RGB]); // outside the mask, value 5
    expect(px(12, 12)).toEqual(Array.from(colourTable('viridis').subarray(0, 3))); // inside, the lowest value
    const outlined = renderPlane(plane, { min: 1, max: 9, colourMap: 'viridis' }, { pixelsPerMm: 4, maskPlane: mask, outline: [255, 0, 0] });
    expect(Array.from(outlined.data.subarray(3 * (8 * 24 + 8), 3 * (8 * 24 + 8) + 3))).toEqual([255, 0, 0]); // first mask pixel is on its edge
    // the SD grid and the tSNR grid get the same mask treatment
    const run = syntheticRun({ dims: [20, 20, 10, 30] });
    const look = lookAtRun(run);
    for (const map of [look.maps.sd, look.maps.tsnr]) expect(sliceGridSvg(map, { title: 't', unit: 'u', mask: look.mask.mask })).toContain('brain mask outline');
  });

  it('writes the look folder whole: maps, figures, series and findings, no temp folder left', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'look-'));
    try {
      const run = syntheticRun({ dims: [20, 20, 10, 40], spikes: [{ ijk: [10, 10, 5], volume: 30, size: 200 }] });
      const look = lookAtRun(run);
      const out = join(dir, 'look');
      const files = await writeLookFolder(run, look, out, { source: 'synthetic' });
      for (const f of ['mean.nii.gz', 'sd.nii.gz', 'tsnr.nii.gz', 'mask.nii.gz', 'findings.json', 'series.tsv', 'voxel-raster.svg', 'tsnr-planes.svg', 'mask-planes.svg', 'look.html']) {
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
      expect(existsSync(join(out, 'tsnr-planes.svg'))).toBe(false);
      expect(existsSync(join(out, 'look.html'))).toBe(true); // the page is written without figures too
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60000);
});
