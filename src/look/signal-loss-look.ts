import { b0Readout } from '../acquire/b0-readout.js';
import { imageAgreement } from '../acquire/image-agreement.js';
import { shiftMapVoxels } from '../acquire/shift-map-voxels.js';
import { unrecoverableSignal } from '../acquire/unrecoverable-signal.js';
import { isBoldsweepError } from '../core/errors.js';
import { fail } from '../core/fail.js';
import type { Sidecar } from '../io/run-types.js';
import { dilateMask } from './binary-morphology.js';
import type { Finding } from './finding-types.js';
import { FINDING_ADVICE } from './finding-text.js';

/** How far beyond the brain mask (voxels, 6-neighbour steps) lost signal is still counted as the brain's. */
export const SIGNAL_LOSS_NEAR_MASK_VOXELS = 2;

/** What a look learned from a B0 field: the shift map and the signal unwarping cannot restore. */
export interface LookB0 {
  /** Where the field came from, in words (file names, method). */
  source: string;
  /** Field offset, Hz, on the run's grid. */
  fieldMapHz: Float32Array;
  /** Shift along phase encode, voxels (undistorted space). */
  shiftVoxels: Float32Array;
  /** Phase-encode voxel axis. */
  axis: 0 | 1 | 2;
  /** 1 where the signal is lost (dephased or folded). */
  lost: Uint8Array;
  /** Mask voxels lost, and of them dephased and folded. */
  lostInMask: number;
  /**
   * Lost voxels in the mask or within {@link SIGNAL_LOSS_NEAR_MASK_VOXELS} voxels of it: a mask made
   * from the mean image leaves out the dark voids that dephasing makes at its edge, so counting only
   * inside it would miss most of the loss.
   */
  lostNearMask: number;
  /** 1 where the signal is lost in the mask or within {@link SIGNAL_LOSS_NEAR_MASK_VOXELS} voxels of it (what the figure outlines). */
  lostNear: Uint8Array;
  dephasedInMask: number;
  foldedInMask: number;
  /** Lost mask voxels, % of the mask. */
  lostPercentOfMask: number;
  /** Largest |shift| inside the mask, voxels. */
  maxAbsShiftVoxels: number;
  /** The criterion, in words. */
  criterion: string;
  /** When the field came from a reversed phase-encode pair: its agreement inside the mask before and after unwarping each image. */
  pairAgreement?: { correlationBefore: number; correlationAfter: number; meanAbsDifferenceBefore: number; meanAbsDifferenceAfter: number };
}

/**
 * The B0 part of a look: the field's shift map (sidecar PhaseEncodingDirection and TotalReadoutTime
 * or EffectiveEchoSpacing), the signal-loss map ({@link unrecoverableSignal}, with the sidecar's
 * EchoTime) and, when some of the brain mask is lost, a `signal-loss` finding.
 * @param field - field offset in Hz on the run's grid, where it came from, and (from a reversed
 *   phase-encode pair) the pair before and after unwarping, for their agreement in the mask
 * @param dims - the run's [nx, ny, nz]
 * @param sidecar - the run's sidecar
 * @param mask - the look's brain mask
 * @returns the B0 summary and finding, or what to supply when the sidecar lacks the readout
 * @throws BoldsweepError GRID_MISMATCH for a field of another size
 * @example const { b0, finding } = signalLossLook({ fieldMapHz, source: 'sub-01_fieldmap.nii.gz' }, [64, 64, 36], run.sidecar, mask)
 */
