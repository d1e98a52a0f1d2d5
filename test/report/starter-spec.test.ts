import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import YAML from 'yaml';
import { STARTER_SPEC_HEADER, starterSpecYaml } from '../../src/report/starter-spec-yaml.js';
import { parseSweepSpec } from '../../src/sweep/parse-sweep-spec.js';
import { readSweepSpec } from '../../src/sweep/read-sweep-spec.js';
import { curveColumnName, curveTableToTsv, readCurveTableTsv, DEFAULT_FPR_GRID } from '../../src/score/curve-table.js';

const look = { runFile: 'sub-01_task-x_bold.nii.gz', runSha256: 'a'.repeat(64), dims: [64, 64, 36, 200] as [number, number, number, number], trSec: 2, dropInitialVolumes: 4, censorVolumes: [57, 58], why: ['drop 4: steady state reached at volume 4'], findings: [] };

describe('starterSpecYaml', () => {
  it('writes a valid spec with the look\'s drop and censoring filled in and every field explained', () => {
    const text = starterSpecYaml(look);
    expect(text.startsWith(STARTER_SPEC_HEADER)).toBe(true);
    const spec = parseSweepSpec(YAML.parse(text));
    expect(spec.recipe[0]).toEqual({ step: 'drop-initial-volumes', params: { count: 4 } });
    expect(spec.model.censorVolumes).toEqual([57, 58]);
    expect(spec.vary['smooth.fwhmMm']).toEqual([0, 2, 4, 6, 8, 10, 12, 14]);
    // planted size and amplitude are stated defaults, marked for editing
    expect(text).toMatch(/# EDIT: the size of the activation[^\n]*\n( *#[^\n]*\n)* *sizesFwhmMm: \[ 8 \]/);
    expect(text).toMatch(/# EDIT: its peak amplitude[^\n]*\n( *#[^\n]*\n)* *amplitudesPct: \[ 1 \]/);
    // every key of the spec has a comment line right above it (or above its list item)
    const lines = text.split('\n');
    lines.forEach((l, i) => {
      if (/^\s*(- )?[A-Za-z.]+:/.test(l) && !/^\s+(step|params):/.test(l) && !/^\s+- step:/.test(l)) expect(lines[i - 1].trim().startsWith('#'), `no comment above "${l}"`).toBe(true);
    });
    // file name and hash of the run, never a folder
    expect(text).toContain('sub-01_task-x_bold.nii.gz');
    expect(text).not.toMatch(/\/\S*sub-01/);
  });

  it('without a look, leaves the drop step out and censors nothing', () => {
    const spec = parseSweepSpec(YAML.parse(starterSpecYaml(null)));
    expect(spec.recipe.map((s) => s.step)).toEqual(['smooth']);
    expect(spec.model.censorVolumes).toEqual([]);
  });

  it('every spec in examples/ reads as a valid sweep spec', () => {
    const files = readdirSync('examples').filter((f) => /\.ya?ml$/.test(f));
    expect(files.length).toBeGreaterThanOrEqual(2);
    for (const f of files) expect(() => readSweepSpec(join('examples', f)), f).not.toThrow();
  });
});

describe('TSV column names', () => {
  it('roc.tsv columns are plain identifiers and read back to the same grid', () => {
    expect(curveColumnName(0.0005)).toBe('tpr_at_fpr_0_0005');
    const tsv = curveTableToTsv({ fprGrid: [...DEFAULT_FPR_GRID], rows: [{ cell: 0, tpr: DEFAULT_FPR_GRID.map(() => 0.5) }] });
    expect(tsv.split('\n')[0].split('\t').every((c) => /^[A-Za-z][A-Za-z0-9_]*$/.test(c))).toBe(true);
    expect(readCurveTableTsv(tsv).fprGrid).toEqual([...DEFAULT_FPR_GRID]);
    // the earlier header form still reads
    expect(readCurveTableTsv('cell\ttpr@fpr=0.01\n0\t0.5\n').fprGrid).toEqual([0.01]);
  });
});
