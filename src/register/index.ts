// register: public exports of this module (re-exports only; src/index.ts re-exports the public few).
export { REGISTRATION_MODELS, REGISTRATION_COSTS, MOTION_PARAMETER_NAMES } from './registration-types.js';
export type { ImageOnGrid, RegistrationModel, RegistrationCost, RegisterOptions, RegistrationResult } from './registration-types.js';
export { motionParametersAffine } from './motion-parameters-affine.js';
export { affineMotionParameters } from './affine-motion-parameters.js';
export { parzenJointHistogram, type ParzenWindow, type JointHistogramOptions } from './parzen-joint-histogram.js';
export { normalisedMutualInformation } from './normalised-mutual-information.js';
export { normalisedCorrelation } from './normalised-correlation.js';
export { nelderMead, type NelderMeadOptions, type NelderMeadResult } from './nelder-mead.js';
export { solveLinearSystem } from './solve-linear-system.js';
export { prepareFixedLevel, levelFwhmMm, type FixedLevel, type FixedLevelOptions } from './prepare-fixed-level.js';
export { movingLevel, type MovingLevel } from './moving-level.js';
export { leastSquaresPass, type LeastSquaresSums } from './least-squares-pass.js';
export { sampleMoving } from './sample-moving.js';
export { registerPrepared, type PreparedFixed } from './register-prepared.js';
export { registerImagePair, prepareFixed, DEFAULT_LEVELS, DEFAULT_BINS } from './register-image-pair.js';
export { leastMovingVolume } from './least-moving-volume.js';
export { registerVolumesTask, type RegisterVolumesTask, type RegisterVolumesResult } from './register-volumes-task.js';
export { estimateRunMotion, MOTION_REFERENCES, RUN_MOTION_IN_THREAD_BELOW, type MotionReference, type RunMotionOptions, type RunMotion } from './estimate-run-motion.js';