export function signalLossLook(
  field: { fieldMapHz: Float32Array; source: string; pairUnwarped?: { imageA: Float32Array; imageB: Float32Array; unwarpedA: Float32Array; unwarpedB: Float32Array } | null },
  dims: readonly [number, number, number],
  sidecar: Sidecar | null,
  mask: Uint8Array,
): { b0: LookB0 | null; finding: Finding | null; skipped: { why: string; how: string } | null } {
  const n = dims[0] * dims[1] * dims[2];
  if (field.fieldMapHz.length !== n) fail('GRID_MISMATCH', `the field map has ${field.fieldMapHz.length} voxels, the run's grid ${n}`);
  let readout;
  try {
    readout = b0Readout(sidecar, dims);
  } catch (e) {
    if (!isBoldsweepError(e)) throw e;
    return { b0: null, finding: null, skipped: { why: `a field was given (${field.source}) but ${e.message.split('.')[0]}`, how: 'put PhaseEncodingDirection and TotalReadoutTime (or EffectiveEchoSpacing) in the run\'s BIDS sidecar' } };
  }
  const shiftVoxels = shiftMapVoxels(field.fieldMapHz, { totalReadoutTimeSec: readout.totalReadoutTimeSec, sign: readout.phaseEncodeSign });
  const te = typeof sidecar?.EchoTime === 'number' ? sidecar.EchoTime : null;
  const loss = unrecoverableSignal(field.fieldMapHz, dims, shiftVoxels, readout.phaseEncodeAxis, te);
  let inMask = 0, lostInMask = 0, lostNearMask = 0, dephasedInMask = 0, foldedInMask = 0, maxShift = 0;
  const kept = loss.keptFraction;
  let near: Uint8Array = Uint8Array.from(mask, (x) => (x ? 1 : 0));
  for (let r = 0; r < SIGNAL_LOSS_NEAR_MASK_VOXELS; r++) near = dilateMask(near, dims);
  const lostNear = new Uint8Array(n);
  for (let v = 0; v < n; v++) if (near[v] && loss.lost[v]) { lostNear[v] = 1; lostNearMask++; }
  for (let v = 0; v < n; v++) {
    if (!mask[v]) continue;
    inMask++;
    maxShift = Math.max(maxShift, Math.abs(shiftVoxels[v]));
    if (!loss.lost[v]) continue;
    lostInMask++;
    if (kept && kept[v] < 0.5) dephasedInMask++;
    else foldedInMask++;
  }
  const pct = inMask > 0 ? (100 * lostInMask) / inMask : 0;
  const b0: LookB0 = {
    source: field.source, fieldMapHz: field.fieldMapHz, shiftVoxels, axis: readout.phaseEncodeAxis, lost: loss.lost,
    lostInMask, lostNearMask, lostNear, dephasedInMask, foldedInMask, lostPercentOfMask: pct, maxAbsShiftVoxels: maxShift, criterion: loss.criterion,
  };
  if (field.pairUnwarped) {
    const p = field.pairUnwarped;
    const before = imageAgreement(p.imageA, p.imageB, mask), after = imageAgreement(p.unwarpedA, p.unwarpedB, mask);
    b0.pairAgreement = { correlationBefore: before.correlation, correlationAfter: after.correlation, meanAbsDifferenceBefore: before.meanAbsDifference, meanAbsDifferenceAfter: after.meanAbsDifference };
  }
  if (lostNearMask === 0) return { b0, finding: null, skipped: null };
  const axisName = ['i', 'j', 'k'][readout.phaseEncodeAxis];
  const finding: Finding = {
    kind: 'signal-loss', volumes: [], slices: [], voxels: [],
    evidence: {
      lostVoxelsInMask: lostInMask, lostVoxelsNearMask: lostNearMask, lostPercentOfMask: Number(pct.toFixed(2)), dephasedVoxelsInMask: dephasedInMask, foldedVoxelsInMask: foldedInMask,
      maxAbsShiftVoxels: Number(maxShift.toFixed(2)),
      ...(b0.pairAgreement ? { pairCorrelationBefore: Number(b0.pairAgreement.correlationBefore.toFixed(4)), pairCorrelationAfter: Number(b0.pairAgreement.correlationAfter.toFixed(4)) } : {}),
      totalReadoutTimeSec: readout.totalReadoutTimeSec, ...(te !== null ? { echoTimeSec: te } : {}), fieldSource: field.source,
    },
    reason: `from ${field.source}: ${loss.criterion}; the largest shift in the brain mask is ${maxShift.toFixed(1)} voxels along ${axisName}`,
    advice: FINDING_ADVICE['signal-loss'],
    verdict: `signal lost to the B0 field in ${lostNearMask} voxels in or at the edge of the brain mask (${lostInMask} inside it, ${pct.toFixed(1)} %): unwarping cannot restore them; expect no detections there`,
    consequence: `${lostNearMask} voxels in or next to the brain mask (${lostInMask} inside it, ${pct.toFixed(1)} % of it) cannot show an activation, unwarped or not`,
  };
  return { b0, finding, skipped: null };
}
