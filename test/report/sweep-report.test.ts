import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { openRun } from '../../src/io/open-run.js';
import { detectionChart, falseAlarmChart, smoothnessChart, tsnrChart } from '../../src/report/charts-sweep.js';
import { rocChart } from '../../src/report/charts-roc.js';
import { readDecisionRecord, recordDir, rerunRecord, textSha256 } from '../../src/report/decision-record.js';
import { methodsText, shortCitation } from '../../src/report/methods-text.js';
import { renderSvg } from '../../src/report/render-svg.js';
import { runFacts } from '../../src/report/run-facts.js';
import { readSweepFolder, writeSweepFolder } from '../../src/report/sweep-folder.js';
import { writeReport, type WrittenReport } from '../../src/report/write-report.js';
import { resolvePhantomSpec, simulatePhantomRun, writePhantomRun, TISSUE_LABEL } from '../../src/simulate/index.js';
import { buildMask, maskFromFile } from '../../src/sweep/mask-source.js';
import { runSweep, type SweepResult } from '../../src/sweep/runner.js';
import { scorecardToTsv } from '../../src/sweep/scorecard-tsv.js';

// A small phantom written to disk as a BIDS-like run, swept, reported, and re-run from its record.
let dir: string;
let out: string;
let result: SweepResult;
let written: WrittenReport;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'boldsweep-report-'));
  const sim = simulatePhantomRun(resolvePhantomSpec({ nVolumes: 80, dims: [30, 36, 24], spacingMm: [5, 5, 5], activation: null, seed: 5, anatomy: { supersample: 1 } }));
  const files = await writePhantomRun(join(dir, 'data'), sim, 'sub-t01_task-flicker');
  const run = await openRun(files.bold);
  const masks = { brain: { kind: 'otsu-mean' as const }, placement: await maskFromFile(files.tissue, { values: [TISSUE_LABEL['grey-matter']] }), exclude: null };
  const brainMask = await buildMask(masks.brain, run.volume);
  const placementMask = await buildMask(masks.placement, run.volume);
  result = await runSweep(run, {
    recipe: [{ step: 'drop-initial-volumes', params: { count: 3 } }, { step: 'smooth', params: { fwhmMm: 0 } }],
    vary: { 'smooth.fwhmMm': [0, 5, 10] },
    plant: { sizesFwhmMm: [10], amplitudesPct: [3], count: 3, marginMm: 0 },
    repeats: 3, threshold: { kind: 'fwe-rft' }, seed: 21,
  }, { workers: 2, brainMask, placementMask });
  out = join(dir, 'out');
  const folder = { result, run: runFacts(run), masks };
  await writeSweepFolder(out, folder);
  written = await writeReport(out, readSweepFolder(out));
});
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('charts', () => {
  it('every chart renders to an SVG with marks, units on the axes and a perceptually uniform scheme', async () => {
    const card = result.scorecard;
    const specs = [detectionChart(card, { recommended: 5 }), falseAlarmChart(card), tsnrChart(card), smoothnessChart(card), rocChart(card, result.curves)];
    for (const spec of specs) {
      const text = JSON.stringify(spec);
      expect(text).toMatch(/"scheme":\{"name":"(viridis|cividis)"/);
      expect(text).toContain('smoothing FWHM (mm)');
      const svg = await renderSvg(spec);
      expect(svg.startsWith('<svg')).toBe(true);
      expect(svg).toMatch(/class="mark-(line|symbol|rule)/);
    }
    // the x axis is any varied parameter: a categorical one works as well
    const cat = { ...card, varied: ['model.ar1'], rows: card.rows.map((r) => ({ ...r, 'model.ar1': r.settingIndex === 0 })) };
    expect(await renderSvg(detectionChart(cat))).toContain('AR(1) noise model');
  });
});

describe('report files', () => {
  it('writes a self-contained report, methods and decision record', () => {
    const html = readFileSync(written.files.report, 'utf8');
    expect(html).not.toMatch(/<script|https?:\/\/(?!www\.w3\.org)/);
    expect((html.match(/<svg/g) ?? []).length).toBeGreaterThanOrEqual(5);
    expect(html).toContain('not for clinical or presurgical decisions');
    expect(html).toContain('What the simulation cannot know');
    const md = readFileSync(written.files.methods, 'utf8');
    expect(md).toMatch(/smoothing FWHM \d+ mm/);
    expect(md).toContain('Worsley KJ, Marrett S');
    expect(md).toContain('Breiman L');
  });

  it('methods text names the motion terms of the model, fixed or chosen, with their sources', () => {
    const base = written.record;
    expect(methodsText(base).paragraphs.join(' ')).not.toContain('motion regressors');
    const fixed = { ...base, sweepSpec: { ...base.sweepSpec, model: { ...base.sweepSpec.model, motionRegressors: 24 as const, censorFdMm: 0.5 } } };
    const m = methodsText(fixed);
    const text = m.paragraphs.join(' ');
    expect(text).toContain('24 mean-centred motion regressors: the six rigid-body motion parameters, their values one volume earlier and the squares of both (Friston et al. 1996)');
    expect(text).toMatch(/one indicator regressor for each volume whose framewise displacement \(Power et al\. 2012; rotations as arc length on a 50 mm sphere\) exceeded 0\.5 mm/);
    expect(m.references.join(' ')).toContain('Friston KJ, Williams S');
    // a varied value as chosen overrides the spec's own
    const chosen = { ...fixed, choice: { ...fixed.choice, setting: { ...fixed.choice.setting, 'model.motionRegressors': 6, 'model.censorFdMm': null } } };
    const model6 = methodsText(chosen).paragraphs[1]; // the model's paragraph
    expect(model6).toContain('6 mean-centred motion regressors: the six rigid-body motion parameters,');
    expect(model6).not.toContain('framewise displacement');
    // censoring that reaches neighbours says how far
    const reach = { ...fixed, choice: { ...fixed.choice, setting: { ...fixed.choice.setting, 'model.censorFdAfter': 2 } }, sweepSpec: { ...fixed.sweepSpec, model: { ...fixed.sweepSpec.model, censorFdBefore: 1 } } };
    expect(methodsText(reach).paragraphs.join(' ')).toMatch(/exceeded 0\.5 mm and for the 1 volume before and 2 volumes after each of them/);
  });

  it('methods text gives numbers with units and cites what it uses', () => {
    const m = methodsText(written.record);
    const text = m.paragraphs.join(' ');
    expect(text).toContain('TR 2.000 s');
    expect(text).toContain('3 repeats');
    expect(text).toContain('10 mm FWHM and 3 % peak signal change');
    expect(text).toContain('(Glover 1999)');
    expect(text).toContain('(Worsley et al. 1996)');
    // every in-text citation has its reference
    for (const ref of m.references) expect(text).toContain(shortCitation(ref));
    expect(shortCitation('Benjamini Y, Hochberg Y (1995) J R Stat Soc B 57(1):289-300')).toBe('Benjamini & Hochberg 1995');
    expect(shortCitation('Glover GH (1999) NeuroImage 9(4):416-429')).toBe('Glover 1999');
    expect(shortCitation('Eklund A, Nichols TE, Knutsson H (2016) PNAS 113(28):7900-7905')).toBe('Eklund et al. 2016');
  });

  it('the decision record holds hashes, versions, recipe, spec, seed, summary and the choice', () => {
    const r = readDecisionRecord(written.files.record);
    expect(r.inputs.image!.sha256).toMatch(/^[0-9a-f]{64}$/);
    // file names and hashes only: a local path can hold a participant's identity
    expect(r.inputs.image!.path).toBe('sub-t01_task-flicker_bold.nii.gz');
    expect(r.masks.placement.kind === 'file' && r.masks.placement.file.path).toBe('sub-t01_task-flicker_truth-tissue.nii.gz');
    for (const f of ['decision-record.json', 'sweep.json', 'methods.md', 'report.html']) expect(readFileSync(join(out, f), 'utf8')).not.toContain(dir);
    expect(r.inputs.events).not.toBeNull();
    expect(r.software.node).toBe(process.version);
    expect(r.software.boldsweep).toBe(JSON.parse(readFileSync('package.json', 'utf8')).version);
    expect(r.sidecarFieldsUsed.RepetitionTime).toBe(2);
    expect(r.seed).toBe(21);
    expect(r.recipe[1]).toEqual({ step: 'smooth', params: { fwhmMm: r.choice.setting['smooth.fwhmMm'], mode: 'reflect', withinMask: false } });
    expect(r.stepNotes.map((n) => n.step)).toEqual(['drop-initial-volumes', 'smooth']);
    expect(r.scorecard.sha256).toBe(textSha256(readFileSync(join(out, 'scorecard.tsv'), 'utf8')));
    expect(r.scorecard.summary).toHaveLength(3);
    expect(r.choice.ruleId).toBe('one-se-simplest');
  });
});

describe('rerunRecord', () => {
  it('re-running the record reproduces the scorecard byte for byte', async () => {
    const path = written.files.record;
    // the record names its inputs but not their folder: the re-run is told where they are
    expect(existsSync(join(recordDir(path), 'sub-t01_task-flicker_bold.nii.gz'))).toBe(false);
    const again = await rerunRecord(readDecisionRecord(path), { inputDir: join(dir, 'data'), workers: 1 });
    expect(again.reproduced).toBe(true);
    expect(again.tsv).toBe(scorecardToTsv(result.scorecard));
  });

  it('refuses when an input changed since the record was made', async () => {
    const r = readDecisionRecord(written.files.record);
    try {
      await rerunRecord(r, { inputDir: dir });
      expect.unreachable();
    } catch (e) {
      expect(isBoldsweepError(e, 'FILE_NOT_FOUND')).toBe(true); // the inputs are not in that folder
    }
    const events = join(dir, 'data', r.inputs.events!.path);
    expect(existsSync(events)).toBe(true);
    writeFileSync(events, readFileSync(events, 'utf8') + '\n');
    try {
      await rerunRecord(r, { inputDir: join(dir, 'data') });
      expect.unreachable();
    } catch (e) {
      expect(isBoldsweepError(e, 'RECORD_INVALID')).toBe(true);
    }
  });

  it('refuses a file that is not a decision record', () => {
    const p = join(dir, 'bad.json');
    writeFileSync(p, JSON.stringify({ format: 'something else' }));
    expect(() => readDecisionRecord(p)).toThrow(/decision record/);
  });
});
