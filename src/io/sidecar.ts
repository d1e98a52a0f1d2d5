import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { fail } from '../core/fail.js';
import { writeFileAtomic } from './atomic-write.js';
import type { Sidecar } from './run-types.js';

/**
 * The BIDS sidecar fields boldsweep uses, in BIDS units (seconds, degrees). Unknown fields pass
 * through untouched. Ranges: RepetitionTime > 0; SliceTiming entries >= 0; TotalReadoutTime,
 * EffectiveEchoSpacing, EchoTime > 0; 0 < FlipAngle <= 180 deg; MultibandAccelerationFactor an
 * integer >= 1.
 */
export const sidecarSchema = z
  .object({
    RepetitionTime: z.number().finite().positive().optional(),
    SliceTiming: z.array(z.number().finite().nonnegative()).optional(),
    PhaseEncodingDirection: z.enum(['i', 'i-', 'j', 'j-', 'k', 'k-']).optional(),
    TotalReadoutTime: z.number().finite().positive().optional(),
    EffectiveEchoSpacing: z.number().finite().positive().optional(),
    EchoTime: z.number().finite().positive().optional(),
    FlipAngle: z.number().finite().positive().max(180).optional(),
    MultibandAccelerationFactor: z.number().int().gte(1).optional(),
  })
  .passthrough();

/** Order in which {@link writeSidecar} writes the known fields; other fields follow alphabetically. */
export const SIDECAR_FIELD_ORDER = [
  'RepetitionTime', 'SliceTiming', 'PhaseEncodingDirection', 'TotalReadoutTime', 'EffectiveEchoSpacing',
  'EchoTime', 'FlipAngle', 'MultibandAccelerationFactor',
] as const;

/**
 * Upper limits (seconds) above which a time is almost surely in milliseconds. Common practice, no source:
 * fMRI TRs are 0.3-10 s (a TR above 100 would be over a minute per volume), echo times and readout
 * times are tens of ms, echo spacings below 1 ms.
 */
const LIKELY_MS: Record<string, number> = { RepetitionTime: 100, EchoTime: 1, TotalReadoutTime: 1, EffectiveEchoSpacing: 0.1 };

/**
 * Check a parsed sidecar object: the schema, then unit sanity (times that look like milliseconds,
 * slice times not inside the TR). Returns the problems, one string per field, or an empty list.
 * @param value - parsed JSON
 * @returns problems such as `"RepetitionTime: 2000 s is over 100 s; ..."`
 * @example sidecarProblems({ RepetitionTime: -1 }) // ['RepetitionTime: Number must be greater than 0 (got -1)']
 */
export function sidecarProblems(value: unknown): string[] {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return [`(top level): must be a JSON object, got ${Array.isArray(value) ? 'an array' : typeof value}`];
  const parsed = sidecarSchema.safeParse(value);
  const problems: string[] = [];
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const got = issue.path.reduce<unknown>((v, key) => (v as Record<string | number, unknown> | undefined)?.[key], value);
      problems.push(`${formatPath(issue.path)}: ${issue.message} (got ${JSON.stringify(got)})`);
    }
    return problems;
  }
  const s = parsed.data as Sidecar;
  for (const [field, limit] of Object.entries(LIKELY_MS)) {
    const v = s[field];
    if (typeof v === 'number' && v > limit) problems.push(`${field}: ${v} s is over ${limit} s, so it is probably in milliseconds; BIDS times are in seconds (write ${v / 1000})`);
  }
  if (s.SliceTiming && s.RepetitionTime !== undefined && s.RepetitionTime <= 100) {
    const late = s.SliceTiming.findIndex((t) => t >= s.RepetitionTime!);
    if (late >= 0) problems.push(`SliceTiming[${late}]: ${s.SliceTiming[late]} s is not inside the repetition time ${s.RepetitionTime} s (slice times are seconds from the start of each volume)`);
  }
  return problems;
}

function formatPath(path: (string | number)[]): string {
  return path.reduce<string>((text, key) => (typeof key === 'number' ? `${text}[${key}]` : text ? `${text}.${key}` : key), '') || '(top level)';
}

/**
 * Read and check a BIDS sidecar JSON file.
 * @param path - the .json file
 * @returns the sidecar, with unknown fields kept as read
 * @throws BoldsweepError FILE_NOT_FOUND; SIDECAR_INVALID listing every bad field (including times that look like milliseconds)
 * @example const sidecar = await readSidecar('sub-01_task-rest_bold.json'); sidecar.RepetitionTime
 */
export async function readSidecar(path: string): Promise<Sidecar> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') fail('FILE_NOT_FOUND', `no sidecar file at ${path}`, { file: path, cause: e });
    fail('READ_FAILED', `cannot read ${path} (${(e as Error).message})`, { file: path, cause: e });
  }
  let value: unknown;
  try {
    value = JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch (e) {
    fail('SIDECAR_INVALID', `not valid JSON (${(e as Error).message})`, { file: path, cause: e });
  }
  const problems = sidecarProblems(value);
  if (problems.length > 0) fail('SIDECAR_INVALID', `${problems.length} field(s) wrong: ${problems.join('; ')}`, { file: path, details: { problems } });
  return value as Sidecar;
}

/**
 * Deterministic key order: the known fields in {@link SIDECAR_FIELD_ORDER}, then the rest
 * alphabetically; nested objects have their keys sorted alphabetically.
 * @param sidecar - the sidecar
 * @returns a new object with ordered keys (the input is not modified)
 * @example Object.keys(orderSidecar({ b: 1, RepetitionTime: 2 })) // ['RepetitionTime', 'b']
 */
export function orderSidecar(sidecar: Sidecar): Sidecar {
  const known = SIDECAR_FIELD_ORDER.filter((k) => k in sidecar && sidecar[k] !== undefined);
  const rest = Object.keys(sidecar).filter((k) => !(SIDECAR_FIELD_ORDER as readonly string[]).includes(k) && sidecar[k] !== undefined).sort();
  const out: Sidecar = {};
  for (const k of [...known, ...rest]) out[k] = sortNested(sidecar[k]);
  return out;
}

function sortNested(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(sortNested);
  if (v !== null && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    return Object.fromEntries(Object.keys(o).sort().map((k) => [k, sortNested(o[k])]));
  }
  return v;
}

/**
 * Write a BIDS sidecar JSON file (checked first, keys in a stable order, 2-space indent, atomic).
 * @param path - destination .json file
 * @param sidecar - the fields to write
 * @returns resolves when the file is in place
 * @throws BoldsweepError SIDECAR_INVALID when a field is out of range; WRITE_FAILED
 * @example await writeSidecar('out/sub-01_task-rest_bold.json', { RepetitionTime: 2, SliceTiming: [0, 1, 0.5, 1.5] })
 */
export async function writeSidecar(path: string, sidecar: Sidecar): Promise<void> {
  const problems = sidecarProblems(sidecar);
  if (problems.length > 0) fail('SIDECAR_INVALID', `${problems.length} field(s) wrong: ${problems.join('; ')}`, { file: path, details: { problems } });
  await writeFileAtomic(path, `${JSON.stringify(orderSidecar(sidecar), null, 2)}\n`);
}
