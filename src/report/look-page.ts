import type { LookResult } from '../look/look-at-run.js';
import { describeVolumes } from '../look/finding-text.js';
import { RESEARCH_CAUTION } from './caution.js';
import { FIGURE_FONT } from './figure-svg.js';
import { escapeHtml } from './html-escape.js';
import type { LookFigure } from './look-figures.js';
import { formatValue } from './plane-panel.js';

/**
 * The look page (`look.html`): one self-contained HTML file (no scripts, nothing fetched) that puts the
 * look together for a reader: the recommendation, the checks skipped and how to run them, every
 * finding ranked by consequence with its evidence, reason and advice, the numbers (map summaries in
 * the mask, the mask and how it was made, steady state), and every figure inline (SVG as markup).
 * @param look - the look
 * @param figures - from lookFigures (may be empty)
 * @param source - the run's path or a label
 * @returns the HTML document
 * @example await writeFileAtomic('look.html', lookPageHtml(look, await lookFigures(run.volume, look), 'sub-01_bold.nii.gz'))
 */
export function lookPageHtml(look: LookResult, figures: readonly LookFigure[], source: string): string {
  const e = escapeHtml;
  const [nx, ny, nz, nt] = look.dims;
  const rec = look.recommendation;
  const findingRows = look.findings.map((f, i) => `<tr><td class="num">${i + 1}</td><td><b>${e(f.verdict)}</b><div class="small">${e(f.reason)}</div>`
    + `<details><summary>evidence</summary><table class="ev">${Object.entries(f.evidence).map(([k, v]) => `<tr><th>${e(k)}</th><td>${e(evidenceText(v))}</td></tr>`).join('')}</table></details></td>`
    + `<td>${e(f.consequence)}</td><td class="small">${e(f.advice)}</td></tr>`).join('\n');
  const summaryRow = (name: string, s: LookResult['summaries']['mean'], unit: string) => `<tr><th>${e(name)}</th><td>${e(unit)}</td><td class="num">${fmt(s.median)}</td><td class="num">${fmt(s.q1)}-${fmt(s.q3)}</td><td class="num">${fmt(s.min)}-${fmt(s.max)}</td></tr>`;
  const steady = look.steadyState;
  const figureHtml = figures.map((f, i) => {
    const body = f.kind === 'svg' ? String(f.data).replace(/^<\?xml[^>]*>/, '') : `<img alt="${e(f.title)}" src="data:image/png;base64,${Buffer.from(f.data as Uint8Array).toString('base64')}">`;
    return `<figure id="figure-${i + 1}" class="look-figure"><figcaption>Figure ${i + 1}. ${e(f.title)} <span class="small">(${e(f.file)})</span></figcaption>${body}</figure>`;
  }).join('\n');
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>Look at ${e(source)}</title>
<style>
body { font-family: ${FIGURE_FONT}; margin: 24px auto; max-width: 1100px; color: #222; line-height: 1.4; padding: 0 16px; }
h1 { font-size: 22px; } h2 { font-size: 18px; margin-top: 28px; border-bottom: 1px solid #ddd; }
table { border-collapse: collapse; } td, th { border-bottom: 1px solid #e4e4e4; padding: 4px 8px; vertical-align: top; text-align: left; }
.num { text-align: right; font-variant-numeric: tabular-nums; } .small { font-size: 12px; color: #555; }
.box { background: #f4f6f8; border-left: 4px solid #4a6b8a; padding: 8px 14px; }
.caution { font-size: 12px; color: #555; border-top: 1px solid #ddd; margin-top: 32px; padding-top: 8px; }
table.ev th { font-weight: normal; color: #555; } figure { margin: 18px 0; overflow-x: auto; } figcaption { font-size: 13px; margin-bottom: 6px; }
</style></head><body>
<h1>Look at ${e(source)}</h1>
<p class="small">${nx} x ${ny} x ${nz} voxels, ${nt} volumes${look.trSec > 0 ? `, TR ${look.trSec} s` : ''}. Volumes, slices and voxels are numbered from 0.</p>
<section id="recommendation" class="box"><h2 style="border:none;margin-top:4px">Recommendation</h2>
<p>Drop the first ${rec.dropInitialVolumes} volume${rec.dropInitialVolumes === 1 ? '' : 's'}; censor ${rec.censorVolumes.length ? e(describeVolumes(rec.censorVolumes)) : 'no volumes'}.</p>
<ul>${rec.why.map((w) => `<li>${e(w)}</li>`).join('')}</ul></section>
${look.skipped.length ? `<section id="skipped"><h2>Checks not run</h2><ul>${look.skipped.map((s) => `<li><b>${e(s.check)}</b>: ${e(s.why)}. <i>To run it:</i> ${e(s.how)}.</li>`).join('')}</ul></section>` : ''}
<section id="findings"><h2>Findings (${look.findings.length}), most consequential first</h2>
${look.findings.length ? `<table class="findings"><thead><tr><th>#</th><th>what was found, and why</th><th>what it does to the analysis</th><th>what to do</th></tr></thead><tbody>
${findingRows}
</tbody></table>` : '<p>Nothing stood out at the cutoffs used.</p>'}</section>
<section id="numbers"><h2>Numbers</h2>
<table><thead><tr><th>map, inside the mask</th><th>unit</th><th>median</th><th>quartiles</th><th>range</th></tr></thead><tbody>
${summaryRow('mean signal', look.summaries.mean, 'scanner units')}
${summaryRow('temporal SD', look.summaries.sd, 'scanner units')}
${summaryRow('tSNR', look.summaries.tsnr, 'dimensionless')}
</tbody></table>
<p><b>Brain mask:</b> ${look.mask.voxels} voxels; ${e(look.mask.method)}.</p>
<p><b>Steady state:</b> the global mean settles after ${steady.dataCount} volume${steady.dataCount === 1 ? '' : 's'}${steady.modelCount !== null ? `; the grey-matter model predicts ${steady.modelCount}` : ''}${steady.perVoxel ? `; the per-voxel model ${steady.perVoxel.count}` : ''}.</p>
${motionHtml(look)}
<p class="small">Cutoffs (robust z): volumes ${look.settings.volumeCutoffZ}, slices ${look.settings.sliceCutoffZ}, spikes ${look.settings.spikeCutoffZ}; drift order ${look.settings.detrendOrder}.</p></section>
${figures.length ? `<section id="figures"><h2>Figures</h2>\n${figureHtml}</section>` : ''}
<p class="caution">${e(RESEARCH_CAUTION)}</p>
</body></html>
`;
}

/** The head-motion paragraph: where the motion table came from, FD against its threshold, the edge signature. */
function motionHtml(look: LookResult): string {
  const e = escapeHtml;
  const m = look.motion;
  const drop = look.recommendation.dropInitialVolumes;
  const sig = m.edgeSignature ? ` Motion edge signature (before correction; change at the + edge minus the - edge of the mask, % of the edge signal; RMS over volumes): i ${m.edgeSignature.rmsPct[0].toFixed(2)} %, j ${m.edgeSignature.rmsPct[1].toFixed(2)} %, k ${m.edgeSignature.rmsPct[2].toFixed(2)} %.` : ' The mask has no edge on some side, so no motion edge signature.';
  if (!m.fdMm) return `<p><b>Head motion:</b> no motion table, so no framewise displacement (give one: --motion-table on the command line, motionTable in lookAtRun).${e(sig)}</p>`;
  const kept = Array.from(m.fdMm.subarray(drop + 1));
  const max = kept.length ? Math.max(...kept) : 0;
  const mean = kept.length ? kept.reduce((a, b) => a + b, 0) / kept.length : 0;
  return `<p><b>Head motion:</b> motion table ${m.source === 'estimated' ? 'estimated by the look' : 'given'} (${e(m.method)}). Framewise displacement (Power et al. 2012; 50 mm sphere) over the kept volumes: mean ${mean.toFixed(3)} mm, maximum ${max.toFixed(2)} mm; ${m.aboveThreshold.length} volume${m.aboveThreshold.length === 1 ? '' : 's'} above ${m.fdThresholdMm} mm${m.aboveThreshold.length ? ` (${e(describeVolumes(m.aboveThreshold))})` : ''}.${e(sig)}</p>`;
}

function fmt(x: number): string {
  return Number.isFinite(x) ? formatValue(x) : 'n/a';
}

function evidenceText(v: number | string | number[]): string {
  if (Array.isArray(v)) return v.map((x) => (typeof x === 'number' ? fmt(x) : String(x))).join(', ');
  return typeof v === 'number' ? fmt(v) : v;
}
