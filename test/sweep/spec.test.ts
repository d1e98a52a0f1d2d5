import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import { parseSweepSpecShape } from '../../src/sweep/spec.js';
import { parseSweepSpec } from '../../src/sweep/parse-sweep-spec.js';
import { settingsGrid, settingLabel } from '../../src/sweep/settings-grid.js';
import { firstVariedStep, planSweep } from '../../src/sweep/plan.js';
import { parseShard, shardCells } from '../../src/sweep/shard.js';
import { canonicalJson, stableHash } from '../../src/sweep/stable-hash.js';

const base = {
  recipe: [{ step: 'drop-initial-volumes', params: { count: 3 } }, { step: 'smooth', params: { fwhmMm: 0 } }],
  vary: { 'smooth.fwhmMm': [0, 4, 8] },
  plant: { sizesFwhmMm: [6, 10], amplitudesPct: [1], count: 4 },
  repeats: 3,
  threshold: { kind: 'fwe-rft' },
  seed: 11,
};

function codeOf(f: () => unknown): string | undefined {
  try { f(); } catch (e) { return isBoldsweepError(e) ? e.code : 'other'; }
  return undefined;
}

describe('sweep spec shape', () => {
  it('fills defaults', () => {
    const s = parseSweepSpecShape(base);
    expect(s.version).toBe(1);
    expect(s.threshold).toEqual({ kind: 'fwe-rft', alpha: 0.05, q: 0.05, clusterFormingP: 0.001, nullDesigns: null });
    expect(s.model).toEqual({ ar1: true, ar1SmoothFwhmMm: 15, highpassCutoffSec: 128, trialType: null, censorVolumes: [] });
    expect(s.events).toEqual({ kind: 'run' });
    expect(s.plant.marginMm).toBeNull();
    expect(s.plant.shape).toBe('gaussian');
    expect(s.workers).toBe(2);
  });

  it('refuses 0 null designs, and fewer than a calibrated threshold needs, with NULL_DESIGNS_INVALID', () => {
    for (const threshold of [{ kind: 'fwe-rft', nullDesigns: 0 }, { kind: 'fwe-calibrated', nullDesigns: 0 }, { kind: 'fwe-calibrated', nullDesigns: 18 }]) {
      expect(() => parseSweepSpecShape({ ...base, threshold })).toThrow(expect.objectContaining({ code: 'NULL_DESIGNS_INVALID' }));
    }
    // 19 is the fewest for alpha 0.05: the 19th of 19 maxima is exceeded by a new null maximum with probability 1/20
    expect(parseSweepSpecShape({ ...base, threshold: { kind: 'fwe-calibrated', nullDesigns: 19 } }).threshold.nullDesigns).toBe(19);
  });

  it('lists every bad field in one SPEC_INVALID error', () => {
    try {
      parseSweepSpecShape({ ...base, repeats: 0, threshold: { kind: 'maybe' }, extra: 1 });
      expect.unreachable();
    } catch (e) {
      expect(isBoldsweepError(e, 'SPEC_INVALID')).toBe(true);
      const fields = (e as { details: { fields: string[] } }).details.fields.join(' | ');
      expect(fields).toContain('repeats');
      expect(fields).toContain('threshold.kind');
      expect(fields).toContain('(top level)');
    }
  });

  it('rejects malformed vary keys and repeated values', () => {
    expect(codeOf(() => parseSweepSpecShape({ ...base, vary: { fwhm: [1] } }))).toBe('SPEC_INVALID');
    expect(codeOf(() => parseSweepSpecShape({ ...base, vary: { 'smooth.fwhmMm': [4, 4] } }))).toBe('SPEC_INVALID');
  });

  it('does not modify its input', () => {
    const input = JSON.parse(JSON.stringify(base));
    parseSweepSpecShape(input);
    expect(input).toEqual(base);
  });
});

