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

/**
 * An axis title that fits beside a chart: labels longer than 28 characters are split before their
 * parenthesis onto two lines (headless vega estimates text widths generously, and an over-long
 * rotated title pushes the plot away from its own title).
 * @param label - e.g. 'Hit rate (fraction of planted voxels detected)'
 * @returns one line, or two as an array
 * @example axisTitle('Hit rate (fraction of planted voxels detected)') // ['Hit rate', '(fraction of planted voxels detected)']
 */
export function axisTitle(label: string): string | string[] {
  if (label.length <= 28) return label;
  const i = label.indexOf(' (');
  return i > 0 ? [label.slice(0, i), label.slice(i + 1)] : label;
}

/**
 * The range a metric can take, so intervals can be drawn and listed within it (a t-interval of a
 * rate can pass 1, one of a count can pass 0).
 * @param metric - scorecard column
 * @returns [low, high] (infinite where unbounded)
 * @example metricRange('hitRate') // [0, 1]
 */
export function metricRange(metric: string): [number, number] {
  if (/Rate$|^familyWiseError$|^falseDiscoveryProportion$|^dice$|^rocAuc$/.test(metric)) return [0, 1];
  if (/Voxels$|^falseClusters$|^clusters$|^blobs|^tsnrMedian$|^smoothness|FwhmMm$|Mm$/.test(metric) && !/Bias/.test(metric)) return [0, Infinity];
  return [-Infinity, Infinity];
}
