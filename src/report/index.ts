// report: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { renderSvg } from './render-svg.js';
// look figures: images (PNG, own bitmap font, published colour tables) and charts (vega-lite)
export { colourTable, colourOf, mapHex, type ColourMapName } from './colour-map.js';
export { createRgbImage, fillRect, blit, encodeRgbPng, type RgbImage } from './rgb-image.js';
export { drawText, textWidth } from './bitmap-font.js';
export { displayAxes, extractPlane, type DisplayAxes, type PlaneImage, type PlaneName } from './display-planes.js';
export { renderPlane, labelEdges, colourBar, autoRange, type MapLook } from './plane-panel.js';
export { threePlanePng, type MapFigureOptions } from './three-plane-png.js';
export { sliceGridPng } from './slice-grid-png.js';
export { traceChartSpec, lookTracesSpec, voxelTimeCourseSpec, LOOK_COLOURS } from './look-charts.js';
export { voxelRasterPng, voxelRasterSvg, RASTER_Z_LIMIT } from './voxel-raster-figure.js';
export { lookFigures, chosenVoxels, maskCentre, type LookFigure } from './look-figures.js';
export { writeLookFolder, lookSummaryJson, lookSeriesTsv } from './write-look-folder.js';
// sweep report: charts, recommendation text, methods, decision record, HTML
export { metricChart, type MetricChartOptions } from './chart-metric.js';
export { detectionChart, falseAlarmChart, tsnrChart, smoothnessChart, type SweepChartOptions } from './charts-sweep.js';
export { rocChart } from './charts-roc.js';
export { repeatedResamplingChart, type ResamplingMeasure } from './charts-resampling.js';
export { chartPoints, plantLabel, type ChartPoint } from './chart-data.js';
export { metricLabel, parameterLabel, unitOf } from './chart-labels.js';
export { CHART_CONFIG, SIZE_SCHEME, SETTING_SCHEME } from './chart-style.js';
export { RESEARCH_CAUTION } from './caution.js';
export { htmlReport, type ReportChart, type ReportParts } from './html-report.js';
export { methodsText, methodsMarkdown, shortCitation, METHOD_REFERENCES, type MethodsText } from './methods-text.js';
export { buildDecisionRecord, readDecisionRecord, checkDecisionRecord, rerunRecord, recordDir, textSha256, type DecisionInputs, type RerunOutcome } from './decision-record.js';
export type { DecisionRecord, MetricSummary } from './decision-record-types.js';
export { runFacts, type RunFacts } from './run-facts.js';
export { writeSweepFolder, readSweepFolder, type SweepFolder } from './sweep-folder.js';
export { writeReport, sweepCharts, type WrittenReport } from './write-report.js';
export { thresholdText } from './threshold-text.js';
export { softwareVersions, packageRoot } from './software-versions.js';
