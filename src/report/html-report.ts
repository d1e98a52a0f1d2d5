import { metricWords, type PlantChoice, type Recommendation } from '../decide/recommend-setting.js';
import type { SettingSummary } from '../decide/summarise-scorecard.js';
import { settingText } from '../sweep/settings-grid.js';
import { RESEARCH_CAUTION } from './caution.js';
import { escapeHtml } from './html-escape.js';
import { metricLabel, metricRange } from './chart-labels.js';
import type { MethodsText } from './methods-text.js';
import type { NullCalibration } from '../sweep/runner.js';
import type { SweepSpec } from '../sweep/spec.js';
import { proportionInterval } from '../decide/confidence.js';

/** One chart of the report: rendered SVG and a caption saying what it shows. */
export interface ReportChart {
  id: string;
  title: string;
  svg: string;
  caption: string;
}

/** Everything the HTML report shows. */
export interface ReportParts {
  title: string;
  /** One-line description of the run (grid, volumes, TR). */
  runSummary: string;
  /** Lines describing the sweep (recipe, varied values, planting, repeats, threshold, seed). */
  sweepLines: string[];
  recommendation: Recommendation;
  charts: ReportChart[];
  summaries: SettingSummary[];
  /** Metric columns shown in the summary table. */
  tableMetrics: string[];
  methods: MethodsText;
  /** Lines about how the sweep ran (cells, cache hits, workers, seconds). */
  runLines: string[];
  /** Per setting: the family-wise false-alarm rate measured on null designs (null when none were fitted). */
  nullCalibration?: NullCalibration[] | null;
  /** The sweep spec (threshold rule for the null-calibration table). */
  spec?: SweepSpec;
  /** Software versions, e.g. { boldsweep: '0.1.0', node: 'v20.20.2' }. */
  software: Record<string, string>;
}

const fmt = (x: number, d = 3) => (Number.isFinite(x) ? x.toFixed(d) : 'n/a');

function summaryTable(parts: ReportParts): string {
  const chosen = parts.recommendation.choice;
  const head = ['Planted', 'Setting', 'Repeats', ...parts.tableMetrics.map(metricLabel)];
  const rows = parts.summaries.map((s) => {
    const isChoice = s.settingIndex === chosen.chosen.settingIndex && s.plantSizeMm === chosen.plantSizeMm && s.plantAmplitudePct === chosen.plantAmplitudePct;
    const cells = [
      s.plantSizeMm > 0 ? `${s.plantSizeMm} mm, ${s.plantAmplitudePct} %` : 'nothing planted',
      settingText(s.setting) + (isChoice ? (chosen.status === 'chosen' ? ' (recommended)' : chosen.status === 'saturated' && chosen.fallback ? ' (picked by the fallback metric)' : '') : ''),
      String(s.repeats),
      ...parts.tableMetrics.map((m) => {
        const v = s.metrics[m];
        // the interval is listed within the metric's possible range (a count's t-interval can pass 0)
        const [lo, hi] = metricRange(m);
        const cut = (x: number) => (Number.isFinite(x) ? Math.min(hi, Math.max(lo, x)) : x);
        if (!v) return 'n/a';
        // no interval when it has no width (one repeat, or the same value in every repeat)
        const lowCut = cut(v.low), highCut = cut(v.high);
        return Number.isFinite(lowCut) && Number.isFinite(highCut) && highCut > lowCut ? `${fmt(v.mean)} <span class="ci">[${fmt(lowCut)}, ${fmt(highCut)}]</span>` : `${fmt(v.mean)}${v.n > 1 && v.sd === 0 ? ' <span class="ci">(all repeats)</span>' : ''}`;
      }),
    ];
    return `<tr${isChoice ? ' class="chosen"' : ''}>${cells.map((c, i) => `<td>${i < 3 ? escapeHtml(c) : c}</td>`).join('')}</tr>`;
  });
  return `<table class="summary"><thead><tr>${head.map((h) => `<th>${escapeHtml(h)}</th>`).join('')}</tr></thead><tbody>${rows.join('\n')}</tbody></table>`;
}

function evidenceTable(rec: Recommendation): string {
  const c = rec.choice;
  const mark = c.status === 'chosen' || (c.status === 'saturated' && c.fallback);
  const rows = c.evidence.map((e) => `<tr${e === c.chosen && mark ? ' class="chosen"' : ''}><td>${escapeHtml(e.label)}</td><td>${fmt(e.detection.mean)}</td><td>${fmt(e.detection.se)}</td><td>${e.withinOneSe ? 'yes' : 'no'}</td><td>${e.falseClusters ? fmt(e.falseClusters.mean, 2) : 'n/a'}</td></tr>`);
  const metric = metricWords(c.metric);
  return `<table class="evidence"><thead><tr><th>Setting</th><th>Mean ${escapeHtml(metric)}</th><th>Standard error</th><th>Within one standard error of the best (&ge; ${fmt(c.cutoff)})</th><th>False clusters per run</th></tr></thead><tbody>${rows.join('\n')}</tbody></table>`;
}

