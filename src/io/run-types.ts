import type { Volume } from '../core/volume.js';

/** Which NIfTI method gave the voxel->world mapping (NIfTI-1 standard, nifti1.h "methods 1-3"). */
export type TransformSource = 'sform' | 'qform' | 'pixdim';

/** The BIDS sidecar fields boldsweep uses. Times are seconds, angles degrees (BIDS units). */
export interface Sidecar {
  RepetitionTime?: number;
  /** Acquisition time of each slice relative to the start of the volume, seconds, one per slice. */
  SliceTiming?: number[];
  /** i, j, k with optional minus: the phase-encoding axis and polarity. */
  PhaseEncodingDirection?: 'i' | 'i-' | 'j' | 'j-' | 'k' | 'k-';
  TotalReadoutTime?: number;
  EffectiveEchoSpacing?: number;
  EchoTime?: number;
  FlipAngle?: number;
  MultibandAccelerationFactor?: number;
  /** Any other fields, kept as read. */
  [field: string]: unknown;
}

/** One row of a BIDS events TSV. */
export interface BoldEvent {
  onsetSec: number;
  durationSec: number;
  trialType: string;
  /** Parametric modulation; 1 when the column is absent. */
  modulation: number;
}

/** Facts about how a NIfTI file was read. */
export interface NiftiReadInfo {
  path: string;
  niftiVersion: 1 | 2;
  datatype: string;
  littleEndian: boolean;
  transformSource: TransformSource;
  sformCode: number;
  qformCode: number;
  sclSlope: number;
  sclInter: number;
  /** Count of NaN/Inf voxels found (they are reported, never silently kept). */
  nonFiniteCount: number;
  /** Header description field. */
  description: string;
  /** Header intent_name field (set by readNifti). */
  intentName?: string;
  /** Whether the file was gzip-compressed (set by readNifti). */
  compressed?: boolean;
  /** Length unit named in xyzt_units; lengths were converted to mm ('unknown' is read as mm). */
  spaceUnit?: 'mm' | 'um' | 'm' | 'unknown';
  /** Time unit named in xyzt_units; pixdim[4] was converted to s ('unknown' is read as s; 'other' = Hz, ppm or rad/s, not a time). */
  timeUnit?: 's' | 'ms' | 'us' | 'unknown' | 'other';
  /** pixdim[4] in seconds when it is a positive time, else 0 (set by readNifti). */
  headerTrSec?: number;
}

/** A run: the 4D image with its sidecar and events, as opened from disk. */
export interface Run {
  volume: Volume;
  sidecar: Sidecar | null;
  events: BoldEvent[] | null;
  info: NiftiReadInfo;
  /** Where the TR came from. */
  trSource: 'sidecar' | 'header';
  /** Paths of the files actually read. */
  files: { image: string; sidecar: string | null; events: string | null };
}
