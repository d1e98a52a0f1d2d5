import { existsSync } from 'node:fs';
import { basename } from 'node:path';
import { summariseVolume } from '../core/summary.js';
import type { Run, Sidecar } from '../io/run-types.js';
import { fileFacts, type FileFacts, type MaskSource } from '../sweep/mask-source.js';

/** What a report and a decision record need to know about the run (no voxel data). */
export interface RunFacts {
  dims: [number, number, number, number];
  spacingMm: [number, number, number];
  trSec: number;
  trSource: string;
  /** One-line description (summariseVolume). */
  summary: string;
  /** The run's files: paths while the run is open; file names only once written to a sweep folder. */
  files: { image: string | null; sidecar: string | null; events: string | null };
  /** File name, SHA-256 and size of each input, filled in when the facts are written (see {@link privateRunFacts}). */
  inputs?: { image: FileFacts | null; sidecar: FileFacts | null; events: FileFacts | null };
  sidecar: Sidecar | null;
}

/**
 * The facts of an opened run.
 * @param run - a run from openRun (or any object with its fields)
 * @returns facts without voxel data
 * @example const facts = runFacts(await openRun(path))
 */
export function runFacts(run: Pick<Run, 'volume' | 'sidecar'> & Partial<Pick<Run, 'files' | 'trSource'>>): RunFacts {
  const v = run.volume;
  return {
    dims: [...v.dims], spacingMm: [...v.spacingMm], trSec: v.trSec, trSource: run.trSource ?? 'header', summary: summariseVolume(v),
    files: { image: run.files?.image ?? null, sidecar: run.files?.sidecar ?? null, events: run.files?.events ?? null },
    sidecar: run.sidecar,
  };
}

/**
 * Run facts fit to be written to a file: every input by file name, SHA-256 and size, never by its
 * folder (a local path can hold a participant's identity). Hashes are computed once, while the
 * files are at hand; facts already written are passed through.
 * @param facts - run facts (paths or names)
 * @returns the same facts with names only and `inputs` filled in
 * @example const safe = await privateRunFacts(runFacts(run))
 */
export async function privateRunFacts(facts: RunFacts): Promise<RunFacts> {
  const one = async (p: string | null, known: FileFacts | null | undefined): Promise<FileFacts | null> => {
    if (known) return { ...known, path: basename(known.path) };
    if (p === null || !existsSync(p)) return null;
    return { ...(await fileFacts(p)), path: basename(p) };
  };
  const inputs = {
    image: await one(facts.files.image, facts.inputs?.image),
    sidecar: await one(facts.files.sidecar, facts.inputs?.sidecar),
    events: await one(facts.files.events, facts.inputs?.events),
  };
  const name = (p: string | null) => (p === null ? null : basename(p));
  return { ...facts, files: { image: name(facts.files.image), sidecar: name(facts.files.sidecar), events: name(facts.files.events) }, inputs };
}

/**
 * Mask sources fit to be written to a file: a mask file by its name and SHA-256 only.
 * @param masks - brain, placement and exclude sources
 * @returns the same sources with file names instead of paths
 * @example privateMasks({ brain: { kind: 'otsu-mean' }, placement: { kind: 'brain' }, exclude: null })
 */
export function privateMasks<M extends { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null }>(masks: M): M {
  const one = (m: MaskSource): MaskSource => (m.kind === 'file' ? { ...m, file: { ...m.file, path: basename(m.file.path) } } : m);
  return { ...masks, brain: one(masks.brain), placement: one(masks.placement), exclude: masks.exclude ? one(masks.exclude) : null };
}
