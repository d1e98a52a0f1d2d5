/**
 * Every error code boldsweep can throw, with the advice that goes with it. One place, so the
 * wording stays consistent and a code never changes meaning. Add new codes here, never inline.
 */
export const ERROR_ADVICE = {
  // files and formats
  FILE_NOT_FOUND: 'Check the path; relative paths are resolved from the current working directory.',
  NIFTI_BAD_MAGIC: 'The file is not NIfTI-1 or NIfTI-2 (wrong magic string). Convert it to NIfTI first.',
  NIFTI_TRUNCATED: 'The file ends before the image data does. Re-export or re-copy it from the source.',
  NIFTI_SIZE_MISMATCH: 'The header dimensions do not match the bytes in the file. The file is damaged or was written by a faulty converter.',
  NIFTI_UNSUPPORTED_DATATYPE: 'Convert the image to one of uint8, int8, int16, uint16, int32, uint32, float32 or float64 (float32 is the usual choice).',
  NIFTI_ABSURD_SIZE: 'The header claims an image far larger than any fMRI run; the header is damaged.',
  NIFTI_BAD_DIMS: 'The header dimensions are zero, negative or inconsistent.',
  NIFTI_TOO_MANY_DIMS: 'Only 3D images and 4D runs (x, y, z, time) are supported; split the extra dimensions into separate files.',
  NIFTI_BAD_TRANSFORM: 'The voxel-to-world mapping in the header is degenerate (zero or non-finite); fix the sform/qform fields or the voxel sizes.',
  READ_FAILED: 'Check the path is a readable regular file (permissions, not a folder).',
  GZIP_CORRUPT: 'The .gz stream could not be decompressed. Re-copy the file or decompress it with gunzip to see the error.',
  NON_FINITE_VOXELS: 'The image holds NaN or infinite values. Mask or replace them before analysis (boldsweep does not guess a value for them).',
  NOT_4D: 'This needs a 4D run (x, y, z, time). A 3D image has one volume only.',
  TR_MISSING: 'No usable repetition time: set RepetitionTime (seconds) in the BIDS sidecar JSON or pixdim[4] in the header.',
  SIDECAR_INVALID: 'Fix the listed fields of the BIDS sidecar JSON (units: seconds for times, degrees for angles).',
  SLICE_TIMING_LENGTH: 'SliceTiming must have one entry per slice (the third image dimension).',
  EVENTS_INVALID: 'Fix the listed rows of the events TSV (columns onset, duration in seconds; trial_type; optional modulation).',
  EVENTS_BEYOND_RUN: 'An event starts after the last volume was acquired. Check the events file belongs to this run and that onsets are in seconds.',
  WRITE_FAILED: 'Check the output folder exists and is writable; nothing was written.',
  // arguments
  INVALID_ARGUMENT: 'Check the value passed; the message names the argument and the accepted range.',
  GRID_MISMATCH: 'Both images must share dimensions and voxel-to-world mapping. Resample one onto the other first.',
  RANK_DEFICIENT: 'Remove or merge the named design columns; they are linear combinations of others.',
  CONTRAST_LENGTH: 'A contrast needs one weight per design column.',
  PLANTING_DOES_NOT_FIT: 'Use fewer or smaller planted activations, or a larger mask.',
  SPEC_INVALID: 'Fix the listed fields of the sweep spec.',
  NULL_DESIGNS_INVALID: 'Set threshold.nullDesigns to at least 19 for alpha 0.05 (100 or more gives a steadier threshold), or leave it out: fwe-calibrated then fits 100 and the other rules none.',
  UNKNOWN_STEP: 'Use one of the step names listed in the message.',
  UNKNOWN_PARAMETER: 'Use one of the parameter names listed in the message.',
  CONSTANT_DATA: 'The data do not vary; the requested measure is undefined for them.',
  TOO_FEW_VOLUMES: 'The run is shorter than the measure needs; use a longer run.',
  RECORD_INVALID: 'The decision record is damaged or from an incompatible version.',
  // parallel work
  WORKER_SCRIPT_MISSING: 'Worker threads run compiled JavaScript: build the package first (npm run build) so the worker file exists under dist/.',
  WORKER_FAILED: 'A worker thread stopped unexpectedly (often out of memory). Retry with fewer workers, or workers: 1 to run in the main thread.',
} as const;

/** Stable error codes; see {@link ERROR_ADVICE} for what each means. */
export type ErrorCode = keyof typeof ERROR_ADVICE;

/**
 * Compose the user-facing text: the specific problem, then the standing advice for its code.
 * @param code - error code
 * @param problem - what exactly was wrong, with the numbers
 * @returns one message
 * @example messageFor('TR_MISSING', 'pixdim[4] is 0 and no sidecar was found')
 */
export function messageFor(code: ErrorCode, problem: string): string {
  return `${problem}. ${ERROR_ADVICE[code]}`;
}
