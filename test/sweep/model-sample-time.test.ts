import { describe, expect, it } from 'vitest';
import { modelSampleTimeSec } from '../../src/sweep/model-sample-time.js';

describe('modelSampleTimeSec', () => {
  it('gives the common slice time when every slice has it, else null (mid-volume sampling)', () => {
    expect(modelSampleTimeSec(Float64Array.of(0.5, 0.5, 0.5), 2)).toBe(0.5);
    expect(modelSampleTimeSec([0, 1, 0.5], 2)).toBeNull(); // interleaved acquisition: slices differ
    expect(modelSampleTimeSec(null, 2)).toBeNull();
    expect(modelSampleTimeSec([], 2)).toBeNull();
    expect(modelSampleTimeSec([2.5, 2.5], 2)).toBeNull(); // outside the volume's TR
  });
});
