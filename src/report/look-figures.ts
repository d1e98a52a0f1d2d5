import type { Volume } from '../core/volume.js';
import type { LookResult } from '../look/look-at-run.js';
import { maskRings } from '../look/mask-rings.js';
import { voxelRasterRows } from '../look/voxel-raster-rows.js';
import { lookTracesSpec, voxelTimeCourseSpec } from './look-charts.js';
import { edgeSignatureSpec, fdTraceSpec, motionTableSpec } from './look-motion-charts.js';
import { renderSvg } from './render-svg.js';
import { sliceGridSvg } from './slice-grid-svg.js';
import { threePlaneSvg } from './three-plane-svg.js';
import { voxelRasterSvg } from './voxel-raster-figure.js';

/** One figure of a look, ready to write or display. */
export interface LookFigure {
  /** File name to use in an output folder. */
  file: string;
  /** What it shows (also its title). */
  title: string;
  kind: 'png' | 'svg';
  /** PNG bytes or SVG text. */
  data: Uint8Array | string;
}

/**
 * Voxels worth plotting over time: the strongest unexplained spikes, the mask's centre and a
 * mask-edge voxel level with it (edges show motion first).
 * @param look - the look
 * @returns up to four voxels with labels
 * @example voxelTimeCourseSpec(run.volume, look, chosenVoxels(look))
 */
export function chosenVoxels(look: LookResult): Array<{ ijk: [number, number, number]; label: string }> {
  const [nx, ny, nz] = look.dims;
  const out: Array<{ ijk: [number, number, number]; label: string }> = [];
  for (const f of look.findings) {
    if ((f.kind !== 'voxel-spike' && f.kind !== 'unstable-voxel') || out.length >= 2) continue;
    out.push({ ijk: f.voxels[0], label: f.kind === 'unstable-voxel' ? `unstable, ${f.volumes.length} volumes` : `spike, volume ${f.volumes[0]}` });
  }
  const centre = maskCentre(look);
  out.push({ ijk: centre, label: 'mask centre' });
  const rings = maskRings(look.mask.mask, [nx, ny, nz], 2, 0);
  for (let i = 0; i < nx; i++) {
    const v = i + nx * (centre[1] + ny * centre[2]);
    if (rings[v] === 1) { out.push({ ijk: [i, centre[1], centre[2]], label: 'mask edge' }); break; }
  }
  return out;
}

/**
 * The voxel nearest the mask's centre of mass that lies in the mask.
 * @param look - the look
 * @returns (i, j, k)
 * @example threePlaneSvg(look.maps.tsnr, maskCentre(look), { title: 'tSNR', unit: 'tSNR, dimensionless' })
 */
export function maskCentre(look: Pick<LookResult, 'dims' | 'mask'>): [number, number, number] {
  const [nx, ny] = look.dims;
  let si = 0, sj = 0, sk = 0, c = 0;
  const m = look.mask.mask;
  for (let v = 0; v < m.length; v++) {
    if (!m[v]) continue;
    const k = Math.floor(v / (nx * ny)), j = Math.floor((v - k * nx * ny) / nx), i = v - k * nx * ny - j * nx;
    si += i; sj += j; sk += k; c++;
  }
  const target = [si / c, sj / c, sk / c];
  let best: [number, number, number] = [Math.round(target[0]), Math.round(target[1]), Math.round(target[2])], bestD = Infinity;
  for (let v = 0; v < m.length; v++) {
    if (!m[v]) continue;
    const k = Math.floor(v / (nx * ny)), j = Math.floor((v - k * nx * ny) / nx), i = v - k * nx * ny - j * nx;
    const d = (i - target[0]) ** 2 + (j - target[1]) ** 2 + (k - target[2]) ** 2;
    if (d < bestD) { bestD = d; best = [i, j, k]; }
  }
  return best;
}

/**
 * Every figure of a look (SVG, text set as vector text): the mask outlined on the mean image and the
 * masked tSNR through the mask centre (three planes), axial grids of the mask on the mean image and of
 * the masked tSNR and SD (outside the mask drawn as background, the outline in every map), the voxel raster under the traces, the traces alone, voxel time
 * courses, and head motion (the motion table and framewise displacement when the look has a table,
 * the motion edge signature always). Titles say what each shows; every image has its unit and L/R marked.
 * @param run - the run that was looked at
 * @param look - its look
 * @returns the figures, in reading order
 * @example for (const f of await lookFigures(run.volume, look)) writeFileSync(f.file, f.data)
 */
