import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdir, rename, rm } from 'node:fs/promises';
import { basename, join } from 'node:path';
import type { Volume } from '../core/volume.js';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from '../io/atomic-write.js';
import { writeNifti } from '../io/nifti-write.js';
import { hashFile } from '../io/hash-file.js';
import { addOutputFiles, claimOutputFolder, settleOutputSet } from '../io/output-folder.js';
import type { LookResult } from '../look/look-at-run.js';
import { lookFigures } from './look-figures.js';
import { lookPageHtml } from './look-page.js';
import { FD_SPHERE_RADIUS_MM } from '../model/framewise-displacement.js';

/** The run a look was made from, as findings.json records it. */
export interface LookSource {
  /** File name (no folder). */
  file: string | null;
  /** SHA-256 of the file, or null when unknown. */
  sha256: string | null;
}

/**
 * The machine-readable summary of a look written as findings.json: settings, map summaries,
 * steady-state evidence, recommendation and every finding (kind, volumes or slices, evidence, advice).
 * @param look - the look
 * @param source - the run's file name and SHA-256 (a path string is cut to its file name: a local
 *   path can name the participant)
 * @returns a JSON-ready object
 * @example JSON.stringify(lookSummaryJson(look, { file: 'sub-01_bold.nii.gz', sha256: null }), null, 2)
 */
export function lookSummaryJson(look: LookResult, source: LookSource | string): Record<string, unknown> {
  const { onset, model, modelCount, perVoxel, dataCount } = look.steadyState;
  const src: LookSource = typeof source === 'string' ? { file: basename(source), sha256: null } : source;
  return {
    format: 'boldsweep-look',
    run: src.file,
    runSha256: src.sha256,
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
    motion: lookMotionJson(look),
    findings: look.findings,
  };
}

/** The motion part of findings.json: where the table came from, FD summary, edge signature size. */
function lookMotionJson(look: LookResult): Record<string, unknown> {
  const m = look.motion;
  const kept = m.fdMm ? Array.from(m.fdMm.subarray(look.recommendation.dropInitialVolumes + 1)) : [];
  const r = (x: number) => Math.round(x * 1e4) / 1e4;
  return {
    motionTable: m.source, method: m.method, fdThresholdMm: m.fdThresholdMm, fdSphereRadiusMm: FD_SPHERE_RADIUS_MM,
    volumesAboveThreshold: m.aboveThreshold,
    maxFdMm: kept.length ? r(Math.max(...kept)) : null, meanFdMm: kept.length ? r(kept.reduce((a, b) => a + b, 0) / kept.length) : null,
    edgeSignatureRmsPct: m.edgeSignature ? m.edgeSignature.rmsPct.map(r) : null,
    edgeSignatureAxes: 'voxel axes i, j, k of the run',
  };
}

/**
 * Per-volume traces as TSV text: volume, time, global mean, DVARS, standardised DVARS, robust z of
 * DVARS and of the global mean, whether the volume is dropped or censored, framewise displacement (mm;
 * n/a without a motion table) and the motion edge signature per voxel axis (%).
 * @param look - the look
 * @returns TSV with a header row
 * @example await writeFileAtomic('series.tsv', lookSeriesTsv(look))
 */
export function lookSeriesTsv(look: LookResult): string {
  const nt = look.dims[3];
  const censored = new Set(look.recommendation.censorVolumes);
  const f = (x: number) => (Number.isFinite(x) ? String(Math.round(x * 1e6) / 1e6) : 'n/a');
  const lines = ['volume\ttime_sec\tglobal_mean\tdvars\tdvars_standardised\tdvars_z\tglobal_z\tdropped\tcensored\tfd_mm\tedge_signature_i_pct\tedge_signature_j_pct\tedge_signature_k_pct'];
  const { fdMm, edgeSignature } = look.motion;
  for (let t = 0; t < nt; t++) {
    const s = look.series;
    const edge = edgeSignature ? edgeSignature.axes.map((a) => f(a[t])) : ['n/a', 'n/a', 'n/a'];
    lines.push([t, f(t * look.trSec), f(s.globalMean[t]), f(s.dvars[t]), f(s.dvarsStandardised[t]), f(s.dvarsZ[t]), f(s.globalZ[t]), t < look.recommendation.dropInitialVolumes ? 1 : 0, censored.has(t) ? 1 : 0, fdMm ? f(fdMm[t]) : 'n/a', ...edge].join('\t'));
  }
  return lines.join('\n') + '\n';
}

/** Options of {@link writeLookFolder}. */
export interface WriteLookOptions {
  /** The run's file path: its file name (never the folder) and SHA-256 go into findings.json. */
  source?: string;
  /** SHA-256 of the run's file (computed from `source` when missing and `source` is a file). */
  sourceSha256?: string;
  /** Write the figures. __Default value:__ true */
  figures?: boolean;
  /** Accept a non-empty folder boldsweep did not write (its files are left alone). __Default value:__ false */
  force?: boolean;
  /** Input files; the look may not go into their folder. __Default value:__ [source] */
  inputs?: Array<string | null | undefined>;
}

/**
 * Write a look to a folder, whole or not at all: every file is first built in a temporary folder
 * inside `outDir`, then moved into place one by one once all are complete. The folder may be new,
 * empty, or one boldsweep wrote (its marker names the files it may replace); files boldsweep did
 * not write are never touched, and files an earlier look wrote but this one does not (figures after
 * `figures: false`) are retired. Contents: mean/sd/tsnr/mask maps as NIfTI (.nii.gz, float32), the
 * figures (SVG), findings.json, series.tsv and look.html (findings, numbers and figures on one
 * self-contained page).
 * @param run - the run that was looked at
 * @param look - its look
 * @param outDir - destination folder
 * @param options - source file, figures, force, inputs (see {@link WriteLookOptions})
 * @returns the files written (names inside outDir)
 * @throws BoldsweepError OUTPUT_NOT_OURS, OUTPUT_FILE_NOT_OURS, OUTPUT_IS_INPUT_FOLDER, OUTPUT_IS_CURRENT_FOLDER, WRITE_FAILED
 * @example await writeLookFolder(run.volume, look, 'out/look', { source: run.files.image })
 */
export async function writeLookFolder(run: Volume, look: LookResult, outDir: string, options: WriteLookOptions = {}): Promise<string[]> {
  const target = await claimOutputFolder(outDir, { force: options.force, inputs: options.inputs ?? [options.source] });
  let sha: string | null = options.sourceSha256 ?? null;
  if (!sha && options.source && existsSync(options.source)) sha = await hashFile(options.source);
  const tmp = join(target, `.look.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
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
    const source = options.source ? { file: basename(options.source), sha256: sha } : { file: null, sha256: null };
    await writeFileAtomic(join(tmp, 'findings.json'), JSON.stringify(lookSummaryJson(look, source), null, 2) + '\n');
    files.push('series.tsv', 'findings.json');
    await addOutputFiles(target, files);
    for (const f of files) await rename(join(tmp, f), join(target, f));
    await settleOutputSet(target, 'look', files);
  } catch (e) {
    if (e instanceof Error && e.name === 'BoldsweepError') throw e;
    fail('WRITE_FAILED', `could not write the look to ${target}: ${(e as Error).message}`, { cause: e });
  } finally {
    await rm(tmp, { recursive: true, force: true });
  }
  return files;
}
