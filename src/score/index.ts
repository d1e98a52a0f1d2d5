// score: public exports of this module (re-exports only; src/internals.ts re-exports this file).
export { scoreDetection } from './score-detection.js';
export type { ScoreInput, ScoreRow } from './score-detection.js';
export { rocCurve } from './roc-curve.js';
export type { RocCurve } from './roc-curve.js';
export { rocArea } from './roc-area.js';
export { diceCoefficient } from './dice.js';
export { clusterCounts } from './cluster-counts.js';
export type { ClusterCounts } from './cluster-counts.js';
export { blobPeaks } from './blob-peaks.js';
export type { BlobPeaks } from './blob-peaks.js';
export { effectBias } from './effect-bias.js';
export type { EffectBias } from './effect-bias.js';
export { DEFAULT_FPR_GRID, tprAtFpr, curveColumnName, curveTableToTsv, readCurveTableTsv, type CurveTable } from './curve-table.js';
export { truthInFrame } from './truth-in-frame.js';
