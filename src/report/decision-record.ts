import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import { z } from 'zod';
import { fail } from '../core/fail.js';
import { hashFile } from '../io/hash-file.js';
import { openRun } from '../io/open-run.js';
import { privateMasks, privateRunFacts, type RunFacts } from './run-facts.js';
import { buildMask, type MaskSource } from '../sweep/mask-source.js';
import type { Recommendation } from '../decide/recommend-setting.js';
import { runSweep, type SweepOptions, type SweepResult } from '../sweep/runner.js';
import { scorecardToTsv } from '../sweep/scorecard-tsv.js';
import { summariseScorecard } from '../decide/summarise-scorecard.js';
import type { RecipeStep } from '../sweep/spec.js';
import type { DecisionRecord, MetricSummary } from './decision-record-types.js';
import { softwareVersions } from './software-versions.js';

/** Metrics summarised in the record (the full table stays in scorecard.tsv). */
const RECORD_METRICS = ['hitRate', 'blobHitRate', 'rocAuc', 'dice', 'falseClusters', 'familyWiseError', 'falseDiscoveryProportion', 'peakErrorMeanMm', 'effectBiasPct', 'tsnrMedian', 'smoothnessFwhmMm'];

const orNull = (x: number) => (Number.isFinite(x) ? x : null);

/**
 * SHA-256 of text (UTF-8), as recorded for the scorecard TSV.
 * @param text - the text
 * @returns hex digest
 * @example textSha256(scorecardToTsv(card))
 */
