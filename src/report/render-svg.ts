import * as vega from 'vega';
import { compile, type TopLevelSpec } from 'vega-lite';

/**
 * Render a vega-lite spec to an SVG string in Node (no canvas, no browser): compile to vega, then
 * let a headless vega View draw it.
 * @param spec - a complete vega-lite spec with inline data
 * @returns SVG markup
 * @example const svg = await renderSvg(chartSpec); writeFileSync('chart.svg', svg)
 */
export async function renderSvg(spec: TopLevelSpec): Promise<string> {
  const vgSpec = compile(spec).spec;
  const view = new vega.View(vega.parse(vgSpec), { renderer: 'none' });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}
