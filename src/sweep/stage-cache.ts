import { closeSync, existsSync, fstatSync, mkdirSync, openSync, readFileSync, readSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomic } from '../io/atomic-write.js';
import type { Volume } from '../core/volume.js';
import type { StepContext, StepNote } from '../steps/step-types.js';
import type { PlantTruth } from '../plant/plant-activations.js';
import type { NuisanceRegressor } from '../model/design.js';
import type { CellResult, EstimateResult, NullResult, TsnrResult } from './sweep-task.js';

/**
 * The stage cache on disk. Every file is written atomically (temp file + rename), so an interrupted
 * sweep leaves only complete entries and resumes from them:
 *
 *   <dir>/cells/<key>.json    one finished cell (its metrics, curve, notes, seconds)
 *   <dir>/tsnr/<key>.json     the tSNR of one setting's recipe on the run
 *   <dir>/groups/<key>.f32    a group stage: the planted run after the shared steps (raw float32), when
 *                             a sweep cannot keep it as a small patch (see cell-pipeline.ts)
 *   <dir>/groups/<key>.json   its geometry, step context, notes and planted truth (written last)
 *   <dir>/estimates/<key>.json what a step estimated from the unplanted run for one setting
 *   <dir>/null/<key>.json     one setting's null designs (their maximum t each), for calibrated thresholds
 */

/** A group stage: the planted run after the steps shared by every setting. */
export interface GroupStage {
  volume: Volume;
  truth: PlantTruth;
  /** The context after the shared steps; its `frame` says where the stage's voxels live. */
  context: StepContext;
  notes: StepNote[];
  /** Regressors the shared steps handed the model (one value per volume of the step's output). */
  regressors: NuisanceRegressor[];
}

type Encoded = { $typed: string; base64: string };
const TYPED: Record<string, new (b: ArrayBuffer) => ArrayBufferView> = { Float32Array, Float64Array, Uint8Array, Int32Array, Int8Array, Uint16Array, Int16Array, Uint32Array };

function encode(x: unknown): unknown {
  if (ArrayBuffer.isView(x)) {
    const b = Buffer.from(x.buffer, x.byteOffset, x.byteLength);
    return { $typed: x.constructor.name, base64: b.toString('base64') } satisfies Encoded;
  }
  if (Array.isArray(x)) return x.map(encode);
  if (x && typeof x === 'object') return Object.fromEntries(Object.entries(x).map(([k, v]) => [k, encode(v)]));
  return x;
}

function decode(x: unknown): unknown {
  if (x && typeof x === 'object' && '$typed' in x) {
    const e = x as Encoded;
    const bytes = Buffer.from(e.base64, 'base64');
    const copy = new ArrayBuffer(bytes.byteLength);
    new Uint8Array(copy).set(bytes);
    return new TYPED[e.$typed](copy);
  }
  if (Array.isArray(x)) return x.map(decode);
  if (x && typeof x === 'object') return Object.fromEntries(Object.entries(x).map(([k, v]) => [k, decode(v)]));
  return x;
}

/**
 * JSON text that keeps typed arrays (as base64 with their type), for cache entries.
 * @param x - value holding typed arrays anywhere
 * @returns JSON text
 * @example readCacheJson(writeCacheJson({ mask: new Uint8Array(3) }))
 */
export function writeCacheJson(x: unknown): string {
  return JSON.stringify(encode(x));
}

/**
 * Inverse of {@link writeCacheJson}.
 * @param text - JSON text
 * @returns the value with its typed arrays restored
 * @example readCacheJson<{ mask: Uint8Array }>(text).mask
 */
export function readCacheJson<T>(text: string): T {
  return decode(JSON.parse(text)) as T;
}

/**
 * Read a finished cell from the cache.
 * @param dir - cache folder
 * @param key - cell key
 * @returns the cell result, or null when absent or unreadable (then it is recomputed)
 * @example readCachedCell('out/demo/cache', cell.key)
 */
