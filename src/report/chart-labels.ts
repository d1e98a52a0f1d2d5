import { parameterName, parameterUnit } from '../sweep/settings-grid.js';

/**
 * Axis labels with units for scorecard columns and varied parameters. Units come from the name
 * suffix (fwhmMm -> mm, cutoffSec -> s, ...), as every boldsweep option carries its unit in its name.
 */

const METRIC_LABELS: Record<string, string> = {
  hitRate: 'Hit rate (fraction of planted voxels detected)',
  blobHitRate: 'Blobs detected (fraction of planted blobs)',
  falseAlarmRate: 'False-alarm rate (fraction of non-planted voxels)',
  falseClusters: 'False clusters per run (count)',
  familyWiseError: 'Runs with any false cluster (fraction)',
  falseDiscoveryProportion: 'False discovery proportion (fraction of survivors)',
  dice: 'Dice overlap with planted truth (0-1)',
  rocAuc: 'ROC area (0.5 = chance)',
  peakErrorMeanMm: 'Peak location error (mm)',
  effectBiasPct: 'Effect-size bias (% signal change)',
  effectRatio: 'Estimated / planted effect (ratio)',
  tsnrMedian: 'Median tSNR in brain mask (ratio)',
  smoothnessFwhmMm: 'Estimated smoothness, FWHM (mm)',
  thresholdZ: 'Threshold (z)',
};

/**
 * A readable axis title for a metric column, with its unit.
 * @param metric - scorecard column
 * @returns the label (the column name itself when unknown)
 * @example metricLabel('hitRate') // 'Hit rate (fraction of planted voxels detected)'
 */
export function metricLabel(metric: string): string {
  return METRIC_LABELS[metric] ?? metric;
}

/**
 * An axis title for a varied parameter: "smooth.fwhmMm" -> "smoothing FWHM (mm)".
 * @param key - "<step>.<param>"
 * @returns the title
 * @example parameterLabel('highpass.cutoffSec') // 'high-pass cutoff (s)'
 */
export function parameterLabel(key: string): string {
  const unit = parameterUnit(key);
  return `${parameterName(key)}${unit ? ` (${unit})` : ''}`;
}

/**
 * The unit implied by a parameter name's suffix.
 * @param name - e.g. 'smooth.fwhmMm'
 * @returns 'mm', 's', '%', 'deg' or ''
 * @example unitOf('highpass.cutoffSec') // 's'
 */
export const unitOf = parameterUnit;
