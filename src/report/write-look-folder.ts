import { randomBytes } from 'node:crypto';
import { mkdir, rename, rm, stat } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import type { Volume } from '../core/volume.js';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { writeNifti } from '../io/nifti-write.js';
import type { LookResult } from '../look/look-at-run.js';
import { lookFigures } from './look-figures.js';
import { lookPageHtml } from './look-page.js';

/**
 * The machine-readable summary of a look written as findings.json: settings, map summaries,
 * steady-state evidence, recommendation and every finding (kind, volumes or slices, evidence, advice).
 * @param look - the look
 * @param source - the run's file path (or a label)
 * @returns a JSON-ready object
 * @example JSON.stringify(lookSummaryJson(look, 'sub-01_bold.nii.gz'), null, 2)
 */
export function lookSummaryJson(look: LookResult, source: string): Record<string, unknown> {
  const { onset, model, modelCount, perVoxel, dataCount } = look.steadyState;
  return {
    run: source,
    dims: look.dims,
    trSec: look.trSec,
    indexing: 'volumes, slices and voxels are 0-based',
    settings: look.settings,
    mask: { source: look.mask.source, method: look.mask.method, voxels: look.mask.voxels, otsuThreshold: look.mask.threshold, steps: look.mask.steps },
    skipped: look.skipped,
    summariesInMask: look.summaries,
    steadyState: { dataCount, cutoffZ: onset.cutoffZ, referenceVolumes: onset.reference, modelCount, model, perVoxel },
    dvarsNullExpectation: look.series.dvarsNullExpectation,
    dvarsFromFewVoxels: look.dvarsFromFewVoxels,
    recommendation: look.recommendation,
    findings: look.findings,
  };
}

/**
 * Per-volume traces as TSV text: volume, time, global mean, DVARS, standardised DVARS, robust z of
 * DVARS and of the global mean, and whether the volume is dropped or censored.
 * @param look - the look
 * @returns TSV with a header row
 * @example await writeFileAtomic('series.tsv', lookSeriesTsv(look))
 */
export function lookSeriesTsv(look: LookResult): string {
  const nt = look.dims[3];
  const censored = new Set(look.recommendation.censorVolumes);
  const f = (x: number) => (Number.isFinite(x) ? String(Math.round(x * 1e6) / 1e6) : 'n/a');
  const lines = ['volume\ttime_sec\tglobal_mean\tdvars\tdvars_standardised\tdvars_z\tglobal_z\tdropped\tcensored'];
  for (let t = 0; t < nt; t++) {
    const s = look.series;
    lines.push([t, f(t * look.trSec), f(s.globalMean[t]), f(s.dvars[t]), f(s.dvarsStandardised[t]), f(s.dvarsZ[t]), f(s.globalZ[t]), t < look.recommendation.dropInitialVolumes ? 1 : 0, censored.has(t) ? 1 : 0].join('\t'));
  }
  return lines.join('\n') + '\n';
}

/**
 * Write a look to a folder, whole or not at all: everything is built in a temporary folder beside
 * `outDir` and renamed into place at the end (an existing `outDir` is replaced only then). Contents:
 * mean/sd/tsnr/mask maps as NIfTI (.nii.gz, float32), the figures (SVG), findings.json, series.tsv
 * and look.html (findings, numbers and figures on one self-contained page).
 * @param run - the run that was looked at
 * @param look - its look
 * @param outDir - destination folder
 * @param options - source: the run's path for findings.json; figures (default true)
 * @returns the files written (names inside outDir)
 * @throws BoldsweepError WRITE_FAILED when the parent folder is missing or not writable
 * @example await writeLookFolder(run.volume, look, 'out/look', { source: run.files.image })
 */
export async function writeLookFolder(run: Volume, look: LookResult, outDir: string, options: { source?: string; figures?: boolean } = {}): Promise<string[]> {
  const target = resolve(outDir);
  const parent = dirname(target);
  try {
    await mkdir(parent, { recursive: true });
  } catch (e) {
    fail('WRITE_FAILED', `cannot create the folder ${parent}`, { cause: e });
  }
  const tmp = join(parent, `.${basename(target)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  const files: string[] = [];
  try {
    await mkdir(tmp);
    for (const [name, map] of Object.entries({ mean: look.maps.mean, sd: look.maps.sd, tsnr: look.maps.tsnr, mask: look.maps.mask })) {
      await writeNifti(join(tmp, `${name}.nii.gz`), map, { datatype: 'float32', description: `boldsweep look: ${name}` });
      files.push(`${name}.nii.gz`);
    }
    const figures = options.figures !== false ? await lookFigures(run, look) : [];
    for (const fig of figures) {
      await writeFileAtomic(join(tmp, fig.file), fig.data);
      files.push(fig.file);
    }
    await writeFileAtomic(join(tmp, 'look.html'), lookPageHtml(look, figures, options.source ?? 'in memory'));
    files.push('look.html');
    await writeFileAtomic(join(tmp, 'series.tsv'), lookSeriesTsv(look));
    await writeFileAtomic(join(tmp, 'findings.json'), JSON.stringify(lookSummaryJson(look, options.source ?? 'in memory'), null, 2) + '\n');
    files.push('series.tsv', 'findings.json');
    const existing = await stat(target).then(() => true, () => false);
    if (existing) {
      const old = `${tmp}.old`;
      await rename(target, old);
      await rename(tmp, target);
      await rm(old, { recursive: true, force: true });
    } else {
      await rename(tmp, target);
    }
  } catch (e) {
    await rm(tmp, { recursive: true, force: true });
    if (e instanceof Error && e.name === 'BoldsweepError') throw e;
    fail('WRITE_FAILED', `could not write the look to ${target}: ${(e as Error).message}`, { cause: e });
  }
  return files;
}