export async function lookFigures(run: Volume, look: LookResult): Promise<LookFigure[]> {
  const centre = maskCentre(look);
  const mask = look.mask.mask;
  const kept = `volumes ${look.recommendation.dropInitialVolumes}-${look.dims[3] - 1}`;
  const drift = `order-${look.settings.detrendOrder} drift removed`;
  const maskWords = look.mask.source === 'otsu' ? 'automatic brain mask' : 'your brain mask';
  const figures: LookFigure[] = [
    { file: 'mask-planes.svg', title: `Brain mask (${look.mask.voxels} voxels) outlined on the mean image`, kind: 'svg', data: threePlaneSvg(look.maps.mean, centre, { title: `Brain mask outlined on the mean signal over ${kept}`, unit: 'mean signal, scanner units', colourMap: 'grey', mask, outside: 'show' }) },
    { file: 'tsnr-planes.svg', title: `tSNR: mean / SD over ${kept}, ${drift}`, kind: 'svg', data: threePlaneSvg(look.maps.tsnr, centre, { title: `tSNR inside the ${maskWords} (mean / SD over ${kept})`, unit: 'tSNR (mean / temporal SD), dimensionless', colourMap: 'viridis', mask }) },
    { file: 'mask-grid.svg', title: `Brain mask outlined on the mean image, axial slices`, kind: 'svg', data: sliceGridSvg(look.maps.mean, { title: `Brain mask (${look.mask.voxels} voxels) on the mean signal, axial slices`, unit: 'mean signal, scanner units', colourMap: 'grey', mask, outside: 'show' }) },
    { file: 'tsnr-grid.svg', title: `tSNR, axial slices (${drift})`, kind: 'svg', data: sliceGridSvg(look.maps.tsnr, { title: `tSNR inside the ${maskWords}, axial slices`, unit: 'tSNR (mean / temporal SD), dimensionless', colourMap: 'viridis', mask }) },
    { file: 'sd-grid.svg', title: `Temporal SD over ${kept}, ${drift}`, kind: 'svg', data: sliceGridSvg(look.maps.sd, { title: `Temporal SD inside the ${maskWords}, axial slices`, unit: 'temporal SD, scanner units', colourMap: 'magma', mask }) },
  ];
  const rows = voxelRasterRows(run, mask, { firstVolume: look.recommendation.dropInitialVolumes });
  figures.push({ file: 'voxel-raster.svg', title: 'Voxel raster: every sampled voxel by depth below the mask surface, per-volume measures fused on top', kind: 'svg', data: await voxelRasterSvg(look, rows) });
  figures.push({ file: 'traces.svg', title: 'Per-volume traces: global mean, standardised DVARS, DVARS %', kind: 'svg', data: await renderSvg(lookTracesSpec(look)) });
  figures.push({ file: 'voxel-time-courses.svg', title: 'Time courses of chosen voxels', kind: 'svg', data: await renderSvg(voxelTimeCourseSpec(run, look, chosenVoxels(look))) });
  // head motion: the table and its framewise displacement when the look has a table, the edge
  // signature always (it needs only the run and the mask)
  const motion = look.motion;
  if (motion.table) {
    figures.push({ file: 'motion-table.svg', title: `Motion table: shifts (mm) and rotations (degrees) against volume (${motion.source === 'estimated' ? 'estimated, ' : ''}${motion.method})`, kind: 'svg', data: await renderSvg(motionTableSpec(look)) });
    figures.push({ file: 'framewise-displacement.svg', title: `Framewise displacement against volume, threshold ${motion.fdThresholdMm} mm`, kind: 'svg', data: await renderSvg(fdTraceSpec(look)) });
  }
  if (motion.edgeSignature) figures.push({ file: 'edge-signature.svg', title: 'Motion edge signature: opposite-signed change at opposite edges of the brain mask, per voxel axis', kind: 'svg', data: await renderSvg(edgeSignatureSpec(look)) });
  return figures;
}
