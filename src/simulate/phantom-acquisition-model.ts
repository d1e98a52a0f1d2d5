import { acquisitionModel, type AcquisitionModel } from '../acquire/acquisition-model.js';
import type { PhantomRun } from './phantom-types.js';

/**
 * The acquisition model a phantom run was simulated with: its motion table about its rotation
 * centre (when the spec moves the head), its field map (when the spec distorts), its total readout
 * time and phase-encode direction, and its interleaved slice times. Planting with this model puts
 * the planted activation where the phantom puts its own signal, at the times it reads it.
 * @param run - a simulated run (its truth and sidecar are read, not modified)
 * @returns the model
 * @example const model = phantomAcquisitionModel(simulatePhantomRun(demoPhantomSpec()))
 */
export function phantomAcquisitionModel(run: PhantomRun): AcquisitionModel {
  const { truth } = run;
  return acquisitionModel(run, {
    motionTable: truth.spec.motion ? truth.motionTable : null,
    rotationCentreMm: truth.rotationCentreMm,
    fieldMapHz: truth.spec.b0?.distortion ? truth.fieldMapHz : null,
    totalReadoutTimeSec: truth.totalReadoutTimeSec,
    sliceTimesSec: 'sidecar',
  });
}
