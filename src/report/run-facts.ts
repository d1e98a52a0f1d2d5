import { summariseVolume } from '../core/summary.js';
import type { Run, Sidecar } from '../io/run-types.js';

/** What a report and a decision record need to know about the run (no voxel data). */
export interface RunFacts {
  dims: [number, number, number, number];
  spacingMm: [number, number, number];
  trSec: number;
  trSource: string;
  /** One-line description (summariseVolume). */
  summary: string;
  files: { image: string | null; sidecar: string | null; events: string | null };
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
