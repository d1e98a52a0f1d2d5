import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { fail } from '../core/fail.js';
import type { StudyRuns } from './spec.js';

/**
 * The files of a study's further runs, from the spec's `study.runs`: a list of NIfTI files, or a BIDS
 * folder and task name (every sub-*\/func/sub-*_task-<task>[_...]_bold.nii[.gz], subjects and runs in
 * name order). Relative paths are taken from the spec file's folder. The sweep's own run is left out
 * when it is among them (it is subject 1's).
 * @param runs - the spec's study.runs (null: none)
 * @param specFile - path of the spec file (relative paths start from its folder)
 * @param ownRun - path of the sweep's own run
 * @returns absolute paths, in a stable order
 * @throws BoldsweepError STUDY_RUNS_MISSING when a listed file, the BIDS folder or any matching run is missing
 * @example studyRunPaths({ bids: '../bids', task: 'motor' }, 'specs/study.yaml', 'bids/sub-01/func/sub-01_task-motor_bold.nii.gz')
 */
export function studyRunPaths(runs: StudyRuns, specFile: string, ownRun: string): string[] {
  if (runs === null) return [];
  const base = dirname(resolve(specFile));
  const at = (p: string) => (isAbsolute(p) ? p : join(base, p));
  let paths: string[];
  if (Array.isArray(runs)) {
    paths = runs.map(at);
    const missing = paths.filter((p) => !existsSync(p));
    if (missing.length) fail('STUDY_RUNS_MISSING', `study.runs lists ${missing.length} file(s) that do not exist (${missing.slice(0, 3).join(', ')}; relative paths are taken from the spec's folder)`);
  } else {
    const root = at(runs.bids);
    if (!existsSync(root) || !statSync(root).isDirectory()) fail('STUDY_RUNS_MISSING', `study.runs.bids: ${root} is not a folder`);
    const pattern = new RegExp(`^sub-[A-Za-z0-9]+(_ses-[A-Za-z0-9]+)?_task-${runs.task.replace(/[^A-Za-z0-9]/g, '')}(_[A-Za-z]+-[A-Za-z0-9]+)*_bold\\.nii(\\.gz)?$`);
    paths = [];
    for (const sub of readdirSync(root).filter((d) => /^sub-/.test(d)).sort()) {
      const sessions = readdirSync(join(root, sub)).filter((d) => /^ses-/.test(d)).sort();
      for (const folder of [join(root, sub, 'func'), ...sessions.map((s) => join(root, sub, s, 'func'))]) {
        if (!existsSync(folder)) continue;
        for (const f of readdirSync(folder).sort()) if (pattern.test(f)) paths.push(join(folder, f));
      }
    }
    if (!paths.length) fail('STUDY_RUNS_MISSING', `no sub-*/func/*_task-${runs.task}_bold.nii.gz under ${root}`);
  }
  const own = resolve(ownRun);
  return paths.filter((p) => resolve(p) !== own);
}
