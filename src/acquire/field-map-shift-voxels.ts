/**
 * Displacement along the phase-encode axis of tissue at an off-resonance frequency:
 * shift (voxels) = df (Hz) x total readout time (s) (Jezzard & Balaban 1995).
 * @param offResonanceHz - field offset, Hz
 * @param totalReadoutSec - total readout time, seconds
 * @returns shift in voxels, positive along the phase-encode direction of travel
 * @example fieldMapShiftVoxels(50, totalReadoutTimeSec(0.0005, 64)) // 1.575
 */
export function fieldMapShiftVoxels(offResonanceHz: number, totalReadoutSec: number): number {
  return offResonanceHz * totalReadoutSec;
}
