/**
 * The metric columns of a scorecard, in table order: the detection scores of each cell (see the
 * score module's ScoreRow for definitions), two derived false-alarm indicators, then what the
 * recipe did to the data (tSNR, estimated smoothness) and the threshold used.
 */
export const SCORECARD_METRICS = [
  'hitRate', 'blobHitRate', 'falseAlarmRate', 'falseClusters', 'familyWiseError', 'falseDiscoveryProportion',
  'dice', 'rocAuc', 'peakErrorMeanMm', 'peakErrorMaxMm',
  'effectEstimatedPct', 'effectPlantedPct', 'effectBiasPct', 'effectRatio',
  'truthVoxels', 'survivorVoxels', 'truePositiveVoxels', 'falsePositiveVoxels', 'clusters', 'blobs', 'blobsDetected',
  'threshold', 'tsnrMedian', 'smoothnessFwhmMm', 'smoothnessXMm', 'smoothnessYMm', 'smoothnessZMm', 'dof',
] as const;

/** One metric column name. */
export type ScorecardMetric = (typeof SCORECARD_METRICS)[number];