export function textSha256(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

/** Inputs of {@link buildDecisionRecord}. */
export interface DecisionInputs {
  result: SweepResult;
  recommendation: Recommendation;
  /** Facts of the run as opened (its file paths and TR source are recorded). */
  run: RunFacts;
  masks: { brain: MaskSource; placement: MaskSource; exclude: MaskSource | null };
  /** Name of the scorecard file beside the record. __Default value:__ 'scorecard.tsv' */
  scorecardFile?: string;
  /** Sidecar fields the analysis used. __Default value:__ ['RepetitionTime'] when the TR came from the sidecar */
  sidecarFields?: string[];
}

/**
 * Assemble a decision record: input hashes, software versions, the recipe as chosen, its step notes,
 * the sweep spec and seed, the scorecard summary, the choice and the rule.
 * @param d - sweep result, recommendation, run, masks
 * @returns the record (JSON-serialisable)
 * @example const record = await buildDecisionRecord({ result, recommendation: rec, run, masks: { brain: { kind: 'otsu-mean' }, placement: { kind: 'brain' } } })
 */
export async function buildDecisionRecord(d: DecisionInputs): Promise<DecisionRecord> {
  const { result, recommendation: rec } = d;
  // inputs by file name and hash only: a local path can hold a participant's identity
  const run = await privateRunFacts(d.run);
  const inputs = run.inputs!;
  const tsv = scorecardToTsv(result.scorecard);
  const c = rec.choice;
  const chosenRecipe: RecipeStep[] = result.spec.recipe.map((s) => {
    const params = { ...s.params };
    for (const [k, v] of Object.entries(c.chosen.setting)) if (k.startsWith(`${s.step}.`)) params[k.slice(s.step.length + 1)] = v;
    return { step: s.step, params };
  });
  const fieldNames = d.sidecarFields ?? (run.trSource === 'sidecar' ? ['RepetitionTime'] : []);
  const sidecarFieldsUsed: Record<string, unknown> = {};
  for (const f of fieldNames) if (run.sidecar && run.sidecar[f] !== undefined) sidecarFieldsUsed[f] = run.sidecar[f];
  const masks = privateMasks(d.masks);
  const sum = (m: { n: number; mean: number; se: number; low: number; high: number }): MetricSummary => ({ n: m.n, mean: orNull(m.mean), se: orNull(m.se), low: orNull(m.low), high: orNull(m.high) });
  return {
    format: 'boldsweep-decision-record',
    version: 1,
    createdAt: new Date().toISOString(),
    software: softwareVersions(),
    inputs: {
      image: inputs.image, sidecar: inputs.sidecar, events: inputs.events,
      runHash: result.inputs.runHash, contextHash: result.inputs.contextHash,
    },
    masks,
    run: { dims: [...run.dims], spacingMm: [...run.spacingMm], trSec: run.trSec, trSource: run.trSource, summary: run.summary },
    sidecarFieldsUsed,
    recipe: chosenRecipe,
    stepNotes: result.notes.find((n) => n.settingIndex === c.chosen.settingIndex)?.notes ?? [],
    sweepSpec: result.spec,
    seed: result.spec.seed,
    scorecard: {
      sweepKey: result.scorecard.sweepKey, file: d.scorecardFile ?? 'scorecard.tsv', sha256: textSha256(tsv), rows: result.scorecard.rows.length,
      summary: summariseScorecard(result.scorecard).map((s) => ({
        setting: s.setting, plantSizeMm: s.plantSizeMm, plantAmplitudePct: s.plantAmplitudePct, repeats: s.repeats,
        metrics: Object.fromEntries(RECORD_METRICS.filter((m) => s.metrics[m]).map((m) => [m, sum(s.metrics[m])])),
      })),
    },
    choice: {
      status: c.status, advice: c.advice, fallback: c.fallback,
      setting: c.chosen.setting, plantSizeMm: c.plantSizeMm, plantAmplitudePct: c.plantAmplitudePct,
      ruleId: rec.ruleId, rule: rec.rule, metric: c.metric, prefer: rec.prefer, cutoff: c.cutoff,
      chosen: { setting: c.chosen.setting, mean: c.chosen.detection.mean, se: c.chosen.detection.se, low: c.chosen.detection.low, high: c.chosen.detection.high },
      best: { setting: c.best.setting, mean: c.best.detection.mean, se: c.best.detection.se },
      perPlant: rec.perPlant.map((p) => ({ plantSizeMm: p.plantSizeMm, plantAmplitudePct: p.plantAmplitudePct, status: p.status, metric: p.metric, setting: p.chosen.setting, mean: p.chosen.detection.mean, bestSetting: p.best.setting, bestMean: p.best.detection.mean })),
      summary: rec.summary,
    },
    caveats: rec.caveats,
  };
}

const fileFactsSchema = z.object({ path: z.string(), sha256: z.string().regex(/^[0-9a-f]{64}$/), bytes: z.number() });
const maskSchema = z.union([
  z.object({ kind: z.literal('otsu-mean') }),
  z.object({ kind: z.literal('brain') }),
  z.object({ kind: z.literal('file'), file: fileFactsSchema, values: z.array(z.number()).optional(), above: z.number().optional(), growVoxels: z.number().int().nonnegative().optional() }),
]);
const recordSchema = z.object({
  format: z.literal('boldsweep-decision-record'),
  version: z.literal(1),
  inputs: z.object({ image: fileFactsSchema.nullable(), sidecar: fileFactsSchema.nullable(), events: fileFactsSchema.nullable(), runHash: z.string(), contextHash: z.string() }),
  masks: z.object({ brain: maskSchema, placement: maskSchema, exclude: maskSchema.nullable() }),
  sweepSpec: z.object({}).passthrough(),
  scorecard: z.object({ sha256: z.string(), sweepKey: z.string() }).passthrough(),
  choice: z.object({ setting: z.record(z.unknown()) }).passthrough(),
}).passthrough();

/**
 * Read and check a decision record file.
 * @param path - decision-record.json
 * @returns the record
 * @throws BoldsweepError FILE_NOT_FOUND; RECORD_INVALID listing what is wrong
 * @example const record = readDecisionRecord('out/demo/decision-record.json')
 */
export function readDecisionRecord(path: string): DecisionRecord {
  let text: string;
  try { text = readFileSync(path, 'utf8'); } catch (e) { fail('FILE_NOT_FOUND', `cannot read ${path}`, { file: path, cause: e }); }
  let json: unknown;
  try { json = JSON.parse(text); } catch (e) { fail('RECORD_INVALID', `not JSON (${(e as Error).message})`, { file: path, cause: e }); }
  return checkDecisionRecord(json, path);
}

/**
 * Check an object is a decision record.
 * @param json - parsed JSON
 * @param file - file name for messages
 * @returns the record
 * @throws BoldsweepError RECORD_INVALID listing the offending fields
 * @example checkDecisionRecord(JSON.parse(text))
 */
export function checkDecisionRecord(json: unknown, file?: string): DecisionRecord {
  const r = recordSchema.safeParse(json);
  if (!r.success) fail('RECORD_INVALID', `decision record fields wrong: ${r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`, { file });
  return json as DecisionRecord;
}

/** What re-running a record gave. */
export interface RerunOutcome {
  result: SweepResult;
  /** The scorecard TSV of the re-run. */
  tsv: string;
  /** SHA-256 of that TSV, and the recorded one. */
  sha256: string;
  recordedSha256: string;
  /** True when the re-run's scorecard is byte-identical to the recorded one. */
  reproduced: boolean;
}

/** Where the inputs of a re-run are: a record names its files, not their folders. */
export interface RerunInputs {
  /** Folder holding the recorded files under their recorded names (e.g. the run's func/ folder). __Default value:__ the current folder */
  inputDir?: string;
  /** Earlier name of `inputDir`. */
  baseDir?: string;
  /** Paths of single inputs, where they are not in `inputDir` under their recorded names. */
  paths?: Partial<Record<'image' | 'sidecar' | 'events' | 'brain' | 'placement' | 'exclude', string>>;
}

/**
 * Re-run the sweep a decision record describes: open the same inputs (checking their hashes), rebuild
 * the masks the same way, run the recorded spec and seed, and compare the scorecard with the recorded
 * hash. The record names each file but not its folder, so the caller says where they are.
 * @param record - the decision record
 * @param options - inputDir and paths (where the inputs are, see {@link RerunInputs}); plus runSweep
 *   options (workers, cacheDir, onProgress)
 * @returns the new result and whether it reproduced the recorded scorecard byte for byte
 * @throws BoldsweepError RECORD_INVALID when the record has no input image or an input file changed; FILE_NOT_FOUND
 * @example const { reproduced } = await rerunRecord(readDecisionRecord('out/demo/decision-record.json'), { inputDir: 'data-demo' })
 */
export async function rerunRecord(record: DecisionRecord, options: Pick<SweepOptions, 'workers' | 'cacheDir' | 'onProgress'> & RerunInputs = {}): Promise<RerunOutcome> {
  checkDecisionRecord(record);
  const base = options.inputDir ?? options.baseDir ?? '.';
  const image = record.inputs.image;
  if (!image) fail('RECORD_INVALID', 'the record names no input image (the sweep ran on an image held only in memory), so it cannot be re-run from files');
  const where = (key: keyof NonNullable<RerunInputs['paths']>, name: string) => resolve(options.paths?.[key] ?? resolve(base, basename(name)));
  const located: Record<string, string | null> = {};
  for (const key of ['image', 'sidecar', 'events'] as const) {
    const f = record.inputs[key];
    if (!f) { located[key] = null; continue; }
    const p = where(key, f.path);
    if (!existsSync(p)) fail('FILE_NOT_FOUND', `the record's ${key} ${basename(f.path)} is not at ${p}; pass the folder holding the inputs (inputDir) or this file's path (paths.${key})`);
    const sha = await hashFile(p);
    if (sha !== f.sha256) fail('RECORD_INVALID', `input ${p} differs from the recorded ${basename(f.path)} (SHA-256 ${sha.slice(0, 12)}..., recorded ${f.sha256.slice(0, 12)}...)`);
    located[key] = p;
  }
  const maskAt = (key: 'brain' | 'placement' | 'exclude', m: MaskSource): MaskSource => (m.kind === 'file' ? { ...m, file: { ...m.file, path: where(key, m.file.path) } } : m);
  const run = await openRun(located.image!, { sidecar: located.sidecar, events: located.events });
  const brainMask = await buildMask(maskAt('brain', record.masks.brain), run.volume);
  const placementMask = await buildMask(maskAt('placement', record.masks.placement), run.volume, { brain: brainMask });
  const excludeMask = record.masks.exclude ? await buildMask(maskAt('exclude', record.masks.exclude), run.volume) : undefined;
  const result = await runSweep(run, record.sweepSpec, { brainMask, placementMask, excludeMask, workers: options.workers, cacheDir: options.cacheDir ?? null, onProgress: options.onProgress });
  const tsv = scorecardToTsv(result.scorecard);
  const sha256 = textSha256(tsv);
  return { result, tsv, sha256, recordedSha256: record.scorecard.sha256, reproduced: sha256 === record.scorecard.sha256 };
}

/**
 * The directory a record file sits in (recorded paths are relative to it when written by the CLI).
 * @param recordPath - path of decision-record.json
 * @returns its folder
 * @example rerunRecord(rec, { baseDir: recordDir('out/demo/decision-record.json') })
 */
export function recordDir(recordPath: string): string {
  return dirname(resolve(recordPath));
}