/** The measured family-wise false-alarm rate per setting beside the nominal one. */
function nullCalibrationSection(parts: ReportParts): string {
  const cal = parts.nullCalibration;
  if (!cal || !cal.length || !parts.spec) return '';
  const kind = parts.spec.threshold.kind;
  const label = (i: number) => settingText(parts.summaries.find((s) => s.settingIndex === i)?.setting ?? {});
  const rate = (k: number, n: number) => {
    const w = proportionInterval(k, n);
    return `${fmt(w.rate, 3)} <span class="ci">[${fmt(w.low, 3)}, ${fmt(w.high, 3)}]</span>`;
  };
  const calibrated = kind === 'fwe-calibrated';
  const head = ['Setting', 'Residual smoothness FWHM (mm)', 'Nominal rate', ...(calibrated ? ['Calibrated threshold (t)', 'Measured rate, calibrated'] : []), 'Random-field-or-Bonferroni threshold (t)', 'Measured rate, random-field-or-Bonferroni'];
  const rows = cal.map((c) => `<tr><td>${escapeHtml(label(c.settingIndex))}</td><td>${fmt(c.smoothnessFwhmMm, 1)}</td><td>${c.alpha}</td>${calibrated ? `<td>${fmt(c.calibratedThreshold ?? NaN, 2)}</td><td>${rate(c.calibratedExceed ?? 0, c.designs)}</td>` : ''}<td>${fmt(c.rftBonferroniThreshold, 2)}</td><td>${rate(c.rftBonferroniExceed, c.designs)}</td></tr>`);
  const note = calibrated
    ? `The calibrated threshold is, for each setting, the maximum statistic that ${cal[0].designs} null designs on this run exceed in at most a fraction ${parts.spec.threshold.alpha} of cases, so its measured rate is at most nominal by construction; the random-field-or-Bonferroni column shows what the theory-based rule would have done on the same noise.`
    : `Each setting's recipe was applied to the unplanted run and ${cal[0].designs} random block designs were fitted to it; a design counts when its largest statistic in the brain mask reaches the threshold. A measured rate far below nominal means the rule is conservative at that setting (and detects less); far above means it lets false alarms through.`;
  return `<h2>Family-wise false alarms on this run's noise</h2>
<p class="meta">Nominal and measured family-wise false-alarm rate per setting, with 95 % Wilson intervals. ${escapeHtml(note)}</p>
<table class="null"><thead><tr>${head.map((h) => `<th>${escapeHtml(h)}</th>`).join('')}</tr></thead><tbody>${rows.join('\n')}</tbody></table>`;
}

/** One line on another plant condition's choice, by its status. */
function otherText(p: PlantChoice): string {
  const m = metricWords(p.metric);
  switch (p.status) {
    case 'nothing-planted': return 'nothing planted (false alarms only)';
    case 'no-detection': return `nothing detected at any setting (best mean ${m} ${fmt(p.best.detection.mean)})`;
    case 'tied': return `no setting separates (best ${p.best.label} at ${fmt(p.best.detection.mean)}; all within one standard error)`;
    case 'saturated': return `${p.atCeiling.length} settings at the ceiling${p.fallback ? `; by the ${m}, ${p.chosen.label} (best ${p.best.label})` : ''}`;
    default: return `${p.chosen.label} (mean ${m} ${fmt(p.chosen.detection.mean)}; best ${p.best.label} at ${fmt(p.best.detection.mean)})`;
  }
}

/** Status words for the recommendation box. */
const STATUS_HEADING: Record<PlantChoice['status'], string> = {
  chosen: 'Recommendation',
  'no-detection': 'No recommendation: nothing was detected',
  'nothing-planted': 'No recommendation: nothing was planted (a null sweep measures false alarms)',
  saturated: 'No recommendation by detection: detection at its ceiling',
  tied: 'No clear recommendation: the settings do not separate',
};

/**
 * Terms the report uses, defined once. A planted voxel is where the planted signal is at least half its
 * peak (the truth mask the plant module returns).
 */
