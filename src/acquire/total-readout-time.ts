import { fail } from '../core/fail.js';

/**
 * Total readout time of an EPI readout: effective echo spacing x (phase-encode lines - 1)
 * (Jezzard P & Balaban RS (1995) Magn Reson Med 34:65-73; the BIDS TotalReadoutTime definition,
 * where the lines are the reconstructed matrix size along the phase-encode axis [memory]).
 * @param effectiveEchoSpacingSec - effective echo spacing, seconds
 * @param phaseEncodeLines - number of phase-encode lines (voxels along the phase-encode axis)
 * @returns seconds
 * @throws BoldsweepError INVALID_ARGUMENT for a non-positive spacing or fewer than 2 lines
 * @example totalReadoutTimeSec(0.0005, 64) // 0.0315
 */
export function totalReadoutTimeSec(effectiveEchoSpacingSec: number, phaseEncodeLines: number): number {
  if (!(effectiveEchoSpacingSec > 0) || !Number.isInteger(phaseEncodeLines) || phaseEncodeLines < 2) {
    fail('INVALID_ARGUMENT', `need effectiveEchoSpacingSec > 0 and phaseEncodeLines an integer >= 2, got ${effectiveEchoSpacingSec} and ${phaseEncodeLines}`);
  }
  return effectiveEchoSpacingSec * (phaseEncodeLines - 1);
}
