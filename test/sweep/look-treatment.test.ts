import { describe, expect, it } from 'vitest';
import { applyLookToSpec } from '../../src/sweep/apply-look-to-spec.js';
import { defaultSmoothingSpec } from '../../src/sweep/default-spec.js';
import { plainProgressLines } from '../../src/sweep/plain-progress-lines.js';
import { specDropCount } from '../../src/sweep/spec-drop-count.js';
import { untreatedFindings } from '../../src/sweep/untreated-findings.js';

const look = { dropInitialVolumes: 3, censorVolumes: [1, 40, 41] };

describe('a look\'s findings and a spec', () => {
  it('names what the spec leaves untreated: bright first volumes not dropped, abrupt changes not censored', () => {
    const bare = defaultSmoothingSpec();
    const w = untreatedFindings(bare, look);
    expect(w).toHaveLength(2);
    expect(w[0]).toContain('first 3 volume(s)');
    expect(w[0]).toContain('drops 0');
    // volume 1 is among the dropped ones once the spec drops 3, so only 40 and 41 are named then
    const dropped = defaultSmoothingSpec({ dropInitialVolumes: 3 });
    expect(untreatedFindings(dropped, look)).toEqual(['volume(s) 40, 41 change abruptly (e.g. head motion) and the spec does not censor them']);
    expect(untreatedFindings(defaultSmoothingSpec({ dropInitialVolumes: 3, censorVolumes: [40, 41] }), look)).toEqual([]);
    expect(untreatedFindings(defaultSmoothingSpec({ dropInitialVolumes: 5 }), { dropInitialVolumes: 3, censorVolumes: [] })).toEqual([]);
  });

  it('applies the look where the spec leaves it open, keeps the spec\'s own values and says so', () => {
    const { spec, notes } = applyLookToSpec(defaultSmoothingSpec(), look);
    expect(spec.recipe[0]).toEqual({ step: 'drop-initial-volumes', params: { count: 3 } });
    expect(specDropCount(spec)).toBe(3);
    expect(spec.model.censorVolumes).toEqual([1, 40, 41]);
    expect(notes).toHaveLength(2);
    const own = applyLookToSpec(defaultSmoothingSpec({ dropInitialVolumes: 2, censorVolumes: [40] }), look);
    expect(specDropCount(own.spec)).toBe(2);
    expect(own.spec.model.censorVolumes).toEqual([40]);
    expect(own.notes.join(' ')).toMatch(/kept; the look recommends 3.*kept; the look recommends 1, 40, 41/);
  });

  it('names volumes moved above the FD threshold when no setting censors by FD or models motion', () => {
    const moved = { dropInitialVolumes: 3, censorVolumes: [], movedVolumes: [2, 40, 41], fdThresholdMm: 0.5 };
    const base = defaultSmoothingSpec({ dropInitialVolumes: 3 });
    // volume 2 is dropped; 3 would be the first kept volume, whose move from a dropped one is not counted
    expect(untreatedFindings(base, moved)).toEqual(['volume(s) 40, 41 moved more than 0.5 mm (framewise displacement) and the spec neither censors by it nor models motion (model.censorFdMm, model.motionRegressors)']);
    expect(untreatedFindings({ ...base, model: { ...base.model, censorFdMm: 0.5 } }, moved)).toEqual([]);
    expect(untreatedFindings({ ...base, vary: { ...base.vary, 'model.motionRegressors': [0, 24] } }, moved)).toEqual([]);
    expect(untreatedFindings({ ...base, model: { ...base.model, motionRegressors: 0 } }, moved)).toHaveLength(1);
  });

  it('treats a varied drop count as set by the spec', () => {
    const spec = { ...defaultSmoothingSpec({ dropInitialVolumes: 2 }), vary: { 'drop-initial-volumes.count': [0, 2, 4] } };
    expect(specDropCount(spec)).toBeNull();
    expect(untreatedFindings(spec, { dropInitialVolumes: 3, censorVolumes: [] })).toEqual([]);
  });
});

describe('plainProgressLines', () => {
  it('writes a line at every 10 % of the cells or after 10 s, and one at the end', () => {
    const lines: string[] = [];
    let t = 0;
    const p = plainProgressLines((l) => lines.push(l), () => t);
    const at = (done: number, sec: number) => { t = sec * 1000; p.update({ done, total: 40, fromCache: 0, elapsedSec: sec, etaSec: NaN }); };
    at(0, 0); // first call: a line
    at(1, 1); // 2 %: nothing
    at(2, 2); // 5 %: nothing
    at(4, 3); // 10 %: a line
    at(5, 14); // 11 s since the last line: a line
    at(6, 15); // nothing
    at(40, 16); // the end: a line
    at(40, 17); // nothing after the end
    expect(lines.map((l) => l.split(' cells')[0])).toEqual(['sweep 0/40', 'sweep 4/40', 'sweep 5/40', 'sweep 40/40']);
  });

  it('says while the null designs are fitted, before any cell, and drops it once they are', async () => {
    const { progressLine } = await import('../../src/sweep/progress.js');
    expect(progressLine({ done: 0, total: 160, fromCache: 0, elapsedSec: 12.2, etaSec: NaN, nullDesigns: { done: 3, total: 8 } })).toBe('sweep 0/160 cells (0 %), null designs for 3/8 settings first, 12 s elapsed');
    expect(progressLine({ done: 16, total: 160, fromCache: 0, elapsedSec: 40, etaSec: 36, nullDesigns: { done: 8, total: 8 } })).toBe('sweep 16/160 cells (10 %), 40 s elapsed, about 36 s left');
  });
});
