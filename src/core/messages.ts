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
  SLICE_TIMING_LENGTH: 'SliceTiming must have one entry per slice (along SliceEncodingDirection: the third image dimension unless the sidecar says otherwise).',
  EVENTS_INVALID: 'Fix the listed rows of the events TSV (columns onset, duration in seconds; trial_type; optional modulation).',
  EVENTS_BEYOND_RUN: 'An event starts after the last volume was acquired. Check the events file belongs to this run and that onsets are in seconds.',
  WRITE_FAILED: 'Check the output folder exists and is writable; nothing was written.',
  OUTPUT_NOT_OURS: 'Choose a new or empty output folder, or one boldsweep wrote before. --force writes boldsweep\'s files beside the others (it never deletes or replaces them).',
  OUTPUT_FILE_NOT_OURS: 'Move or rename that file, or choose another output folder; boldsweep replaces only files it wrote itself.',
  OUTPUT_IS_INPUT_FOLDER: 'Write the outputs to a folder of their own (e.g. --out derivatives/boldsweep/<name>), never into the folder of the data they come from.',
  OUTPUT_IS_CURRENT_FOLDER: 'Name a subfolder for the outputs (e.g. --out look-sub-01); boldsweep does not write into the current folder as a whole.',
  LOOK_FROM_OTHER_RUN: 'Give the look folder made from this very run (boldsweep look <run> --out <dir>), or look at this run again.',
  EVENTS_MISSING: 'Put the events TSV beside the run under the expected name, pass it with --events <file>, or set the spec\'s events to a random block design.',
  SPEC_FILE_EXISTS: 'Choose another file name, or pass --force to replace a spec that boldsweep spec wrote earlier (other files are never replaced).',
  // arguments
  INVALID_ARGUMENT: 'Check the value passed; the message names the argument and the accepted range.',
  GRID_MISMATCH: 'Both images must share dimensions and voxel-to-world mapping. Resample one onto the other first.',
  RANK_DEFICIENT: 'Remove or merge the named design columns; they are linear combinations of others.',
  CONTRAST_LENGTH: 'A contrast needs one weight per design column.',
  PLANTING_DOES_NOT_FIT: 'Use fewer or smaller planted activations, or a larger mask.',
  SPEC_INVALID: 'Fix the listed fields of the sweep spec.',
  NULL_DESIGNS_INVALID: 'Set threshold.nullDesigns to at least 19 for alpha 0.05 (100 or more gives a steadier threshold), or leave it out: fwe-calibrated then fits 100 and the other rules none.',
  UNKNOWN_STEP: 'Use one of the step names listed in the message.',
  STEP_MODULE_MISSING: 'Worker threads load their own steps: register the step with registerStep(name, definition, { module: import.meta.url }) in a module that registers it when imported, or run the sweep with inThisThread: true.',
  UNKNOWN_PARAMETER: 'Use one of the parameter names listed in the message.',
  CONSTANT_DATA: 'The data do not vary; the requested measure is undefined for them.',
  TOO_FEW_VOLUMES: 'The run is shorter than the measure needs; use a longer run.',
  UNKNOWN_KERNEL: 'Use one of the interpolation kernels listed in the message.',
  TARGET_GRID_TOO_LARGE: 'The target grid would not fit in memory; check the voxel size is in mm (not m or um) and the affine is the voxel-to-world mapping you meant.',
  SINGULAR_TRANSFORM: 'The named affine flattens space (determinant 0 or not finite) and cannot map positions back; check its 3x3 part (a zero voxel size or two equal columns).',
  RECORD_INVALID: 'The decision record is damaged or from an incompatible version.',
  // acquisition model (head motion, B0 field, slice times)
  MOTION_TABLE_LENGTH: 'A motion table needs one row per volume of the run it describes (the raw run, before any volumes are dropped); give the table of this run.',
  MOTION_TABLE_INVALID: 'Fix the named row of the motion table: shifts in mm and rotations in degrees, all finite, rows in volume order from 0 (a pose must be an invertible affine).',
  MOTION_TABLE_MISSING: 'Motion regressors and censoring by framewise displacement need the run\'s motion table: give it (--motion-table <tsv> on the command line, the motionTable option of runSweep), or set model.motionRegressors to 0 and model.censorFdMm to null.',
  FIELD_MAP_INVALID: 'Give one 3D field map in Hz with finite values on the run\'s grid (set voxels outside the head to 0, not NaN).',
  READOUT_TIME_MISSING: 'A field map displaces the signal by (Hz x total readout time): set TotalReadoutTime (s) in the BIDS sidecar, or EffectiveEchoSpacing (s) from which it is computed, or pass totalReadoutTimeSec.',
  PHASE_ENCODE_MISSING: 'A field map displaces the signal along the phase-encode axis: set PhaseEncodingDirection (i, j or k, with - for the reversed direction) in the BIDS sidecar, or pass phaseEncodingDirection.',
  PHASE_ENCODE_INVALID: 'PhaseEncodingDirection names a voxel axis of the image (BIDS: i, j or k, with - for the reversed direction), not a world axis (x, y, z) or an anatomical label (AP, PA): fix it in the BIDS sidecar of the named image.',
  FIELD_MAP_NO_AFFINE: 'A field map on another grid than the run is placed on the run through both voxel-to-world mappings: give the field map (and the run) a NIfTI header with an sform or qform (code > 0), or resample the field map onto the run\'s grid first.',
  UNWARP_INPUT_MISSING: 'Unwarping needs the B0 field: give a field map in Hz on the run\'s grid (boldsweep sweep --field-map <nii>; library: runSweep(run, spec, { fieldMapHz })) for method field-map, or a pair of images with opposite phase-encode directions (runSweep option phaseEncodePair) for method reversed-pe.',
  PHASE_ENCODE_PAIR_INVALID: 'A reversed phase-encode pair is two images on the run\'s grid whose sidecars give PhaseEncodingDirection along the same voxel axis in opposite senses (e.g. j and j-) and the same TotalReadoutTime (or EffectiveEchoSpacing).',
  SLICE_TIMING_INVALID: 'Slice times are seconds from the start of each volume, each at least 0 and below RepetitionTime: fix SliceTiming in the BIDS sidecar (check it is in seconds, not milliseconds), or pass slice times made for your acquisition order.',
  SLICE_TIMING_MULTIBAND: 'A multiband factor is the number of slices read at once and must divide the slice count: check MultibandAccelerationFactor in the protocol, or give SliceTiming in the BIDS sidecar instead.',
  SLICE_TIMING_MISSING: 'Slice-timing correction needs each slice\'s acquisition time: set SliceTiming (seconds, one per slice) in the BIDS sidecar, or give the step an order (ascending, descending, interleaved-odd-first, interleaved-even-first) and a multiband factor.',
  SLICE_AXIS_UNSUPPORTED: 'Slice-timing correction works on slices stacked along the third image axis (SliceEncodingDirection k or k- in the BIDS sidecar): reorient the run so its slices lie along the third axis, or fix SliceEncodingDirection if it is wrong.',
  SLICE_TIME_REFERENCE_INVALID: 'The reference is a slice index from 0 to the slice count - 1, or a time in seconds from 0 to below RepetitionTime; the default (middle of the TR) is usually right.',
  // registration (motion estimation and alignment)
  REGISTRATION_NOT_CONVERGED: 'The optimiser stopped without settling (iteration cap reached while the parameters still changed, or the cost rose). Check the two images show the same head (same run, not a blank or corrupted volume), give a brain mask, start nearer (initial parameters), or use more multi-resolution levels (e.g. [8, 4, 2, 1]) for a large displacement.',
  REGISTRATION_NO_OVERLAP: 'Too few fixed-image samples land inside the moving image: check both affines put the images in the same world space (same units, sform/qform), or start from a closer initial transform.',
  MOTION_REFERENCE_INVALID: "Give the reference as 'first', 'middle', 'mean', 'least-moving', or a 0-based volume index below the number of volumes.",
  // study (group-level sweeps)
  TOO_FEW_SUBJECTS: 'A group-level test needs at least 3 subjects, and 5 for the random-field rules (fwe-rft, cluster); set study.subjects accordingly (12 or more gives a steadier group map).',
  STUDY_GRID_MISMATCH: 'Every run of a study must be on one grid (same dimensions, voxel size and voxel-to-world mapping): resample the runs onto one grid first, or give only the runs that share the first run\'s grid.',
  STUDY_RUNS_MISSING: 'Give the study\'s runs as a list of NIfTI files or as a BIDS folder with a task name (every sub-*/func/*_task-<name>_bold.nii.gz); check the folder and the task name.',
  MISREGISTRATION_TOO_LARGE: 'A misregistration SD that large moves activations outside the brain: state the residual misalignment after spatial normalisation (typically a few mm; 0, 3 and 6 mm span the usual range).',
  STUDY_RULE_UNSUPPORTED: 'A study\'s group map is thresholded by fwe-rft, bonferroni, fdr, cluster or uncorrected; fwe-calibrated and null designs measure single-run noise and do not apply to a group map. Pick one of those rules and leave out threshold.nullDesigns.',
  // parallel work
  WORKER_SCRIPT_MISSING: 'Worker threads run compiled JavaScript: build the package first (npm run build) so the worker file exists under dist/.',
  KERNEL_MISSING: 'The WebAssembly kernels are compiled at build time: run npm run build (it writes dist/kernels/ from kernels/).',
  WORKER_FAILED: 'A worker thread stopped unexpectedly (often out of memory). Retry with fewer workers, or workers: 1 to run in the main thread.',
  // alignment between images (run -> structural -> template)
  TRANSFORM_FILE_INVALID: 'The file is not a boldsweep transform (JSON with boldsweepTransform 1, from, to and a 4x4 matrix whose last row is 0 0 0 1). Write it with writeTransformFile, or fix the field named above.',
  TRANSFORM_CHAIN_BROKEN: 'Each transform of a chain must start in the space the previous one ends in (same grid dims and voxel-to-world mapping). Reorder the chain, or invert the transform that points the wrong way (invertTransform).',
  ALIGN_INPUT_MISSING: 'The align step needs a structural image and a template: give their paths as the step\'s structural and template parameters (the demo run finds the demo\'s own files by itself).',
  STRUCTURAL_AFFINE_UNUSABLE: 'The structural image\'s voxel-to-world mapping is missing or degenerate (no sform or qform, zero voxel sizes): alignment needs real positions. Fix the header (sform/qform) with the tool that converted the image, then run again.',
  // cluster (Slurm job arrays of shards)
  TOO_MANY_SHARDS: 'Use at most as many shards as the sweep has planting groups (plant conditions x repeats): a shard runs whole groups, so more shards would leave some with nothing to do.',
  SHARD_SWEEP_MISMATCH: 'Gather only the shard folders of one sweep (same run, spec, seed and masks). Remove the folder that belongs to another sweep from the list, or run that shard again with this spec.',
  SBATCH_MISSING: 'Run this where the Slurm client is installed (a cluster login node; Debian package slurm-client), or leave out --submit and submit the written scripts there with submit.sh.',
  SBATCH_FAILED: 'Read the scheduler\'s message above (partition, memory or time limits, account); adjust --partition, --time or --workers and run again, or edit the written scripts and run submit.sh.',
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
