// report: public exports of this module (re-exports only; src/index.ts re-exports this file).
export { renderSvg } from './render-svg.js';
// look figures: SVG with vector text around embedded images (published colour tables), charts (vega-lite), the look page
export { colourTable, colourOf, mapHex, type ColourMapName } from './colour-map.js';
export { createRgbImage, fillRect, blit, encodeRgbPng, type RgbImage } from './rgb-image.js';
export { svgText, svgImage, svgColourBar, svgDocument, FIGURE_FONT } from './figure-svg.js';
export { displayAxes, extractPlane, type DisplayAxes, type PlaneImage, type PlaneName } from './display-planes.js';
export { renderPlane, svgEdgeLabels, autoRange, formatValue, OUTSIDE_MASK_RGB, type MapLook, type PlaneDrawOptions } from './plane-panel.js';
export { threePlaneSvg, MASK_OUTLINE_RGB, type MapFigureOptions } from './three-plane-svg.js';
export { sliceGridSvg } from './slice-grid-svg.js';
export { traceChartSpec, lookTracesSpec, voxelTimeCourseSpec, LOOK_COLOURS } from './look-charts.js';
export { voxelRasterImage, voxelRasterPng, voxelRasterSvg, RASTER_Z_LIMIT } from './voxel-raster-figure.js';
export { lookPageHtml } from './look-page.js';
export { tableHtml, type TableHtmlOptions } from './table-html.js';
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
export { runFacts, privateRunFacts, privateMasks, type RunFacts } from './run-facts.js';
export { writeSweepFolder, readSweepFolder, type SweepFolder } from './sweep-folder.js';
export { writeReport, sweepCharts, type WrittenReport } from './write-report.js';
export { thresholdText } from './threshold-text.js';
export { softwareVersions, packageRoot } from './software-versions.js';
export { readLookFolder, type LookFolderFacts } from './read-look-folder.js';
export { starterSpecYaml, STARTER_SPEC_HEADER } from './starter-spec-yaml.js';
export { motionTableSpec, fdTraceSpec, edgeSignatureSpec } from './look-motion-charts.js';