export function readCachedCell(dir: string, key: string): CellResult | null {
  const path = join(dir, 'cells', `${key}.json`);
  if (!existsSync(path)) return null;
  try {
    const r = readCacheJson<CellResult>(readFileSync(path, 'utf8'));
    return r.key === key ? r : null;
  } catch {
    return null;
  }
}

/**
 * Store a finished cell.
 * @param dir - cache folder
 * @param result - the cell result (its key names the file)
 * @returns when the file is in place
 * @example await writeCachedCell(dir, result)
 */
export async function writeCachedCell(dir: string, result: CellResult): Promise<void> {
  mkdirSync(join(dir, 'cells'), { recursive: true });
  await writeFileAtomic(join(dir, 'cells', `${result.key}.json`), writeCacheJson(result));
}

/**
 * Read a group stage from the cache.
 * @param dir - cache folder
 * @param key - group key
 * @param into - optional: gives the array (of the length asked for) the voxel data is read into, so a
 *   sweep worker reuses one array instead of allocating a run per read. __Default value:__ a new array
 * @returns the stage, or null when absent or incomplete
 * @example const stage = readGroupStage(dir, group.key)
 */
export function readGroupStage(dir: string, key: string, into?: (length: number) => Float32Array): GroupStage | null {
  const meta = join(dir, 'groups', `${key}.json`);
  const data = join(dir, 'groups', `${key}.f32`);
  if (!existsSync(meta) || !existsSync(data)) return null;
  try {
    const m = readCacheJson<Omit<GroupStage, 'volume'> & { volume: Omit<Volume, 'data'> }>(readFileSync(meta, 'utf8'));
    const n = m.volume.dims[0] * m.volume.dims[1] * m.volume.dims[2] * m.volume.dims[3];
    const f32 = into ? readInto(data, into, n) : readWhole(data, n);
    if (!f32) return null;
    return { ...m, volume: { ...m.volume, affine: new Float64Array(m.volume.affine), data: f32 } };
  } catch {
    return null;
  }
}

/** The file's n Float32 values in a new array, or null when its size is not 4n bytes. */
function readWhole(path: string, n: number): Float32Array | null {
  const bytes = readFileSync(path);
  if (bytes.byteLength !== n * 4) return null;
  // Buffer pools small files; a run is large, so its Buffer owns its memory and can be viewed directly
  return bytes.byteOffset % 4 === 0 ? new Float32Array(bytes.buffer, bytes.byteOffset, n) : new Float32Array(new Uint8Array(bytes).buffer);
}

/** The file's n Float32 values read straight into into(n), or null when its size is not 4n bytes. */
function readInto(path: string, into: (length: number) => Float32Array, n: number): Float32Array | null {
  const fd = openSync(path, 'r');
  try {
    if (fstatSync(fd).size !== n * 4) return null;
    const out = into(n);
    const bytes = new Uint8Array(out.buffer, out.byteOffset, n * 4);
    for (let at = 0; at < bytes.byteLength;) {
      const got = readSync(fd, bytes, at, bytes.byteLength - at, at);
      if (got <= 0) return null;
      at += got;
    }
    return out;
  } finally {
    closeSync(fd);
  }
}

/**
 * Store a group stage: voxel data first, then the description whose presence marks it complete.
 * @param dir - cache folder
 * @param key - group key
 * @param stage - the stage
 * @returns when both files are in place
 * @example await writeGroupStage(dir, group.key, stage)
 */
export async function writeGroupStage(dir: string, key: string, stage: GroupStage): Promise<void> {
  mkdirSync(join(dir, 'groups'), { recursive: true });
  const d = stage.volume.data;
  await writeFileAtomic(join(dir, 'groups', `${key}.f32`), new Uint8Array(d.buffer, d.byteOffset, d.byteLength));
  const { data: _data, ...geometry } = stage.volume;
  await writeFileAtomic(join(dir, 'groups', `${key}.json`), writeCacheJson({ ...stage, volume: { ...geometry, affine: Array.from(geometry.affine) } }));
}

