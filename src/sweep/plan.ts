import { childSeed } from '../core/child-seed.js';
import { getStep } from '../steps/registry.js';
import { settingsGrid, type Setting } from './settings-grid.js';
import { studyLevels, type RecipeStep, type SweepSpec } from './spec.js';
import { stableHash } from './stable-hash.js';

/** Bump when what a cached stage or cell holds changes, so old caches are never reused. */
export const CACHE_FORMAT = 'boldsweep-sweep-cache-5';

/** One planted condition: a blob size and amplitude (count 0 = nothing planted). */
export interface PlantCondition {
  shape: 'gaussian' | 'sphere';
  sizeMm: number;
  amplitudePct: number;
  count: number;
  marginMm: number | null;
  separation: number;
}

/** A study group's subjects: everything a task needs to simulate them (the runs are in the context). */
export interface StudyGroup {
  subjects: number;
  /** SD (mm, per axis) of each subject's displacement of each blob, this group's level. */
  misregistrationMm: number;
  /** SD of a subject's amplitude as a fraction of the group amplitude. */
  amplitudeSpread: number;
  /** Each subject's random block design. */
  design: { onSec: number; offMinSec: number; offMaxSec: number };
}

/**
 * One group of cells that share their first stages: the same planting (condition x repeat) and the
 * recipe steps before the first varied step. Its output is computed once and cached.
 */
export interface CellGroup {
  /** Position of the group in the full plan: plantIndex * repeats + repeat. */
  index: number;
  plantIndex: number;
  plant: PlantCondition;
  repeat: number;
  /** Seed of this planting's random blob positions (shared by every setting of the repeat). */
  plantSeed: number;
  /** Task timing rule and the seed of this repeat's random design (unused for the run's events). */
  events: SweepSpec['events'];
  eventsSeed: number;
  /** Recipe steps run before the varied step (identical for every setting). */
  prefix: RecipeStep[];
  /** Per prefix step: key of what it estimated from the unplanted run (see {@link EstimatePlan}), or null. */
  prefixEstimates: Array<string | null>;
  /** Cache key of the group's output (hash of run, mask, planting and prefix steps). */
  key: string;
  /** A study's subjects at one misregistration level (absent for a single-run sweep). */
  study?: StudyGroup;
}

/** One cell: a setting applied to one group's output, then modelled and scored. */
export interface CellPlan {
  /** Position in the full plan: group.index * settings + settingIndex (stable across shards). */
  index: number;
  group: number;
  settingIndex: number;
  setting: Setting;
  /** Recipe steps from the first varied step on, with this setting's values filled in. */
  suffix: RecipeStep[];
  /** Per suffix step: key of what it estimated from the unplanted run, or null. */
  suffixEstimates: Array<string | null>;
  /** Model options with any varied "model.*" values filled in. */
  model: SweepSpec['model'];
  /** Cache key of the cell's scores. */
  key: string;
}

/** The whole plan of a sweep. */
export interface SweepPlan {
  settings: Setting[];
  /** Per setting: the whole recipe with the setting and the cache key of its tSNR (equal recipes share a key). */
  tsnr: Array<{ settingIndex: number; steps: RecipeStep[]; estimates: Array<string | null>; key: string }>;
  /** What the recipe's steps estimate from the unplanted run, one entry per distinct key, in recipe order. */
  estimates: EstimatePlan[];
  plants: PlantCondition[];
  groups: CellGroup[];
  cells: CellPlan[];
  /** Index in the recipe of the first varied step (recipe length when only model options vary). */
  splitAt: number;
  /** Hash of everything that determines the scorecard (spec without workers, inputs). */
  sweepKey: string;
}

/**
 * One estimate: a step with `estimate` at recipe position `at`, run on the unplanted run after the
 * steps before it, for one setting of those steps and its own. Settings that agree on all of them
 * share the estimate (one key).
 */
export interface EstimatePlan {
  /** Cache key: run, masks, and the steps up to and including this one (names, versions, parameters). */
  key: string;
  /** Position of the estimating step in the recipe. */
  at: number;
  /** The recipe up to and including the estimating step, with the setting filled in. */
  steps: RecipeStep[];
  /** Per step before `at`: key of its own estimate, or null. */
  before: Array<string | null>;
}

/** A recipe's steps as they enter cache keys: name, version of the numerics, parameters. */
function keyed(steps: readonly RecipeStep[]): Array<{ step: string; version: number; params: Record<string, unknown> }> {
  return steps.map((s) => ({ step: s.step, version: getStep(s.step).version, params: s.params }));
}

/** The inputs a plan depends on besides the spec (hashes, so the plan stays small). */
export interface PlanInputs {
  /** Hash of the run's voxel data and geometry, or of its file. */
  runHash: string;
  /** Hash of the masks (brain mask and placement mask) and the events used. */
  contextHash: string;
}

/**
 * Plan a sweep: plant conditions x repeats form groups (each planted once), and every setting of a
 * group forms a cell. Steps before the first varied one belong to the group, so a smoothing sweep
 * plants and runs the earlier steps once per repeat, not once per setting.
 * Every key holds each involved step's name and version, and the hash of each estimate the steps
 * use (when known: the runner plans once, computes the estimates, then plans again with their hashes).
 * @param spec - a validated spec
 * @param inputs - hashes of the run and its context
 * @param estimateHashes - estimate key -> hash of the estimated value. __Default value:__ none
 * @returns the plan, cells ordered group by group
 * @example const plan = planSweep(spec, { runHash, contextHash }); plan.cells.length // settings x plants x repeats
 */
