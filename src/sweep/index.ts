// sweep: public exports of this module (re-exports only; src/index.ts re-exports this file).
// sweep engine: spec, plan, runner, cache, scorecard, recommendation
export { sweepSpecSchema, parseSweepSpecShape, type SweepSpec, type SweepSpecInput, type RecipeStep, type PlantSpec, type ThresholdRule, type ModelOptions, type EventsRule } from './spec.js';
export { parseSweepSpec, isSpecError } from './parse-sweep-spec.js';
export { readSweepSpec } from './read-sweep-spec.js';
export { defaultSmoothingSpec, type DefaultSmoothingOptions } from './default-spec.js';
export { settingsGrid, settingLabel, settingText, parameterName, parameterUnit, type Setting } from './settings-grid.js';
export { planSweep, firstVariedStep, CACHE_FORMAT, type SweepPlan, type CellPlan, type CellGroup, type PlantCondition, type PlanInputs } from './plan.js';
export { parseShard, shardCells, type Shard } from './shard.js';
export { canonicalJson, stableHash } from './stable-hash.js';
export { runSweep, volumeHash, type SweepOptions, type SweepResult, type SweepRunInput, type SweepStats } from './runner.js';
export { runSweepTask, runTsnrTask } from './cell-pipeline.js';
export { applyThresholdRule } from './threshold-rule.js';
export { randomBlockEvents, type RandomBlocks } from './random-block-events.js';
export { gatherResults } from './gather.js';
export { shareVolume, sharedBytes } from './shared-volume.js';
export { readCachedCell, writeCachedCell, readCachedTsnr, writeCachedTsnr, readGroupStage, writeGroupStage, removeGroupStage, type GroupStage } from './stage-cache.js';
export type { SweepTask, TsnrTask, TsnrResult, SweepJob, SweepContext, CellResult, SharedRun } from './sweep-task.js';
export { buildMask, maskFromFile, fileFacts, type MaskSource, type FileFacts } from './mask-source.js';
export { progressLine, lineProgress, type SweepProgress } from './progress.js';
export { terminalProgress } from './terminal-progress.js';
export { plainProgressLines } from './plain-progress-lines.js';
export { SCORECARD_METRICS, type ScorecardMetric } from './cell-metrics.js';
export { scorecardColumns, rowSetting, SCORECARD_ID_COLUMNS, SCORECARD_PLANT_COLUMNS, type Scorecard, type ScorecardRow, type ScorecardValue } from './scorecard.js';
export { scorecardToTsv, timingsToTsv, readScorecardTsv, scorecardColumnName, scorecardMeta, type ScorecardMeta } from './scorecard-tsv.js';
export { scorecardFrame } from './scorecard-frame.js';
export { specDropCount } from './spec-drop-count.js';
export { untreatedFindings, type LookTreatment } from './untreated-findings.js';
export { applyLookToSpec } from './apply-look-to-spec.js';
