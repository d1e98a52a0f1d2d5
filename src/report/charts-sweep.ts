import type { TopLevelSpec } from 'vega-lite';
import type { Scorecard } from '../sweep/scorecard.js';
import { metricChart } from './chart-metric.js';
import { parameterLabel } from './chart-labels.js';

/** Options shared by the sweep charts. */
export interface SweepChartOptions {
  /** Varied key on the x axis. __Default value:__ the first varied key */
  x?: string;
  /** x value of the recommended setting, marked with a dashed rule. */
  recommended?: number | string | boolean | null;
  /** Metric used for detection. __Default value:__ 'hitRate' */
  metric?: string;
  /** Threshold rule in words, for the subtitle (e.g. "FWE 0.05 (random-field theory)"). */
  thresholdText?: string;
}

const xName = (card: Scorecard, o: SweepChartOptions) => { const k = o.x ?? card.varied[0]; return k ? parameterLabel(k) : 'recipe'; };

/**
 * Detection vs the varied parameter, one line per planted size: for smoothing this is the
 * matched-filter curve, highest near the kernel width that equals the activation width.
 * @param card - the scorecard
 * @param options - axis, metric, recommended value
 * @returns a vega-lite spec
 * @example await renderSvg(detectionChart(card, { recommended: 8 }))
 */
export function detectionChart(card: Scorecard, options: SweepChartOptions = {}): TopLevelSpec {
  const metric = options.metric ?? 'hitRate';
  return metricChart(card, metric, {
    x: options.x, mark: options.recommended, yDomain: metric === 'rocAuc' ? undefined : [0, 1],
    title: `Detection of planted activations vs ${xName(card, options)}`,
    subtitle: [`mean across repeats with 95 % t-interval${options.thresholdText ? `; detections called at ${options.thresholdText}` : ''}`],
  });
}

/**
 * False alarms (clusters with no planted voxel, per run) vs the varied parameter.
 * @param card - the scorecard
 * @param options - axis, recommended value
 * @returns a vega-lite spec
 * @example await renderSvg(falseAlarmChart(card))
 */
export function falseAlarmChart(card: Scorecard, options: SweepChartOptions = {}): TopLevelSpec {
  return metricChart(card, 'falseClusters', {
    x: options.x, mark: options.recommended,
    title: `False alarms vs ${xName(card, options)}`,
    subtitle: [`clusters with no planted voxel, per run; mean with 95 % t-interval${options.thresholdText ? `; ${options.thresholdText}` : ''}`],
  });
}

/**
 * Median tSNR inside the brain mask after the recipe, vs the varied parameter.
 * @param card - the scorecard
 * @param options - axis, recommended value
 * @returns a vega-lite spec
 * @example await renderSvg(tsnrChart(card))
 */
export function tsnrChart(card: Scorecard, options: SweepChartOptions = {}): TopLevelSpec {
  return metricChart(card, 'tsnrMedian', { x: options.x, mark: options.recommended, title: `Temporal SNR after the recipe vs ${xName(card, options)}`, subtitle: 'median over brain-mask voxels of mean / SD over time; mean across repeats' });
}

/**
 * Smoothness estimated from the model residuals (FWHM, geometric mean of the three axes) vs the
 * varied parameter. For Gaussian smoothing it should grow as sqrt(intrinsic^2 + kernel^2).
 * @param card - the scorecard
 * @param options - axis, recommended value
 * @returns a vega-lite spec
 * @example await renderSvg(smoothnessChart(card))
 */
export function smoothnessChart(card: Scorecard, options: SweepChartOptions = {}): TopLevelSpec {
  return metricChart(card, 'smoothnessFwhmMm', { x: options.x, mark: options.recommended, title: `Estimated smoothness vs ${xName(card, options)}`, subtitle: 'FWHM from residuals, geometric mean of x, y, z; mean across repeats' });
}
