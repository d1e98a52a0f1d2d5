import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { isBoldsweepError } from '../core/errors.js';
import { fail } from '../core/fail.js';
import type { Volume } from '../core/volume.js';
import { FD_CENSOR_THRESHOLD_MM } from '../model/framewise-displacement.js';
import type { Finding } from './finding-types.js';
import { lookMotionWithSignature } from './look-motion-with-signature.js';
import { motionEdgeSignature, type MotionEdgeSignature } from './motion-edge-signature.js';

/** What a look knows of the head's motion. */
export interface LookMotion {
  /** The motion table (one row per volume), or null when the look had none. */
  table: MotionRow[] | null;
  /** Where the table came from: given by the caller, estimated by the look, or none. */
  source: 'given' | 'estimated' | null;
  /** How the table was obtained, in words (for the page and findings.json). */
  method: string;
  /** Framewise displacement per volume (mm, Power et al. 2012, 50 mm sphere), or null without a table. */
  fdMm: Float64Array | null;
  /** The FD threshold of the finding, mm. */
  fdThresholdMm: number;
  /** Volumes (kept ones only) with FD above the threshold. */
  aboveThreshold: number[];
  /** The motion edge signature of the run as it is (before any correction), or null when the mask has no usable edge. */
  edgeSignature: MotionEdgeSignature | null;
}

/**
 * The motion part of a look: framewise displacement from a motion table (given, or estimated by the
 * caller), the volumes above the threshold as one finding, and the motion edge signature of the run
 * (which needs no table).
 * @param run - the run
 * @param mask - the look's brain mask
 * @param options - motion table and its source, threshold, first kept volume
 * @returns the motion summary and its finding (null when no kept volume is above the threshold)
 * @throws BoldsweepError MOTION_TABLE_LENGTH for a table of another length; MOTION_TABLE_INVALID for NaN
 * @example const { motion, finding } = lookMotion(run, mask.mask, { table, source: 'given', method: 'given', firstVolume: 3 })
 */
export function lookMotion(run: Volume, mask: ArrayLike<number>, options: { table: readonly MotionRow[] | null; source: 'given' | 'estimated' | null; method: string; fdThresholdMm?: number; firstVolume?: number }): { motion: LookMotion; finding: Finding | null } {
  const threshold = options.fdThresholdMm ?? FD_CENSOR_THRESHOLD_MM;
  if (!(threshold > 0)) fail('INVALID_ARGUMENT', `the framewise-displacement threshold must be a positive number of mm, got ${threshold}`);
  let edgeSignature: MotionEdgeSignature | null = null;
  try {
    edgeSignature = motionEdgeSignature(run, mask);
  } catch (e) {
    if (!isBoldsweepError(e, 'INVALID_ARGUMENT')) throw e; // a mask without an edge on some side
  }
  return lookMotionWithSignature(edgeSignature, run.dims[3], options);
}
