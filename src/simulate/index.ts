// simulate: public exports of this module (re-exports only; src/index.ts re-exports this file).
// digital phantom
export { simulatePhantomRun } from './simulate-phantom-run.js';
export { writePhantomRun, type PhantomRunFiles } from './write-phantom-run.js';
export { defaultPhantomSpec, demoPhantomSpec, resolvePhantomSpec, defaultPhantomEyes, defaultLowBaselineVoxels, defaultPhantomStructural, defaultPhantomTemplate } from './phantom-spec.js';
export type { PhantomStructural, PhantomStructuralSequence, PhantomTemplate } from './phantom-spec.js';
export { simulatePhantomStructural } from './simulate-phantom-structural.js';
export { simulatePhantomTemplate } from './simulate-phantom-template.js';
export { phantomAnatomyGrids, type PhantomAnatomyGrids } from './phantom-anatomy-grids.js';
export { phantomT1wSignal } from './phantom-t1w-signal.js';
export { writePhantomAnatomy, PHANTOM_TEMPLATE_FILE, type PhantomAnatomyFiles } from './write-phantom-anatomy.js';
export { eyeFraction } from './eye-fraction.js';
export type {
  PhantomSpec, PhantomSpecInput, PhantomAcquisition, PhantomActivation, PhantomPhysio, PhantomDrift, PhantomSmoothNoise,
  PhantomB0, PhantomSpikeSpec, PhantomDropoutSpec,
} from './phantom-spec.js';
export type { PhantomRun, PhantomTruth, PhantomSpike, TissueSteadyState } from './phantom-types.js';
export { headAnatomy, headClassifier, DEFAULT_HEAD_GEOMETRY, type HeadGeometry, type HeadAnatomy, type Ellipsoid } from './head-anatomy.js';
export { PHANTOM_TISSUES, TISSUE_LABEL, DEFAULT_TISSUE_PROPERTIES, type PhantomTissue, type TissueProperties } from './tissue-properties.js';
export { spoiledGreSignal, mzBeforePulse, ernstAngleDeg, type GreTiming, type SpoiledGreSignal } from './spoiled-gre-signal.js';
export { sphereFieldMapHz, PROTON_HZ_PER_TESLA, type AirSphere } from './sphere-field-map-hz.js';
export { intravoxelDephasing } from './intravoxel-dephasing.js';
export { blockDesignEvents, type BlockDesign } from './block-design-events.js';
export { blockResponseAt } from './block-response-at.js';
export { physioTraces, type PhysioRates, type PhysioTraces } from './physio-traces.js';
export { smoothGaussianField } from './smooth-gaussian-field.js';
export { simulatedMotionTable, type MotionJerk, type MotionSpec } from './simulated-motion-table.js';
export { phantomAcquisitionModel } from './phantom-acquisition-model.js';
export { simulatePhaseEncodePair, PHASE_ENCODE_PAIR_VOLUMES, type PhantomPhaseEncodePair } from './simulate-phase-encode-pair.js';
export { writePhaseEncodePair } from './write-phase-encode-pair.js';
