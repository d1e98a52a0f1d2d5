import type { Config } from 'vega-lite/build/src/config.js';

/**
 * Shared look of boldsweep charts: plain white background, readable fonts, and perceptually
 * uniform colour schemes (viridis for ordered categories such as sizes, cividis for settings) as
 * the design asks; never the classic rainbow.
 */
export const CHART_CONFIG: Config = {
  background: 'white',
  font: 'Helvetica, Arial, sans-serif',
  title: { fontSize: 14, anchor: 'start', subtitleFontSize: 11, subtitleColor: '#555' },
  axis: { labelFontSize: 11, titleFontSize: 12, grid: true, gridColor: '#e6e6e6' },
  legend: { labelFontSize: 11, titleFontSize: 11 },
  view: { stroke: null },
};

/** Colour scheme for planted sizes (ordered categories). */
export const SIZE_SCHEME = 'viridis';
/** Colour scheme for settings along the varied parameter. */
export const SETTING_SCHEME = 'cividis';

/** Default chart size in pixels. */
export const CHART_WIDTH = 420;
export const CHART_HEIGHT = 260;
