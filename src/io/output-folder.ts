import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { mkdir, rm } from 'node:fs/promises';
import { basename, dirname, resolve, sep } from 'node:path';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from './atomic-write.js';

/**
 * Name of the marker file boldsweep keeps in every folder it writes. It lists the files (and, with a
 * trailing slash, the folders) that boldsweep wrote there; only those may ever be replaced.
 */
export const OUTPUT_MARKER = '.boldsweep-output.json';

/** Contents of the marker file. */
export interface OutputMarker {
  format: 'boldsweep-output';
  version: 1;
  /** Names inside the folder written by boldsweep ("cache/" for a folder), sorted. */
  files: string[];
  /** Named sets of files written together (e.g. "look"), so a later write of the set can retire files it no longer makes. */
  sets?: Record<string, string[]>;
}

/** Options of {@link claimOutputFolder}. */
export interface ClaimOptions {
  /** Accept a non-empty folder without the marker (boldsweep's files are added beside the others). __Default value:__ false */
  force?: boolean;
  /** Input files (or folders) of the command: the output may be neither their folder nor a folder holding them. */
  inputs?: Array<string | null | undefined>;
  /** Option name shown in messages. __Default value:__ '--out' */
  optionName?: string;
}

function isSameOrInside(child: string, parent: string): boolean {
  return child === parent || child.startsWith(parent.endsWith(sep) ? parent : parent + sep);
}

/**
 * Read a folder's marker, or null when it has none (or an unreadable one, which counts as none).
 * @param dir - the folder
 * @returns the marker or null
 * @example readOutputMarker('out/demo')?.files
 */
export function readOutputMarker(dir: string): OutputMarker | null {
  const path = resolve(dir, OUTPUT_MARKER);
  if (!existsSync(path)) return null;
  try {
    const m = JSON.parse(readFileSync(path, 'utf8')) as Partial<OutputMarker>;
    if (m.format !== 'boldsweep-output' || !Array.isArray(m.files)) return null;
    const sets: Record<string, string[]> = {};
    for (const [k, v] of Object.entries(m.sets ?? {})) if (Array.isArray(v)) sets[k] = v.filter((f): f is string => typeof f === 'string');
    return { format: 'boldsweep-output', version: 1, files: m.files.filter((f): f is string => typeof f === 'string'), sets };
  } catch {
    return null;
  }
}

/**
 * Check that boldsweep may write into a folder, then create it with its marker. Refused: the current
 * folder or one holding it; the folder of an input (or one holding an input), even with `force`; a
 * non-empty folder without boldsweep's marker unless `force` (folders inside it that carry the marker,
 * such as a sweep's stage cache, count as boldsweep's). Nothing is deleted here or later: a
 * command writes only its own files and replaces only files named in the marker.
 * @param dir - the output folder
 * @param options - force, inputs, option name for messages
 * @returns the absolute folder path
 * @throws BoldsweepError OUTPUT_IS_CURRENT_FOLDER, OUTPUT_IS_INPUT_FOLDER, OUTPUT_NOT_OURS, WRITE_FAILED
 * @example await claimOutputFolder('out/look', { inputs: [runPath] })
 */
export async function claimOutputFolder(dir: string, options: ClaimOptions = {}): Promise<string> {
  const abs = checkOutputFolder(dir, options);
  try {
    await mkdir(abs, { recursive: true });
  } catch (e) {
    fail('WRITE_FAILED', `cannot create the folder ${dir}`, { cause: e });
  }
  if (!readOutputMarker(abs)) await writeMarker(abs, []);
  return abs;
}

/**
 * The checks of {@link claimOutputFolder} without creating anything: call it before long work so a
 * refused folder is reported at once.
 * @param dir - the output folder
 * @param options - force, inputs, option name for messages
 * @returns the absolute folder path
 * @throws BoldsweepError OUTPUT_IS_CURRENT_FOLDER, OUTPUT_IS_INPUT_FOLDER, OUTPUT_NOT_OURS
 * @example checkOutputFolder('out/look', { inputs: [runPath] })
 */
