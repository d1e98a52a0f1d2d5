import { describe, expect, it } from 'vitest';
import { calibratedCriticalValue, minimumNullDesigns, thresholdCalibrated } from '../../src/model/threshold-calibrated.js';

describe('calibrated family-wise threshold (maximum statistic, Nichols & Holmes 2002)', () => {
  it('takes the ceil((K + 1)(1 - alpha))-th smallest maximum, worked by hand', () => {
    // K = 19, alpha 0.05: rank ceil(20 x 0.95) = 19, the largest; a new exchangeable maximum exceeds it with probability 1/20
    const m19 = Array.from({ length: 19 }, (_, i) => 19 - i); // 19, 18, ..., 1
    expect(calibratedCriticalValue(m19, 0.05)).toEqual({ threshold: 19, rank: 19 });
    // K = 100: rank ceil(101 x 0.95) = ceil(95.95) = 96; P(exceed) = 5/101 = 0.0495 <= 0.05
    const m100 = Array.from({ length: 100 }, (_, i) => i / 10); // 0.0 .. 9.9
    expect(calibratedCriticalValue(m100, 0.05)).toEqual({ threshold: 9.5, rank: 96 });
    expect(minimumNullDesigns(0.05)).toBe(19);
    expect(minimumNullDesigns(0.01)).toBe(99);
  });

  it('marks voxels at or above the value and refuses too few maxima', () => {
    const m100 = Array.from({ length: 100 }, (_, i) => i / 10);
    const r = thresholdCalibrated(new Float32Array([9.4, 9.5, 10, 3]), new Uint8Array([1, 1, 1, 0]), { alpha: 0.05, nullMaxima: m100 });
    expect(r.rule).toBe('calibrated-fwe');
    expect(Array.from(r.survivors)).toEqual([0, 1, 1, 0]);
    expect(() => calibratedCriticalValue([1, 2, 3], 0.05)).toThrow(/at least 19/);
  });
});
