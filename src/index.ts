/**
 * boldsweep public API: what the README and the notebooks use, in the order of the main job.
 * Everything else (kernels, engine parts) is under `boldsweep/internals` (src/internals.ts).
 *
 *   open run -> look -> plant -> recipe -> model -> score -> sweep -> decide -> report
 */

// core types and errors
export { BoldsweepError, isBoldsweepError } from './core/errors.js';
export { ERROR_ADVICE, type ErrorCode } from './core/messages.js';
export { type Affine, type Vec3, identityAffine, composeAffine, invertAffine, applyAffine, diagonalAffine } from './core/affine.js';
export { type Volume, type Dims4, makeVolume, volumeLike, volumeAt, voxelsPerVolume, sameGrid, runBytes } from './core/volume.js';
export { type Rng, createRng, childSeed } from './core/random.js';
export { summariseVolume } from './core/summary.js';
export { type BoundaryMode, BOUNDARY_MODES } from './core/boundary-mode.js';
export type { Grid, Frame } from './core/grid-frame.js';

// open a run
export type { Run, Sidecar, BoldEvent, NiftiReadInfo, TransformSource } from './io/run-types.js';
export { openRun, readNifti, writeNifti, readSidecar, readEvents } from './io/index.js';

// look
export {
  lookAtRun, lookConsoleLines, findingsTable, meanImage, voxelRasterRows,
  motionEdgeSignature, type MotionEdgeSignature, type LookMotion, withLookMotion, estimateLookMotion,
} from './look/index.js';

// acquisition model (head pose per volume, B0 displacement, slice times)
export {
  acquisitionModel, type AcquisitionModel, type AcquisitionOptions, type B0Displacement, type MotionRow, rigidMotionAffine,
  motionTablePoses, interleavedSliceTiming, sequentialSliceTiming,
} from './acquire/index.js';
export { sliceOrderTiming, SLICE_ORDERS, type SliceOrder } from './acquire/index.js';

// distortion: field maps, reversed phase encoding, unwarping, lost signal
export {
  b0Readout, shiftMapVoxels, fieldMapFromPhaseDifference, fieldMapOnGrid, planUnwarp, applyUnwarp, unrecoverableSignal,
  reversedPhaseEncodeShift, readFieldMapForRun, readPhaseEncodePair, fieldFromPhaseEncodePair, imageAgreement, type PhaseEncodePair,
  unwarpPhaseEncodePair,
} from './acquire/index.js';
export { findB0Siblings } from './io/index.js';
export { b0Figures } from './report/index.js';

// plant
export {
  plantActivations, plantTimeCourse, plantTimeCourses, truthOnGrid, type PlantOptions, type PlantTruth, type PlantedBlob, type BlobShapeSpec,
} from './plant/index.js';

// recipe steps
export {
  type StepNote, type StepContext, type StepResult, type StepFunction, type StepDefinition, type StepKind, type ParameterLabel, type RegisterStepOptions,
  registerStep, getStep, listSteps, parseStepParams, applyStep, describeStep,
} from './steps/index.js';
export { sliceTimeStep, type SliceTimeParams } from './steps/index.js';
export { sliceTimingGuidance, type SliceTimingGuidance, aliasedFrequencyHz } from './model/index.js';
export { smoothRun, smoothVolume3d } from './filter/index.js';
export {
  type InterpolationKernel, INTERPOLATION_KERNELS, type ResampleOptions, type ResampleRunOptions, type DisplacementField,
  type TargetGridOptions, resampleVolume, resampleRun, targetGrid, cubicBSplinePrefilter,
  repeatedResampling, type RepeatedResamplingOptions, type RepeatedResamplingResult, type RepeatedResamplingRow, imageFwhmMm, highFrequencyEnergy,
} from './resample/index.js';
export {
  type ImageOnGrid, type RegistrationModel, type RegistrationCost, type RegisterOptions, type RegistrationResult,
  registerImagePair, estimateRunMotion, type MotionReference, type RunMotionOptions, type RunMotion, motionParametersAffine, affineMotionParameters,
} from './register/index.js';

// model
export { hrfValues, buildDesign, fitGlm, fitGlmAr1, contrastMaps, estimateSmoothness, oneSampleT } from './model/index.js';
export {
  framewiseDisplacement, FD_SPHERE_RADIUS_MM, FD_CENSOR_THRESHOLD_MM, fdCensorVolumes, type FdCensorReach, motionExpansion, motionRegressors, type MotionRegressorCount,
} from './model/index.js';
export { thresholdUncorrected, thresholdBonferroni, thresholdFdr, thresholdRft, thresholdClusterExtent } from './model/index.js';

// score
export { scoreDetection, type ScoreRow } from './score/index.js';

// sweep
export {
  type SweepSpec, type SweepSpecInput, parseSweepSpec, readSweepSpec, defaultSmoothingSpec, settingText,
  runSweep, type SweepResult, gatherResults, shareVolume, buildMask, maskFromFile, lineProgress, scorecardFrame,
  type Scorecard, applyLookToSpec, untreatedFindings,
  groupLevelTest, studyRunPaths, type StudySpec, type StudyFacts,
} from './sweep/index.js';

// decide
export { summariseScorecard, recommendSetting, parameterTradeoff, type Recommendation, type SettingSummary, type TradeoffGroup, studyOptima, type StudyOptima } from './decide/index.js';

// report
export {
  RESEARCH_CAUTION, renderSvg, threePlaneSvg, sliceGridSvg, voxelRasterSvg, lookPageHtml, tableHtml, lookTracesSpec, voxelTimeCourseSpec, chosenVoxels, maskCentre,
  writeLookFolder, detectionChart, falseAlarmChart, rocChart, smoothnessChart, tsnrChart, methodsText, methodsMarkdown,
  thresholdText, runFacts, writeReport, writeSweepFolder, readDecisionRecord, recordDir, rerunRecord, repeatedResamplingChart,
  readLookFolder, starterSpecYaml, motionTableSpec, fdTraceSpec, edgeSignatureSpec, studyWidthChart,
} from './report/index.js';

// the digital phantom
export { simulatePhantomRun, writePhantomRun, demoPhantomSpec, defaultPhantomSpec, phantomAcquisitionModel, TISSUE_LABEL } from './simulate/index.js';
export { simulatePhantomStructural, simulatePhantomTemplate, phantomAnatomyGrids, writePhantomAnatomy } from './simulate/index.js';

// alignment between images: stored transforms, composed into one resampling
export {
  storedTransform, invertTransform, composeTransforms, resampleAffineOf, writeTransformFile, readTransformFile, alignRun,
  estimateAlignment, readAnatomyImage, oneResamplingSaving, demoAnatomyPaths,
  type StoredTransform, type TransformSpace, type AlignmentEstimate, type OneResamplingSaving,
} from './align/index.js';
