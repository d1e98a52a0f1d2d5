// Helpers that run Debian's nifti_tool (package nifti-bin) on files we wrote: an outside reader.
import { spawnSync } from 'node:child_process';
import { readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { findTool } from '../find-tool.js';

const NIFTI_TOOL = findTool('nifti_tool');
/** Whether nifti_tool is usable; tests that need it skip (the reason is printed) when it is not. */
export const HAVE_NIFTI_TOOL = NIFTI_TOOL.path !== null;

/** Run nifti_tool and return stdout+stderr; throws on a non-zero exit. */
export function niftiTool(args: string[]): string {
  const r = spawnSync(NIFTI_TOOL.path ?? 'nifti_tool', args, { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`nifti_tool ${args.join(' ')} failed: ${r.stdout}${r.stderr}`);
  return r.stdout + r.stderr;
}

/** Numbers printed by nifti_tool (whitespace separated), e.g. from -disp_ci or -disp_hdr -field. */
export function niftiToolNumbers(args: string[]): number[] {
  return niftiTool(args).trim().split(/\s+/).filter((t) => t.length > 0).map(Number);
}

/** Every voxel of a 4D file as nifti_tool reads it (stored values, before scl_slope/scl_inter). */
export function niftiToolVoxels(path: string): number[] {
  return niftiToolNumbers(['-disp_ci', '-1', '-1', '-1', '-1', '0', '0', '0', '-quiet', '-infiles', path]);
}

/**
 * The header as nifti_tool describes it in words: it copies the file to its ASCII form (.nia) and the
 * `name = 'value'` lines are returned (e.g. xyz_units_name, time_units_name, datatype_name).
 */
export function niftiToolDescription(path: string, scratchDir: string): Record<string, string> {
  const nia = join(scratchDir, `described-${process.pid}-${Math.random().toString(36).slice(2)}.nia`);
  niftiTool(['-copy_im', '-prefix', nia, '-infiles', path]);
  const text = readFileSync(nia, 'latin1');
  rmSync(nia, { force: true });
  const out: Record<string, string> = {};
  for (const m of text.matchAll(/^\s*(\w+) = '([^']*)'/gm)) out[m[1]] = m[2];
  return out;
}
