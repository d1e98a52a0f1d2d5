import { describe, expect, it } from 'vitest';
import { acquisitionModel } from '../../src/acquire/acquisition-model.js';
import { motionTablePoses } from '../../src/acquire/motion-table-poses.js';
import { phaseEncodeAxis } from '../../src/acquire/phase-encode-axis.js';
import type { MotionRow } from '../../src/acquire/rigid-motion-affine.js';
import { sequentialSliceTiming } from '../../src/acquire/sequential-slice-timing.js';
import { applyAffine, diagonalAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume, type Volume } from '../../src/core/volume.js';
import type { Sidecar } from '../../src/io/run-types.js';
import { plantActivations } from '../../src/plant/plant-activations.js';

const [NX, NY, NZ, NT] = [10, 12, 8, 5];
const N = NX * NY * NZ;

function run(): Volume {
  return makeVolume({ dims: [NX, NY, NZ, NT], spacingMm: [3, 3, 4], trSec: 2, affine: diagonalAffine([3, 3, 4], [-13.5, -16.5, -14]), data: new Float32Array(N * NT).fill(100) });
}
const rows = (nt: number): MotionRow[] => Array.from({ length: nt }, (_, volume) => ({ volume, shiftXMm: 0.1 * volume, shiftYMm: 0, shiftZMm: 0, rotXDeg: 0, rotYDeg: 0, rotZDeg: 0.5 * volume }));

/** The error code and message of a call, or 'none'. */
function errorOf(f: () => unknown): { code: string; message: string } {
  try { f(); } catch (e) { return isBoldsweepError(e) ? { code: e.code, message: e.message } : { code: `other: ${String(e)}`, message: '' }; }
  return { code: 'none', message: '' };
}