export function planSweep(spec: SweepSpec, inputs: PlanInputs, estimateHashes: Readonly<Record<string, string>> = {}): SweepPlan {
  const settings = settingsGrid(spec.vary);
  const { shape, count, marginMm, separation } = spec.plant;
  const plants: PlantCondition[] = count === 0
    ? [{ shape, sizeMm: 0, amplitudePct: 0, count: 0, marginMm, separation }]
    : spec.plant.sizesFwhmMm.flatMap((sizeMm) => spec.plant.amplitudesPct.map((amplitudePct) => ({ shape, sizeMm, amplitudePct, count, marginMm, separation })));
  const splitAt = firstVariedStep(spec);
  const prefix = spec.recipe.slice(0, splitAt);
  const { workers: _workers, ...determining } = spec;
  const sweepKey = stableHash({ format: CACHE_FORMAT, spec: determining, versions: keyed(spec.recipe).map((s) => s.version), inputs });
  // estimates: per setting, one key per estimating step (from the recipe up to it)
  const estimates = new Map<string, EstimatePlan>();
  const estimateKeys = settings.map((setting) => {
    const steps = applySetting(spec.recipe, setting);
    const keys: Array<string | null> = [];
    steps.forEach((s, at) => {
      if (!getStep(s.step).estimate) { keys.push(null); return; }
      const upTo = steps.slice(0, at + 1);
      const key = stableHash({ format: CACHE_FORMAT, stage: 'estimate', inputs, steps: keyed(upTo) });
      if (!estimates.has(key)) estimates.set(key, { key, at, steps: upTo, before: keys.slice() });
      keys.push(key);
    });
    return keys;
  });
  const hashesOf = (keys: Array<string | null>) => keys.map((k) => (k === null ? null : estimateHashes[k] ?? null));
  const prefixEstimates = (estimateKeys[0] ?? []).slice(0, splitAt);
  const groups: CellGroup[] = [];
  const cells: CellPlan[] = [];
  // a study plants each repeat once per misregistration level (same seeds: the levels are paired)
  const levels: Array<number | null> = spec.study ? studyLevels(spec) : [null];
  for (let p = 0; p < plants.length; p++) {
    for (const level of levels) {
      for (let r = 0; r < spec.repeats; r++) {
        const plantSeed = childSeed(spec.seed, 'plant', r);
        const eventsSeed = childSeed(spec.seed, 'events', r);
        const study: StudyGroup | undefined = spec.study && level !== null
          ? { subjects: spec.study.subjects, misregistrationMm: level, amplitudeSpread: spec.study.amplitudeSpread, design: { ...spec.study.design } }
          : undefined;
        const g: CellGroup = {
          index: groups.length, plantIndex: p, plant: plants[p], repeat: r, plantSeed, prefix, prefixEstimates, events: spec.events, eventsSeed,
          key: stableHash({ format: CACHE_FORMAT, stage: 'group', inputs, plant: plants[p], plantSeed, prefix: keyed(prefix), estimates: hashesOf(prefixEstimates), model: { trialType: spec.model.trialType }, events: spec.events, eventsSeed: spec.events.kind === 'run' ? null : eventsSeed, ...(study ? { study } : {}) }),
          ...(study ? { study } : {}),
        };
        groups.push(g);
        settings.forEach((setting, s) => {
          // a study's cells of this level only
          if (level !== null && 'study.misregistrationMm' in setting && setting['study.misregistrationMm'] !== level) return;
          const suffix = applySetting(spec.recipe.slice(splitAt), setting);
          const suffixEstimates = estimateKeys[s].slice(splitAt);
          const model = { ...spec.model };
          for (const [k, v] of Object.entries(setting)) if (k.startsWith('model.')) (model as Record<string, unknown>)[k.slice(6)] = v;
          cells.push({
            index: cells.length, group: g.index, settingIndex: s, setting, suffix, suffixEstimates, model,
            key: stableHash({ format: CACHE_FORMAT, stage: 'cell', group: g.key, suffix: keyed(suffix), estimates: hashesOf(suffixEstimates), model, threshold: spec.threshold }),
          });
        });
      }
    }
  }
  const tsnr = settings.map((setting, settingIndex) => {
    const steps = applySetting(spec.recipe, setting);
    return { settingIndex, steps, estimates: estimateKeys[settingIndex], key: stableHash({ format: CACHE_FORMAT, stage: 'tsnr', inputs, steps: keyed(steps), estimates: hashesOf(estimateKeys[settingIndex]) }) };
  });
  return { settings, tsnr, estimates: [...estimates.values()].sort((a, b) => a.at - b.at), plants, groups, cells, splitAt, sweepKey };
}

/**
 * Index of the first recipe step a varied key names ("<step>.<param>"); recipe length when only
 * model options vary.
 * @param spec - the spec
 * @returns the split point between shared and per-setting steps
 * @example firstVariedStep(spec) // 1 for recipe [drop-initial-volumes, smooth] varying smooth.fwhmMm
 */
export function firstVariedStep(spec: Pick<SweepSpec, 'recipe' | 'vary'>): number {
  let at = spec.recipe.length;
  for (const key of Object.keys(spec.vary)) {
    const step = key.slice(0, key.indexOf('.'));
    const i = spec.recipe.findIndex((r) => r.step === step);
    if (i >= 0 && i < at) at = i;
  }
  return at;
}

function applySetting(steps: RecipeStep[], setting: Setting): RecipeStep[] {
  return steps.map((s) => {
    const params = { ...s.params };
    for (const [k, v] of Object.entries(setting)) {
      const dot = k.indexOf('.');
      if (k.slice(0, dot) === s.step) params[k.slice(dot + 1)] = v;
    }
    return { step: s.step, params };
  });
}
