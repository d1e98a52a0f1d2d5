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
