import * as dfd from 'danfojs';
import type { LookResult } from './look-at-run.js';

/**
 * The look's findings as a danfo.js DataFrame, one row per finding (most consequential first): kind,
 * volumes, slices, voxel count, verdict, what it does to the analysis, reason, advice and the evidence
 * as JSON text (danfo cells hold scalars).
 * @param result - a look from lookAtRun
 * @returns the table (empty columns when nothing was found)
 * @example findingsTable(look).print()
 */
export function findingsTable(result: Pick<LookResult, 'findings'>): dfd.DataFrame {
  const columns = ['kind', 'volumes', 'slices', 'voxels', 'verdict', 'consequence', 'reason', 'advice', 'evidence'];
  const rows = result.findings.map((f) => [
    f.kind, f.volumes.join(' '), f.slices.join(' '), f.voxels.length, f.verdict, f.consequence, f.reason, f.advice, JSON.stringify(f.evidence),
  ]);
  return new dfd.DataFrame(rows, { columns });
}
