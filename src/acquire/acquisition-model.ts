import { invertAffine, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import type { Grid } from '../core/grid-frame.js';
import { assertSameGrid, voxelsPerVolume, type Volume } from '../core/volume.js';
import type { Sidecar } from '../io/run-types.js';
import { b0Readout } from './b0-readout.js';
import { checkSliceTimes } from './check-slice-times.js';
import { gridCentreMm } from './grid-centre-mm.js';
import { motionTablePoses } from './motion-table-poses.js';
import { phaseEncodeAxis } from './phase-encode-axis.js';
import type { MotionRow } from './rigid-motion-affine.js';

/**
 * The B0 part of an acquisition: a field map fixed to the head and how it displaces the signal.
 * A voxel whose tissue is off resonance by f Hz appears displaced by sign * f * totalReadoutTimeSec
 * voxels along the phase-encode axis (Jezzard & Balaban 1995).
 */
export interface B0Displacement {
  /** Field offset, Hz, on the run's grid with the head in its reference position (moves with the head). */
  fieldMapHz: Float32Array;
  /** Total readout time, seconds. */
  totalReadoutTimeSec: number;
  /** Phase-encode voxel axis: 0 = i, 1 = j, 2 = k. */
  phaseEncodeAxis: 0 | 1 | 2;
  /** +1 when the phase-encode direction runs along the axis, -1 when reversed ('j-'). */
  phaseEncodeSign: 1 | -1;
}

/**
 * How a run was acquired, as one forward model shared by the digital phantom and planting: the head
 * moves (a pose per volume), the B0 field displaces the signal along the phase-encode axis, and each
 * slice is read at its own time within the TR.
 *
 * Frames: the reference frame is the head in its reference position (volume 0 of a motion table);
 * pose t maps a point of the head, in reference-frame world mm, to where it is in scanner world mm
 * at volume t. Raw voxel (i, j, k) of volume t therefore sees the head at
 * `inverse(poses[t]) * grid.affine * [i, j, k, 1]` (before the B0 displacement).
 */
export interface AcquisitionModel {
  /** The run's grid (the raw and the reference frame share it). */
  grid: Grid;
  /** Number of volumes. */
  nt: number;
  /** Repetition time, seconds. */
  trSec: number;
  /** Pose of the head at each volume (reference world mm -> scanner world mm); null: the head never moved. */
  poses: Affine[] | null;
  /** World point the motion table's rotations turned about (recorded; the poses already include it). */
  rotationCentreMm: Vec3;
  /** The field map and readout, or null for no B0 displacement. */
  b0: B0Displacement | null;
  /** Acquisition time of each slice (s from the start of its volume), by slice index along `sliceAxis`; null: unknown (every slice at once). */
  sliceTimesSec: Float64Array | null;
  /** Voxel axis the slices are stacked along (0 = i, 1 = j, 2 = k). */
  sliceAxis: 0 | 1 | 2;
}

/** Options of {@link acquisitionModel}. Each defaults to what the run's sidecar says, or to nothing. */
export interface AcquisitionOptions {
  /** One row per volume (shifts mm, rotations degrees, relative to the reference position). __Default value:__ none (identity poses) */
  motionTable?: readonly MotionRow[] | null;
  /** Poses given directly as affines (rigid or affine), one per volume; instead of a motion table. __Default value:__ none */
  poses?: readonly Affine[] | null;
  /**
   * World point the motion table's rotations turn about. __Default value:__ the grid's centre
   * ({@link gridCentreMm}; the digital phantom's centre [0, 0, 0] is its grid's centre). A real motion
   * table states its own centre: pass it.
   */
  rotationCentreMm?: Vec3;
  /** Field map, Hz, on the run's grid in the head's reference position (a 3D Volume is checked against the run's grid). __Default value:__ none */
  fieldMapHz?: Volume | ArrayLike<number> | null;
  /** Total readout time, seconds. __Default value:__ the sidecar's TotalReadoutTime, else EffectiveEchoSpacing x (phase-encode lines - 1) */
  totalReadoutTimeSec?: number;
  /** BIDS phase-encode direction. __Default value:__ the sidecar's PhaseEncodingDirection */
  phaseEncodingDirection?: string;
  /**
   * Slice times, seconds from the start of each volume, by slice index: an array, or 'sidecar' for the
   * sidecar's SliceTiming (none when it has none), or null for none. __Default value:__ 'sidecar'
   */
  sliceTimesSec?: ArrayLike<number> | 'sidecar' | null;
  /** BIDS slice-encode direction (i, j, k; '-' means SliceTiming lists the slices from the last one). __Default value:__ the sidecar's SliceEncodingDirection, else 'k' */
  sliceEncodingDirection?: string;
}

/**
 * Build the acquisition model of a run from its sidecar and what is known about the head's motion.
 * Nothing is guessed: without a motion table or poses the head stays in its reference position,
 * without a field map there is no displacement, without slice times every slice is taken at once.
 * @param run - the run's image (its grid, volume count and TR) and sidecar
 * @param options - motion table or poses, field map, readout, slice times (each overrides the sidecar)
 * @returns the model
 * @throws BoldsweepError MOTION_TABLE_LENGTH, MOTION_TABLE_INVALID for a motion table or poses that do
 *   not fit the run; GRID_MISMATCH, FIELD_MAP_INVALID for a field map on another grid or with
 *   non-finite values; READOUT_TIME_MISSING, PHASE_ENCODE_MISSING when a field map is given without
 *   them; SLICE_TIMING_LENGTH, SLICE_TIMING_INVALID for slice times that do not fit the run
 * @example const model = acquisitionModel(run, { motionTable: rows, rotationCentreMm: [0, 0, 0] })
 */
export function acquisitionModel(run: { volume: Volume; sidecar: Sidecar | null }, options: AcquisitionOptions = {}): AcquisitionModel {
  const v = run.volume;
  const sidecar = run.sidecar ?? {};
  const grid: Grid = { dims: [v.dims[0], v.dims[1], v.dims[2]], affine: new Float64Array(v.affine) };
  const nt = v.dims[3];
  const rotationCentreMm = options.rotationCentreMm ?? gridCentreMm(grid);
  if (options.motionTable && options.poses) fail('INVALID_ARGUMENT', 'give either a motion table or poses, not both');
  let poses: Affine[] | null = null;
  if (options.motionTable) poses = motionTablePoses(options.motionTable, nt, rotationCentreMm);
  else if (options.poses) poses = checkPoses(options.poses, nt);

  const sliceDirection = options.sliceEncodingDirection ?? (typeof sidecar.SliceEncodingDirection === 'string' ? sidecar.SliceEncodingDirection : 'k');
  const slice = phaseEncodeAxis(sliceDirection, 'SliceEncodingDirection');
  const nSlices = grid.dims[slice.axis];
  const given = options.sliceTimesSec === undefined ? 'sidecar' : options.sliceTimesSec;
  let sliceTimesSec: Float64Array | null = null;
  if (given === 'sidecar') {
    if (sidecar.SliceTiming !== undefined) sliceTimesSec = checkSliceTimes(sidecar.SliceTiming, nSlices, v.trSec, 'the sidecar SliceTiming');
  } else if (given !== null) {
    sliceTimesSec = checkSliceTimes(given, nSlices, v.trSec, 'sliceTimesSec');
  }
  // BIDS: with a reversed slice-encode direction SliceTiming lists the slices from the last index [memory]
  if (sliceTimesSec && slice.sign === -1) sliceTimesSec.reverse();

  const b0 = options.fieldMapHz ? b0Part(options.fieldMapHz, v, sidecar, options) : null;
  return { grid, nt, trSec: v.trSec, poses, rotationCentreMm: [...rotationCentreMm] as Vec3, b0, sliceTimesSec, sliceAxis: slice.axis };
}

function checkPoses(poses: readonly Affine[], nt: number): Affine[] {
  if (poses.length !== nt) fail('MOTION_TABLE_LENGTH', `${poses.length} poses given, the run has ${nt} volumes`, { details: { rows: poses.length, volumes: nt } });
  return poses.map((p, t) => {
    if (!p || p.length !== 16 || !Array.from(p).every(Number.isFinite)) fail('MOTION_TABLE_INVALID', `pose ${t} is not 16 finite numbers`, { details: { row: t } });
    if (p[12] !== 0 || p[13] !== 0 || p[14] !== 0 || p[15] !== 1) fail('MOTION_TABLE_INVALID', `pose ${t} does not end in the row 0 0 0 1`, { details: { row: t } });
    try { invertAffine(p); } catch { fail('MOTION_TABLE_INVALID', `pose ${t} is singular (it flattens the head)`, { details: { row: t } }); }
    return new Float64Array(p);
  });
}

function b0Part(field: Volume | ArrayLike<number>, v: Volume, sidecar: Sidecar, options: AcquisitionOptions): B0Displacement {
  const n = voxelsPerVolume(v);
  let values: ArrayLike<number>;
  if (isVolume(field)) {
    assertSameGrid(field, v, ['field map', 'run']);
    if (field.dims[3] !== 1) fail('FIELD_MAP_INVALID', `the field map has ${field.dims[3]} volumes; give one 3D map in Hz`);
    values = field.data;
  } else {
    if (field.length !== n) fail('GRID_MISMATCH', `the field map has ${field.length} voxels, the run's grid ${n}`);
    values = field;
  }
  const fieldMapHz = Float32Array.from(values);
  const bad = fieldMapHz.findIndex((x) => !Number.isFinite(x));
  if (bad >= 0) fail('FIELD_MAP_INVALID', `field map voxel ${bad} is ${fieldMapHz[bad]}`, { details: { voxel: bad } });
  const readout = b0Readout(sidecar, v.dims, {
    ...(options.phaseEncodingDirection !== undefined ? { phaseEncodingDirection: options.phaseEncodingDirection } : {}),
    ...(options.totalReadoutTimeSec !== undefined ? { totalReadoutTimeSec: options.totalReadoutTimeSec } : {}),
  });
  return { fieldMapHz, ...readout };
}

function isVolume(x: unknown): x is Volume {
  return typeof x === 'object' && x !== null && 'dims' in x && 'data' in x && 'affine' in x;
}
