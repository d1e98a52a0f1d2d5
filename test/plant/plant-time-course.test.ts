import { describe, expect, it } from 'vitest';
import { isBoldsweepError } from '../../src/core/errors.js';
import type { BoldEvent } from '../../src/io/run-types.js';
import { plantTimeCourse } from '../../src/plant/plant-time-course.js';

const ev = (onsetSec: number, durationSec: number, trialType = 'flicker'): BoldEvent => ({ onsetSec, durationSec, trialType, modulation: 1 });

describe('plantTimeCourse', () => {
  it('is the HRF of an impulse divided by its largest sample', () => {
    // Glover (1999) NeuroImage 9:416-429 form, values [C] from REFERENCES.md §2:
    // h(2,4,5,6,8,10,15,20) = .112836, .778191, .961477, .903418, .373844, -.094912, -.158870, -.020463.
    // An impulse at 0 s sampled at whole seconds (TR 1 s, sample time 0) peaks among the samples at 5 s,
    // so the time course is h(t) / h(5). Tolerance 2e-6: the reference values carry 6 digits.
    const tc = plantTimeCourse([ev(0, 0)], 30, 1, { sampleTimeSec: 0 });
    const ref: Array<[number, number]> = [[2, 0.112836], [4, 0.778191], [5, 0.961477], [6, 0.903418], [8, 0.373844], [10, -0.094912], [15, -0.15887], [20, -0.020463]];
    for (const [t, h] of ref) expect(Math.abs(tc[t] - h / 0.961477), `t = ${t} s`).toBeLessThan(2e-6);
    expect(Math.max(...tc)).toBe(1);
  });

  it('uses the named condition and refuses an ambiguous one', () => {
    const events = [ev(4, 10, 'a'), ev(40, 10, 'b')];
    const a = plantTimeCourse(events, 40, 2, { condition: 'a' });
    expect(a.indexOf(1)).toBeLessThan(10); // the response to 'a' peaks early in the run
    let code = '';
    try { plantTimeCourse(events, 40, 2); } catch (e) { code = isBoldsweepError(e) ? e.code : 'other'; }
    expect(code).toBe('INVALID_ARGUMENT');
  });
});