describe('grid and plan', () => {
  it('settingsGrid is the Cartesian product, first key slowest', () => {
    const g = settingsGrid({ 'a.x': [1, 2], 'b.y': ['p', 'q', 'r'] });
    expect(g).toHaveLength(6);
    expect(g[0]).toEqual({ 'a.x': 1, 'b.y': 'p' });
    expect(g[1]).toEqual({ 'a.x': 1, 'b.y': 'q' });
    expect(g[5]).toEqual({ 'a.x': 2, 'b.y': 'r' });
    expect(settingsGrid({})).toEqual([{}]);
    expect(settingLabel({ 'smooth.fwhmMm': 6 })).toBe('smooth.fwhmMm=6');
  });

  it('splits the recipe before the first varied step and shares the group stage across settings', () => {
    const spec = parseSweepSpecShape(base);
    expect(firstVariedStep(spec)).toBe(1);
    const plan = planSweep(spec, { runHash: 'r', contextHash: 'c' });
    expect(plan.cells).toHaveLength(3 * 2 * 3);
    expect(plan.groups).toHaveLength(2 * 3);
    // every setting of a group points at the same group key; the prefix holds only the shared step
    const g0 = plan.cells.filter((c) => c.group === 0);
    expect(g0.map((c) => c.setting['smooth.fwhmMm'])).toEqual([0, 4, 8]);
    expect(plan.groups[0].prefix.map((s) => s.step)).toEqual(['drop-initial-volumes']);
    expect(g0[2].suffix).toEqual([{ step: 'smooth', params: { fwhmMm: 8 } }]);
    // the same repeat uses the same blob seed in every plant condition; different repeats differ
    expect(plan.groups[0].plantSeed).toBe(plan.groups[3].plantSeed);
    expect(plan.groups[0].plantSeed).not.toBe(plan.groups[1].plantSeed);
    expect(new Set(plan.cells.map((c) => c.key)).size).toBe(plan.cells.length);
  });

  it('varying a model option shares the whole recipe', () => {
    const spec = parseSweepSpecShape({ ...base, vary: { 'model.ar1': [true, false] } });
    expect(firstVariedStep(spec)).toBe(2);
    const plan = planSweep(spec, { runHash: 'r', contextHash: 'c' });
    expect(plan.cells[0].model.ar1).toBe(true);
    expect(plan.cells[1].model.ar1).toBe(false);
    expect(plan.cells[1].suffix).toEqual([]);
  });

  it('the AR(1) autocorrelation smoothing width is a model option that can be varied, never negative', () => {
    const spec = parseSweepSpec({ ...base, vary: { 'model.ar1SmoothFwhmMm': [0, 15] } });
    const plan = planSweep(spec, { runHash: 'r', contextHash: 'c' });
    expect([plan.cells[0].model.ar1SmoothFwhmMm, plan.cells[1].model.ar1SmoothFwhmMm]).toEqual([0, 15]);
    expect(plan.cells[0].group).toBe(plan.cells[1].group);
    expect(plan.cells[0].key).not.toBe(plan.cells[1].key); // a cached cell of one width is not reused for the other
    expect(codeOf(() => parseSweepSpec({ ...base, vary: { 'model.ar1SmoothFwhmMm': [-1] } }))).toBe('SPEC_INVALID');
    expect(codeOf(() => parseSweepSpecShape({ ...base, model: { ar1SmoothFwhmMm: -1 } }))).toBe('SPEC_INVALID');
  });

  it('keys change with the inputs and not with the number of workers', () => {
    const spec = parseSweepSpecShape(base);
    const a = planSweep(spec, { runHash: 'r', contextHash: 'c' });
    const b = planSweep({ ...spec, workers: 7 }, { runHash: 'r', contextHash: 'c' });
    const c = planSweep(spec, { runHash: 'r2', contextHash: 'c' });
    expect(b.sweepKey).toBe(a.sweepKey);
    expect(b.cells[5].key).toBe(a.cells[5].key);
    expect(c.cells[5].key).not.toBe(a.cells[5].key);
  });

  it('shards deal whole groups out and together cover every cell once', () => {
    const plan = planSweep(parseSweepSpecShape(base), { runHash: 'r', contextHash: 'c' });
    const parts = [1, 2, 3, 4].map((i) => shardCells(plan, { index: i, count: 4 }));
    const all = parts.flat().sort((x, y) => x - y);
    expect(all).toEqual(plan.cells.map((c) => c.index));
    for (const p of parts) {
      const groups = new Set(p.map((i) => plan.cells[i].group));
      for (const g of groups) expect(p.filter((i) => plan.cells[i].group === g)).toHaveLength(3);
    }
    expect(parseShard('2/4')).toEqual({ index: 2, count: 4 });
    expect(codeOf(() => parseShard('5/4'))).toBe('INVALID_ARGUMENT');
    expect(codeOf(() => parseShard('x'))).toBe('INVALID_ARGUMENT');
  });

  it('canonical JSON ignores key order', () => {
    expect(canonicalJson({ b: 1, a: [2, { d: 3, c: 4 }] })).toBe('{"a":[2,{"c":4,"d":3}],"b":1}');
    expect(stableHash({ x: 1, y: 2 })).toBe(stableHash({ y: 2, x: 1 }));
  });
});
