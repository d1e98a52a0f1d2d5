import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fail } from '../core/fail.js';
import type { Finding } from '../look/finding-types.js';

/** What a sweep and a starting spec need from a look folder (its findings.json). */
export interface LookFolderFacts {
  /** File name of the run the look was made from. */
  runFile: string | null;
  /** SHA-256 of that file (null in a folder written before hashes were recorded). */
  runSha256: string | null;
  dims: [number, number, number, number];
  trSec: number;
  /** Initial volumes the look recommends dropping. */
  dropInitialVolumes: number;
  /** Volumes the look recommends censoring (0-based in the run as opened). */
  censorVolumes: number[];
  /** Why, one line per reason. */
  why: string[];
  findings: Finding[];
  /** Volumes above the look's framewise-displacement threshold (empty when the look had no motion table). */
  movedVolumes: number[];
  /** That threshold, mm (null in a folder written before the look reported motion). */
  fdThresholdMm: number | null;
}

/**
 * Read the findings of a look folder written by `boldsweep look` (or `writeLookFolder`).
 * @param dir - the look folder
 * @returns the run's name and hash, its size and TR, the recommendation and the findings
 * @throws BoldsweepError FILE_NOT_FOUND when findings.json is missing; INVALID_ARGUMENT when it is not a look's
 * @example const look = readLookFolder('out/look'); look.dropInitialVolumes
 */
export function readLookFolder(dir: string): LookFolderFacts {
  const path = join(dir, 'findings.json');
  if (!existsSync(path)) fail('FILE_NOT_FOUND', `${path} is missing; is ${dir} a folder written by "boldsweep look <run> --out ${dir}"?`);
  let json: Record<string, unknown>;
  try {
    json = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
  } catch (e) {
    fail('INVALID_ARGUMENT', `${path} is not JSON (${(e as Error).message})`, { file: path, cause: e });
  }
  const rec = json.recommendation as { dropInitialVolumes?: unknown; censorVolumes?: unknown; why?: unknown } | undefined;
  const dims = json.dims as number[] | undefined;
  if (!rec || typeof rec.dropInitialVolumes !== 'number' || !Array.isArray(rec.censorVolumes) || !Array.isArray(dims) || dims.length !== 4 || typeof json.trSec !== 'number') {
    fail('INVALID_ARGUMENT', `${path} is not the findings of a boldsweep look (recommendation, dims or trSec missing)`, { file: path });
  }
  const runFile = typeof json.run === 'string' ? json.run.split(/[\\/]/).pop()! : null;
  return {
    runFile, runSha256: typeof json.runSha256 === 'string' ? json.runSha256 : null,
    dims: dims as [number, number, number, number], trSec: json.trSec,
    dropInitialVolumes: rec.dropInitialVolumes, censorVolumes: (rec.censorVolumes as unknown[]).filter((v): v is number => Number.isInteger(v)),
    why: Array.isArray(rec.why) ? rec.why.filter((w): w is string => typeof w === 'string') : [],
    findings: Array.isArray(json.findings) ? (json.findings as Finding[]) : [],
    ...lookMotionFacts(json.motion),
  };
}

/** The moved volumes and FD threshold of findings.json's motion summary (absent in older folders). */
function lookMotionFacts(motion: unknown): { movedVolumes: number[]; fdThresholdMm: number | null } {
  const m = (motion ?? {}) as { volumesAboveThreshold?: unknown; fdThresholdMm?: unknown };
  return {
    movedVolumes: Array.isArray(m.volumesAboveThreshold) ? m.volumesAboveThreshold.filter((v): v is number => Number.isInteger(v)) : [],
    fdThresholdMm: typeof m.fdThresholdMm === 'number' ? m.fdThresholdMm : null,
  };
}