const TERMS: Array<[string, string]> = [
  ['Planted activation', 'a blob of known size, position and time course added to the unprocessed run'],
  ['Planted voxel', 'a voxel where a planted blob reaches at least half its peak signal; the hit rate is the fraction of planted voxels that survive the threshold'],
  ['False cluster', 'a connected group of surviving voxels that touches no planted voxel'],
  ['Repeat', 'one planting at new random positions; every setting is applied to the same plantings'],
  ['Standard error', 'the spread of a mean across repeats (standard deviation / square root of the number of repeats)'],
];

/**
 * A self-contained HTML page (no scripts, no external files): recommendation first, then its
 * evidence, the charts as inline SVG, the summary table, the methods paragraph and the caution.
 * @param parts - the report's content
 * @returns the HTML text
 * @example await writeFileAtomic('out/demo/report.html', htmlReport(parts))
 */
export function htmlReport(parts: ReportParts): string {
  const rec = parts.recommendation;
  const others = rec.perPlant.filter((p) => p !== rec.choice);
  const charts = parts.charts.map((c) => `<figure id="${escapeHtml(c.id)}" class="chart">${c.svg}<figcaption>${escapeHtml(c.caption)}</figcaption></figure>`).join('\n');
  const perPlant = others.length
    ? `<p>Other planted conditions, same rule:</p><ul>${others.map((p) => `<li>${p.plantSizeMm} mm, ${p.plantAmplitudePct} %: ${escapeHtml(otherText(p))}</li>`).join('')}</ul>`
    : '';
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(parts.title)}</title>
<style>
body { font-family: Helvetica, Arial, sans-serif; max-width: 1100px; margin: 2em auto; padding: 0 1em; color: #222; line-height: 1.45; }
h1 { font-size: 1.6em; margin-bottom: 0.2em; } h2 { font-size: 1.2em; margin-top: 2em; border-bottom: 1px solid #ddd; }
.caution { background: #fff6e0; border-left: 4px solid #c98a00; padding: 0.6em 1em; }
.choice { background: #eef4fb; border-left: 4px solid #2c5d8f; padding: 0.6em 1em; font-size: 1.05em; }
table { border-collapse: collapse; font-size: 0.88em; margin: 0.8em 0; } th, td { border: 1px solid #ddd; padding: 3px 7px; text-align: left; }
th { background: #f4f4f4; } tr.chosen td { background: #eef4fb; font-weight: bold; } .ci { color: #666; font-weight: normal; }
figure.chart { display: inline-block; margin: 0.6em 1em 1em 0; vertical-align: top; } figcaption { font-size: 0.85em; color: #555; max-width: 560px; }
.meta { color: #555; font-size: 0.9em; } code { background: #f4f4f4; padding: 0 3px; }
</style>
</head>
<body>
<h1>${escapeHtml(parts.title)}</h1>
<p class="meta">${escapeHtml(parts.runSummary)}</p>
<p class="caution"><strong>Caution.</strong> ${escapeHtml(RESEARCH_CAUTION)}</p>

<h2>${escapeHtml(STATUS_HEADING[rec.choice.status])}</h2>
<p class="choice" data-status="${rec.choice.status}">${escapeHtml(rec.summary)}</p>
<p><strong>Rule.</strong> ${escapeHtml(rec.rule)}</p>
${evidenceTable(rec)}
${perPlant}
<h3>Terms</h3>
<dl class="terms">${TERMS.map(([t, d]) => `<dt>${escapeHtml(t)}</dt><dd>${escapeHtml(d)}</dd>`).join('')}</dl>
<h3>What the simulation cannot know</h3>
<ul>${rec.caveats.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul>

${nullCalibrationSection(parts)}
<h2>Charts</h2>
${charts}

<h2>Scorecard summary</h2>
<p class="meta">Mean across repeats with 95 % t-interval [low, high], cut at the metric's possible range. One row per setting and planted condition; the full table, one row per repeat, is in scorecard.tsv.</p>
${summaryTable(parts)}

<h2>Methods</h2>
${parts.methods.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('\n')}
<h3>References</h3>
<ol>${parts.methods.references.map((r) => `<li>${escapeHtml(r)}</li>`).join('')}</ol>

<h2>The sweep</h2>
<ul>${parts.sweepLines.map((l) => `<li>${escapeHtml(l)}</li>`).join('')}</ul>
<ul class="meta">${parts.runLines.map((l) => `<li>${escapeHtml(l)}</li>`).join('')}</ul>
<p class="meta">Made with ${Object.entries(parts.software).map(([k, v]) => `${escapeHtml(k)} ${escapeHtml(v)}`).join(', ')}. The decision record (decision-record.json) holds the input hashes, the spec and the seed needed to re-run this sweep.</p>
</body>
</html>
`;
}