describe('acquisitionModel', () => {
  it('reads the sidecar: slice times, phase encode, readout time (from EffectiveEchoSpacing when TotalReadoutTime is absent)', () => {
    const sidecar: Sidecar = { RepetitionTime: 2, SliceTiming: sequentialSliceTiming(NZ, 2, 'ascending'), PhaseEncodingDirection: 'j-', EffectiveEchoSpacing: 0.0005 };
    const m = acquisitionModel({ volume: run(), sidecar }, { fieldMapHz: new Float32Array(N) });
    expect(Array.from(m.sliceTimesSec!)).toEqual([0, 0.25, 0.5, 0.75, 1, 1.25, 1.5, 1.75]);
    expect(m.sliceAxis).toBe(2);
    expect(m.poses).toBeNull();
    // BIDS: TotalReadoutTime = EffectiveEchoSpacing x (phase-encode lines - 1) = 0.0005 x 11
    expect(m.b0!.totalReadoutTimeSec).toBeCloseTo(0.0055, 15);
    expect([m.b0!.phaseEncodeAxis, m.b0!.phaseEncodeSign]).toEqual([1, -1]);
    // without options: no field map, no motion; the rotation centre defaults to the grid's middle
    const plain = acquisitionModel({ volume: run(), sidecar: null });
    expect([plain.b0, plain.sliceTimesSec, plain.poses]).toEqual([null, null, null]);
    expect(plain.rotationCentreMm).toEqual(applyAffine(run().affine, [4.5, 5.5, 3.5]));
  });

  it('takes a reversed slice-encode direction to list SliceTiming from the last slice', () => {
    const times = sequentialSliceTiming(NZ, 2, 'ascending');
    const m = acquisitionModel({ volume: run(), sidecar: { RepetitionTime: 2, SliceTiming: times, SliceEncodingDirection: 'k-' } });
    expect(Array.from(m.sliceTimesSec!)).toEqual(sequentialSliceTiming(NZ, 2, 'descending'));
    const alongJ = acquisitionModel({ volume: run(), sidecar: { RepetitionTime: 2, SliceTiming: sequentialSliceTiming(NY, 2, 'ascending'), SliceEncodingDirection: 'j' } });
    expect(alongJ.sliceAxis).toBe(1);
  });

  it('builds one pose per motion-table row about the stated centre', () => {
    const m = acquisitionModel({ volume: run(), sidecar: null }, { motionTable: rows(NT), rotationCentreMm: [1, 2, 3] });
    expect(m.poses).toHaveLength(NT);
    // the centre is fixed by a pure rotation (volume 0 has none; later volumes add the x shift only)
    const c = applyAffine(m.poses![3], [1, 2, 3]);
    [1 + 0.30000000000000004, 2, 3].forEach((x, a) => expect(c[a]).toBeCloseTo(x, 12));
  });

  it('refuses what does not fit the run with typed errors that say what to do', () => {
    const v = run();
    const withField = (sidecar: Sidecar, over = {}) => () => acquisitionModel({ volume: v, sidecar }, { fieldMapHz: new Float32Array(N), ...over });
    const cases: Array<[string, () => unknown, string, RegExp]> = [
      ['table too short', () => acquisitionModel({ volume: v, sidecar: null }, { motionTable: rows(NT - 1) }), 'MOTION_TABLE_LENGTH', /4 rows, the run has 5 volumes/],
      ['NaN in a pose', () => { const t = rows(NT); t[2] = { ...t[2], rotYDeg: Number.NaN }; return motionTablePoses(t, NT, [0, 0, 0]); }, 'MOTION_TABLE_INVALID', /row 2 .*rotYDeg = NaN/],
      ['rows out of order', () => { const t = rows(NT); t[1] = { ...t[1], volume: 3 }; return motionTablePoses(t, NT, [0, 0, 0]); }, 'MOTION_TABLE_INVALID', /volume order/],
      ['field map on another grid', () => acquisitionModel({ volume: v, sidecar: { PhaseEncodingDirection: 'j', TotalReadoutTime: 0.03 } }, { fieldMapHz: makeVolume({ dims: [NX, NY, NZ, 1], spacingMm: [2, 2, 2], trSec: 0, affine: diagonalAffine([2, 2, 2]), data: new Float32Array(N) }) }), 'GRID_MISMATCH', /field map grid/],
      ['field map of another size', withField({ PhaseEncodingDirection: 'j', TotalReadoutTime: 0.03 }, { fieldMapHz: new Float32Array(N - 1) }), 'GRID_MISMATCH', /field map has/],
      ['NaN in the field map', withField({ PhaseEncodingDirection: 'j', TotalReadoutTime: 0.03 }, { fieldMapHz: new Float32Array(N).fill(Number.NaN) }), 'FIELD_MAP_INVALID', /voxel 0 is NaN/],
      ['no readout time', withField({ PhaseEncodingDirection: 'j' }), 'READOUT_TIME_MISSING', /TotalReadoutTime .*EffectiveEchoSpacing/],
      ['no phase-encode direction', withField({ TotalReadoutTime: 0.03 }), 'PHASE_ENCODE_MISSING', /PhaseEncodingDirection/],
      ['slice times for another slice count', () => acquisitionModel({ volume: v, sidecar: { SliceTiming: [0, 0.5, 1] } }), 'SLICE_TIMING_LENGTH', /3 entries, the run has 8 slices/],
      ['a slice time beyond the TR', () => acquisitionModel({ volume: v, sidecar: null }, { sliceTimesSec: [0, 0.25, 0.5, 0.75, 1, 1.25, 1.5, 2] }), 'SLICE_TIMING_INVALID', /sliceTimesSec\[7\] is 2 s, not inside the repetition time 2 s/],
      ['slice times in milliseconds', () => acquisitionModel({ volume: v, sidecar: { SliceTiming: [0, 250, 500, 750, 1000, 1250, 1500, 1750] } }), 'SLICE_TIMING_INVALID', /milliseconds/],
      ['a negative slice time', () => acquisitionModel({ volume: v, sidecar: null }, { sliceTimesSec: [-0.1, 0, 0, 0, 0, 0, 0, 0] }), 'SLICE_TIMING_INVALID', /0 or more/],
    ];
    for (const [what, f, code, text] of cases) {
      const e = errorOf(f);
      expect(e.code, what).toBe(code);
      expect(e.message, what).toMatch(text);
    }
  });

  it('is checked against the run when planting', () => {
    const v = run();
    const mask = new Uint8Array(N).fill(1);
    const timed = acquisitionModel({ volume: v, sidecar: { SliceTiming: sequentialSliceTiming(NZ, 2, 'ascending') } });
    const base = { count: 1, fwhmMm: 4, amplitudePct: 1, timeCourse: [1, 2, 3, 2, 1], placementMask: mask, seed: 1, marginMm: 3 };
    expect(errorOf(() => plantActivations(v, { ...base, acquisition: timed })).message).toMatch(/pass sliceTimeCourses/);
    const other = makeVolume({ dims: [NX, NY, NZ, NT], spacingMm: [3, 3, 3], trSec: 2, affine: diagonalAffine([3, 3, 3]), data: new Float32Array(N * NT) });
    expect(errorOf(() => plantActivations(v, { ...base, acquisition: acquisitionModel({ volume: other, sidecar: null }) })).code).toBe('GRID_MISMATCH');
    expect(errorOf(() => plantActivations(v, { ...base, acquisition: timed, sliceTimeCourses: [[1, 2, 3, 2, 1]] })).message).toMatch(/one course per slice \(8\)/);
  });
});

describe('slice orders and directions', () => {
  it('spreads sequential slices evenly over the TR and reads BIDS directions', () => {
    // definition: slice s of n ascending is read at s TR / n
    expect(sequentialSliceTiming(4, 2, 'ascending')).toEqual([0, 0.5, 1, 1.5]);
    expect(sequentialSliceTiming(4, 2, 'descending')).toEqual([1.5, 1, 0.5, 0]);
    expect(phaseEncodeAxis('i')).toEqual({ axis: 0, sign: 1 });
    expect(phaseEncodeAxis('k-')).toEqual({ axis: 2, sign: -1 });
    expect(errorOf(() => phaseEncodeAxis('y')).code).toBe('INVALID_ARGUMENT');
  });
});
