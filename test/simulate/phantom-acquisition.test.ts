import { describe, expect, it } from 'vitest';
import { interleavedSliceTiming } from '../../src/acquire/interleaved-slice-timing.js';
import { rigidMotionAffine } from '../../src/acquire/rigid-motion-affine.js';
import { phantomAcquisitionModel } from '../../src/simulate/phantom-acquisition-model.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';
import { quietSpec } from './phantom-helpers.js';

describe('phantomAcquisitionModel', () => {
  it('is the motion, field map, readout and slice times the phantom was simulated with', () => {
    const jerk = { volume: 3, shiftMm: [1, -2, 0.5] as [number, number, number], rotationDeg: [2, 0, -1] as [number, number, number] };
    const run = simulatePhantomRun(quietSpec({ nVolumes: 5, motion: { wanderStepMm: 0, wanderStepDeg: 0, jerk }, b0: { susceptibilityDifferencePpm: 9.4, dephasing: false, distortion: true } }));
    const m = phantomAcquisitionModel(run);
    expect(m.nt).toBe(5);
    expect(Array.from(m.poses![3])).toEqual(Array.from(rigidMotionAffine(run.truth.motionTable[3], [0, 0, 0])));
    expect(m.rotationCentreMm).toEqual([0, 0, 0]);
    expect(m.b0!.totalReadoutTimeSec).toBe(run.truth.totalReadoutTimeSec);
    expect([m.b0!.phaseEncodeAxis, m.b0!.phaseEncodeSign]).toEqual([1, 1]);
    expect(Array.from(m.b0!.fieldMapHz)).toEqual(Array.from(run.truth.fieldMapHz.data));
    expect(Array.from(m.sliceTimesSec!)).toEqual(interleavedSliceTiming(21, 2));
    // no motion and no distortion in the spec: none in the model
    const still = phantomAcquisitionModel(simulatePhantomRun(quietSpec({ nVolumes: 3 })));
    expect([still.poses, still.b0]).toEqual([null, null]);
  });
});
