/**
 * The metric columns of a scorecard, in table order: the detection scores of each cell (see the
 * score module's ScoreRow for definitions), derived columns (familyWiseError: 1 when any false
 * cluster survived; falseDiscoveryProportion: false over all surviving voxels; centreMargin: the
 * statistic at the blob centres minus the threshold, in statistic units), then what the recipe did
 * to the data (tsnrMedian: median tSNR in the brain mask of the run after the setting's recipe,
 * nothing planted, so the same for every repeat of a setting; the smoothness estimated from the
 * cell's residuals), the threshold and the model's degrees of freedom.
 */
export const SCORECARD_METRICS = [
  'hitRate', 'blobHitRate', 'falseAlarmRate', 'falseClusters', 'familyWiseError', 'falseDiscoveryProportion',
  'dice', 'rocAuc', 'peakErrorMeanMm', 'peakErrorMaxMm', 'peakStatisticMean', 'centreStatisticMean', 'centreMargin',
  'effectEstimatedPct', 'effectPlantedPct', 'effectBiasPct', 'effectRatio', 'effectCentrePct', 'effectCentreBiasPct',
  'truthVoxels', 'survivorVoxels', 'truePositiveVoxels', 'falsePositiveVoxels', 'clusters', 'blobs', 'blobsDetected',
  'threshold', 'tsnrMedian', 'smoothnessFwhmMm', 'smoothnessXMm', 'smoothnessYMm', 'smoothnessZMm', 'dof',
] as const;

/** One metric column name. */
export type ScorecardMetric = (typeof SCORECARD_METRICS)[number];

/**
 * The extra columns of a study's scorecard: the first subject's own run scored as a single-run sweep
 * scores it (against its own planted blobs, at its own amplitude), beside the group map's columns, so
 * one study sweep answers both questions on the same runs and widths.
 */
export const FIRST_LEVEL_METRICS = ['firstLevelHitRate', 'firstLevelBlobHitRate', 'firstLevelFalseClusters', 'firstLevelRocAuc', 'firstLevelCentreStatisticMean', 'firstLevelSmoothnessFwhmMm'] as const;

/**
 * The single-run metric a first-level column copies.
 * @param column - a FIRST_LEVEL_METRICS name
 * @returns the SCORECARD_METRICS name
 * @example firstLevelSource('firstLevelHitRate') // 'hitRate'
 */
export function firstLevelSource(column: string): string {
  const rest = column.replace(/^firstLevel/, '');
  return rest.charAt(0).toLowerCase() + rest.slice(1);
}