export function checkOutputFolder(dir: string, options: ClaimOptions = {}): string {
  const opt = options.optionName ?? '--out';
  const abs = resolve(dir);
  const cwd = resolve('.');
  if (isSameOrInside(cwd, abs)) fail('OUTPUT_IS_CURRENT_FOLDER', `${opt} ${dir} is the current folder${abs === cwd ? '' : ' or holds it'}`);
  for (const input of options.inputs ?? []) {
    if (!input) continue;
    const inAbs = resolve(input);
    const guarded = existsSync(inAbs) && statSync(inAbs).isDirectory() ? inAbs : dirname(inAbs);
    if (isSameOrInside(guarded, abs)) {
      fail('OUTPUT_IS_INPUT_FOLDER', `${opt} ${dir} is ${guarded === abs ? 'the folder' : 'a folder holding'} of the input ${basename(inAbs)}${options.force ? ' (--force does not change this)' : ''}`);
    }
  }
  if (existsSync(abs)) {
    if (!statSync(abs).isDirectory()) fail('OUTPUT_NOT_OURS', `${opt} ${dir} is a file, not a folder`);
    // folders boldsweep wrote inside it (a sweep's stage cache, with its own marker) are its own too
    const entries = readdirSync(abs).filter((e) => {
      const p = resolve(abs, e);
      return !(statSync(p).isDirectory() && readOutputMarker(p));
    });
    const marker = readOutputMarker(abs);
    if (entries.length > 0 && !marker && !options.force) {
      fail('OUTPUT_NOT_OURS', `${opt} ${dir} is not empty (${entries.length} entr${entries.length === 1 ? 'y' : 'ies'}, e.g. ${entries.slice(0, 3).join(', ')}) and was not written by boldsweep (no ${OUTPUT_MARKER})`);
    }
  }
  return abs;
}

async function writeMarker(abs: string, files: string[], sets: Record<string, string[]> = {}): Promise<void> {
  const marker: OutputMarker = { format: 'boldsweep-output', version: 1, files: [...new Set(files)].sort(), sets };
  await writeFileAtomic(resolve(abs, OUTPUT_MARKER), JSON.stringify(marker, null, 1) + '\n');
}

/**
 * Name files in a claimed folder's marker before they are written. A name already present on disk
 * but missing from the marker belongs to someone else and is refused (even with --force).
 * @param dir - a folder claimed with {@link claimOutputFolder}
 * @param names - file names inside it ("cache/" for a folder)
 * @returns when the marker is updated
 * @throws BoldsweepError OUTPUT_FILE_NOT_OURS; OUTPUT_NOT_OURS when the folder was never claimed
 * @example await addOutputFiles('out/sweep', ['scorecard.tsv', 'sweep.json'])
 */
export async function addOutputFiles(dir: string, names: string[]): Promise<void> {
  const abs = resolve(dir);
  const marker = readOutputMarker(abs);
  if (!marker) fail('OUTPUT_NOT_OURS', `${dir} has no ${OUTPUT_MARKER}; claim the folder first`);
  const known = new Set(marker.files);
  const fresh = names.filter((n) => !known.has(n));
  for (const n of fresh) {
    if (existsSync(resolve(abs, n.replace(/\/$/, '')))) fail('OUTPUT_FILE_NOT_OURS', `${n} in ${dir} was not written by boldsweep, so it is not replaced`);
  }
  if (fresh.length) await writeMarker(abs, [...marker.files, ...fresh], marker.sets);
}

/**
 * Record the files a write set (e.g. "look") makes now, after {@link addOutputFiles} named them, and
 * delete the files the set made last time but not this time (they are boldsweep's own, named in the
 * marker). Nothing outside the marker is touched.
 * @param dir - a claimed folder
 * @param set - name of the set
 * @param names - the set's files now
 * @returns the names of the files retired
 * @example await settleOutputSet('out/look', 'look', files)
 */
export async function settleOutputSet(dir: string, set: string, names: string[]): Promise<string[]> {
  const abs = resolve(dir);
  const marker = readOutputMarker(abs);
  if (!marker) fail('OUTPUT_NOT_OURS', `${dir} has no ${OUTPUT_MARKER}; claim the folder first`);
  const sets = { ...(marker.sets ?? {}) };
  const now = new Set(names);
  const stale = (sets[set] ?? []).filter((n) => !now.has(n) && marker.files.includes(n) && !Object.entries(sets).some(([k, v]) => k !== set && v.includes(n)));
  for (const n of stale) await rm(resolve(abs, n), { force: true });
  sets[set] = [...names].sort();
  await writeMarker(abs, marker.files.filter((f) => !stale.includes(f)), sets);
  return stale;
}

/**
 * Claim a folder and name the files about to be written in it, in one call.
 * @param dir - output folder
 * @param names - file names inside it
 * @param options - as for {@link claimOutputFolder}
 * @returns the absolute folder path
 * @throws BoldsweepError as {@link claimOutputFolder} and {@link addOutputFiles}
 * @example await prepareOutputFiles('out/sweep', ['report.html'], { force })
 */
export async function prepareOutputFiles(dir: string, names: string[], options: ClaimOptions = {}): Promise<string> {
  const abs = await claimOutputFolder(dir, options);
  await addOutputFiles(abs, names);
  return abs;
}