/**
 * Remove a group stage once every cell of its group is done (cell results stay).
 * @param dir - cache folder
 * @param key - group key
 * @example removeGroupStage(dir, group.key)
 */
export function removeGroupStage(dir: string, key: string): void {
  rmSync(join(dir, 'groups', `${key}.json`), { force: true });
  rmSync(join(dir, 'groups', `${key}.f32`), { force: true });
}

/**
 * Read a setting's tSNR from the cache.
 * @param dir - cache folder
 * @param key - tSNR key
 * @returns the result, or null when absent
 * @example readCachedTsnr(dir, plan.tsnr[0].key)
 */
export function readCachedTsnr(dir: string, key: string): TsnrResult | null {
  const path = join(dir, 'tsnr', `${key}.json`);
  if (!existsSync(path)) return null;
  try {
    const r = JSON.parse(readFileSync(path, 'utf8')) as TsnrResult;
    return r.key === key ? r : null;
  } catch {
    return null;
  }
}

/**
 * Store a setting's tSNR.
 * @param dir - cache folder
 * @param result - the result (its key names the file)
 * @returns when the file is in place
 * @example await writeCachedTsnr(dir, result)
 */
export async function writeCachedTsnr(dir: string, result: TsnrResult): Promise<void> {
  mkdirSync(join(dir, 'tsnr'), { recursive: true });
  await writeFileAtomic(join(dir, 'tsnr', `${result.key}.json`), JSON.stringify(result));
}

/** A setting's null designs as cached: the result and the key that names them. */
interface CachedNull { key: string; result: NullResult }

/**
 * Read a setting's null designs (the whole recipe on the unplanted run, K random designs).
 * @param dir - cache folder
 * @param key - null key (nullDesignsKey)
 * @returns the result, or null when absent or unreadable (then the designs are fitted again)
 * @example readCachedNull(dir, key)
 */
export function readCachedNull(dir: string, key: string): NullResult | null {
  const path = join(dir, 'null', `${key}.json`);
  if (!existsSync(path)) return null;
  try {
    const r = JSON.parse(readFileSync(path, 'utf8')) as CachedNull;
    return r.key === key ? r.result : null;
  } catch {
    return null;
  }
}

/**
 * Store a setting's null designs under their key.
 * @param dir - cache folder
 * @param key - null key (nullDesignsKey)
 * @param result - what the null task produced
 * @returns when the file is in place
 * @example await writeCachedNull(dir, key, result)
 */
export async function writeCachedNull(dir: string, key: string, result: NullResult): Promise<void> {
  mkdirSync(join(dir, 'null'), { recursive: true });
  await writeFileAtomic(join(dir, 'null', `${key}.json`), JSON.stringify({ key, result } satisfies CachedNull));
}

/**
 * Read what a step estimated from the unplanted run.
 * @param dir - cache folder
 * @param key - estimate key
 * @returns the result, or null when absent or unreadable (then it is computed again)
 * @example readCachedEstimate(dir, plan.estimates[0].key)
 */
export function readCachedEstimate(dir: string, key: string): EstimateResult | null {
  const path = join(dir, 'estimates', `${key}.json`);
  if (!existsSync(path)) return null;
  try {
    const r = readCacheJson<EstimateResult>(readFileSync(path, 'utf8'));
    return r.key === key ? r : null;
  } catch {
    return null;
  }
}

/**
 * Store what a step estimated from the unplanted run.
 * @param dir - cache folder
 * @param result - the estimate (its key names the file)
 * @returns when the file is in place
 * @example await writeCachedEstimate(dir, result)
 */
export async function writeCachedEstimate(dir: string, result: EstimateResult): Promise<void> {
  mkdirSync(join(dir, 'estimates'), { recursive: true });
  await writeFileAtomic(join(dir, 'estimates', `${result.key}.json`), writeCacheJson(result));
}
