import { describe, expect, it } from 'vitest';
import { applyUnwarp } from '../../src/acquire/apply-unwarp.js';
import { b0Readout } from '../../src/acquire/b0-readout.js';
import { distortAlongAxis } from '../../src/acquire/distort-along-axis.js';
import { fieldMapFromPhaseDifference } from '../../src/acquire/field-map-from-phase-difference.js';
import { fieldMapOnGrid } from '../../src/acquire/field-map-on-grid.js';
import { imageAgreement } from '../../src/acquire/image-agreement.js';
import { planUnwarp } from '../../src/acquire/plan-unwarp.js';
import { reversedPhaseEncodeShift } from '../../src/acquire/reversed-phase-encode-shift.js';
import { shiftMapVoxels } from '../../src/acquire/shift-map-voxels.js';
import { totalReadoutTimeSec } from '../../src/acquire/total-readout-time.js';
import { unrecoverableSignal } from '../../src/acquire/unrecoverable-signal.js';
import { diagonalAffine } from '../../src/core/affine.js';
import { isBoldsweepError } from '../../src/core/errors.js';
import { makeVolume } from '../../src/core/volume.js';
import { demoPhantomSpec } from '../../src/simulate/phantom-spec.js';
import { simulatePhantomRun } from '../../src/simulate/simulate-phantom-run.js';

function errorOf(f: () => unknown): { code: string; message: string } {
  try { f(); } catch (e) { return isBoldsweepError(e) ? { code: e.code, message: e.message } : { code: `other: ${String(e)}`, message: '' }; }
  return { code: 'none', message: '' };
}

describe('voxel shift from a field map', () => {
  it('is off-resonance (Hz) x total readout time (s), in phase-encode voxels: a worked example', () => {
    // Jezzard P & Balaban RS (1995) Magn Reson Med 34:65-73 [memory]: the displacement along phase
    // encode is df / (bandwidth per voxel along phase encode) = df x total readout time. Worked
    // example: effective echo spacing 0.5 ms, 64 phase-encode lines -> readout 0.5 ms x 63 = 31.5 ms
    // (BIDS TotalReadoutTime); 50 Hz off resonance -> 50 x 0.0315 = 1.575 voxels; 'j-' reverses it.
    const readout = totalReadoutTimeSec(0.0005, 64);
    expect(readout).toBeCloseTo(0.0315, 12);
    const s = shiftMapVoxels(Float32Array.of(50, -20, 0), { totalReadoutTimeSec: readout, sign: 1 });
    // float32 storage of the map: 1e-6 relative
    expect(s[0]).toBeCloseTo(1.575, 6);
    expect(s[1]).toBeCloseTo(-0.63, 6);
    expect(shiftMapVoxels(Float32Array.of(50), { totalReadoutTimeSec: readout, sign: -1 })[0]).toBeCloseTo(-1.575, 6);
    // the sidecar gives the same readout from EffectiveEchoSpacing
    expect(b0Readout({ PhaseEncodingDirection: 'j-', EffectiveEchoSpacing: 0.0005 }, [64, 64, 36])).toEqual({ phaseEncodeAxis: 1, phaseEncodeSign: -1, totalReadoutTimeSec: readout });
  });

  it('a phase difference of pi over 2.46 ms is 203.25 Hz (Hz = dphi / (2 pi dTE))', () => {
    // standard MR physics: phase accrues at 2 pi f rad/s, so pi rad in 2.46 ms is f = 1 / (2 x 0.00246)
    const f = fieldMapFromPhaseDifference(Float32Array.of(Math.PI, -Math.PI / 2, 0), 0.00246);
    // float32 storage: 1e-4 Hz
    expect(f[0]).toBeCloseTo(1 / (2 * 0.00246), 3);
    expect(f[1]).toBeCloseTo(-1 / (4 * 0.00246), 3);
    expect(errorOf(() => fieldMapFromPhaseDifference(Float32Array.of(1), 0)).code).toBe('INVALID_ARGUMENT');
  });
});

describe('unwarping (planUnwarp + applyUnwarp)', () => {
  it('undoes a uniform shift exactly and keeps each line\'s signal with the Jacobian', () => {
    const dims: [number, number, number] = [3, 20, 2];
    const n = 3 * 20 * 2;
    const img = new Float32Array(n);
    for (let k = 0; k < 2; k++) for (let j = 0; j < 20; j++) for (let i = 0; i < 3; i++) img[i + 3 * (j + 20 * k)] = Math.exp(-((j - 9 - i) ** 2) / 8) * 100;
    // a uniform 2-voxel shift: the forward model moves the signal by exactly 2 voxels
    const shift = new Float32Array(n).fill(2);
    const distorted = distortAlongAxis(img, shift, dims, 1);
    const back = applyUnwarp(distorted, planUnwarp(shift, dims, 1, { kernel: 'linear', jacobian: true }), new Float32Array(n));
    // the forward model (distortLines) deposits linearly interpolated sub-voxel pieces by linear
    // weights: a slight blur of its own even at zero shift (4 % of the peak for this Gaussian of sigma
    // 2 voxels). A whole-voxel shift only moves that blurred line, so unwarping gives it back exactly
    // (float32 rounding: 1e-3 of a peak of 100), except the last 2 voxels of each line, whose signal
    // the shift pushed out of the field of view
    const blurred = distortAlongAxis(img, new Float32Array(n), dims, 1);
    for (let v = 0; v < n; v++) if (Math.floor(v / 3) % 20 < 18) expect(back[v]).toBeCloseTo(blurred[v], 3);
    // the cubic B-spline interpolates its samples exactly at whole-voxel positions (Unser 1999 [memory]), so
    // a whole-voxel shift comes back exactly with it too
    const backCubic = applyUnwarp(distorted, planUnwarp(shift, dims, 1, { kernel: 'cubic', jacobian: true }), new Float32Array(n));
    for (let v = 0; v < n; v++) if (Math.floor(v / 3) % 20 < 18) expect(backCubic[v]).toBeCloseTo(blurred[v], 3);
    // a varying shift: the Jacobian keeps the line's total (to the discretisation of d(shift)/dy)
    const varying = new Float32Array(n);
    for (let v = 0; v < n; v++) varying[v] = 1.5 * Math.sin((Math.floor(v / 3) % 20) / 4);
    const d2 = distortAlongAxis(img, varying, dims, 1);
    const u2 = applyUnwarp(d2, planUnwarp(varying, dims, 1, { kernel: 'linear', jacobian: true }), new Float32Array(n));
    const sum = (a: Float32Array) => a.reduce((s, x) => s + x, 0);
    // 1 %: central differences of a sine over 2 voxels and linear reads of a Gaussian of sigma 2 voxels
    expect(Math.abs(sum(u2) - sum(img)) / sum(img)).toBeLessThan(0.01);
    // in place (out = data) gives the same values: each line is read whole before it is written
    const inPlace = Float32Array.from(d2);
    applyUnwarp(inPlace, planUnwarp(varying, dims, 1, { kernel: 'linear', jacobian: true }), inPlace);
    expect(Array.from(inPlace)).toEqual(Array.from(u2));
  });

  it('Chang & Fitzpatrick\'s worked example: I = 100, d\' = 0.2 gives 83.333 and 125, and both unwarp to 100', () => {
    // Chang H & Fitzpatrick JM (1992) IEEE Trans Med Imaging 11:319-329 [memory] (REFERENCES.md §11):
    // with x+- = x +- d(x), the two images hold I / (1 +- d'); the corrected intensity is I.
    const len = 60, dims: [number, number, number] = [1, len, 1];
    const img = Float32Array.from({ length: len }, (_, j) => (j >= 10 && j < 40 ? 100 : 0));
    const d = Float32Array.from({ length: len }, (_, j) => 0.2 * (j - 25));
    const minus = d.map((x) => -x);
    const a = distortAlongAxis(img, d, dims, 1), b = distortAlongAxis(img, minus, dims, 1);
    // inside the object, away from its edges (the forward model's linear deposition blurs edges); its
    // 8 pieces per voxel land unevenly on a compressed grid, a ripple of 0.25 %: 0.4 % tolerance
    const near = (x: number, want: number, rel = 0.004) => expect(Math.abs(x - want) / want).toBeLessThan(rel);
    near(a[25], 100 / 1.2);
    near(b[25], 100 / 0.8);
    near((2 * a[25] * b[25]) / (a[25] + b[25]), 100);
    const ua = applyUnwarp(a, planUnwarp(d, dims, 1, { kernel: 'linear', jacobian: true }), new Float32Array(len));
    const ub = applyUnwarp(b, planUnwarp(minus, dims, 1, { kernel: 'linear', jacobian: true }), new Float32Array(len));
    // the same ripple, read back by the linear kernel: 0.5 %
    for (let j = 14; j <= 36; j++) { near(ua[j], 100, 0.005); near(ub[j], 100, 0.005); }
    // the cumulative-intensity matching finds d = 0.2 (x - 25) from the pair alone (no regularisation
    // across lines: one line); 0.05 voxel where the object's edges do not enter the match
    const est = reversedPhaseEncodeShift(a, b, dims, 1, { smoothFwhmVoxels: 0, backgroundFraction: 0 });
    for (let j = 14; j <= 36; j++) expect(Math.abs(est.shiftVoxels[j] - d[j])).toBeLessThan(0.05);
  });

  // the demo phantom's head and sinus field, noise-free, one volume: distorted (the forward model) and not
  const base = { ...demoPhantomSpec(), nVolumes: 1, thermalNoiseSd: 0, rician: false, physio: null, drift: null, smoothNoise: null, motion: null, spikes: [], dropouts: [], activation: null, design: null };
  const b0 = (distortion: boolean) => ({ susceptibilityDifferencePpm: 9.4, dephasing: false, distortion });
  const distorted = simulatePhantomRun({ ...base, b0: b0(true) });
  const truth = simulatePhantomRun({ ...base, b0: b0(false) }).volume.data;
  const dims = distorted.volume.dims.slice(0, 3) as [number, number, number];
  const field = distorted.truth.fieldMapHz.data;
  const shift = shiftMapVoxels(field, { totalReadoutTimeSec: distorted.truth.totalReadoutTimeSec, sign: 1 });
  // the lost-signal criterion of the step (dephasing at the demo's TE of 30 ms, or folding): there the
  // field changes so fast that no unwarping restores the image, so the check leaves those voxels out
  const lost = unrecoverableSignal(field, dims, shift, 1, 0.03).lost;
  // where the field moves the head's signal by half a voxel or more and the signal is not lost
  const region = new Uint8Array(field.length);
  for (let v = 0; v < field.length; v++) if (Math.abs(shift[v]) >= 0.5 && !lost[v] && truth[v] > 50) region[v] = 1;

  it('with the true field map restores the undistorted phantom (correlation and edge position)', () => {
    const out = (kernel: 'linear' | 'cubic') => applyUnwarp(distorted.volume.data, planUnwarp(shift, dims, 1, { kernel, jacobian: true }), new Float32Array(field.length));
    const before = imageAgreement(distorted.volume.data, truth, region);
    const linear = imageAgreement(out('linear'), truth, region);
    const cubic = imageAgreement(out('cubic'), truth, region);
    // measured: 0.986 before, 0.997 linear, 0.999 cubic; mean |difference| 105 -> 59 (linear) and 30 (cubic)
    expect(region.reduce((s, x) => s + x, 0)).toBeGreaterThanOrEqual(8);
    expect(before.correlation).toBeLessThan(0.99);
    // the forward model deposits by linear weights (a blur the pull cannot undo): 0.995 leaves it room
    expect(linear.correlation).toBeGreaterThan(0.995);
    expect(cubic.correlation).toBeGreaterThan(0.995);
    expect(linear.meanAbsDifference).toBeLessThan(0.7 * before.meanAbsDifference);
    // edge position: on each phase-encode line through the region, where the signal first rises
    // through half the line's maximum from the front (+j) end, in voxels
    const edges = (img: Float32Array) => lineEdges(img, dims, region);
    const e0 = edges(truth), eBefore = edges(distorted.volume.data), eAfter = edges(out('linear'));
    const err = (e: number[]) => e.reduce((s, x, i) => s + Math.abs(x - e0[i]), 0) / e0.length;
    // measured: 0.201 voxel before, 0.099 after (10 lines); 0.25 voxel is the linear read's own blur
    console.log(`edge error (voxels, ${e0.length} lines): before ${err(eBefore).toFixed(3)}, after linear ${err(eAfter).toFixed(3)}`);
    expect(err(eAfter)).toBeLessThan(0.25);
    expect(err(eAfter)).toBeLessThan(err(eBefore));
  });

  it('the reversed phase-encode pair recovers the true field inside the brain', () => {
    const reversed = simulatePhantomRun({ ...base, b0: b0(true), acquisition: { ...base.acquisition, phaseEncodingDirection: 'j-' } });
    const est = reversedPhaseEncodeShift(distorted.volume.data, reversed.volume.data, dims, 1);
    const labels = distorted.truth.tissueLabels.data;
    const T = distorted.truth.totalReadoutTimeSec;
    let se = 0, n = 0, seRegion = 0, nRegion = 0;
    for (let v = 0; v < field.length; v++) {
      if (!(labels[v] === 3 || labels[v] === 4) || lost[v]) continue;
      const e = est.shiftVoxels[v] / T - field[v];
      se += e * e; n++;
      if (region[v]) { seRegion += e * e; nRegion++; }
    }
    const rms = Math.sqrt(se / n), rmsRegion = Math.sqrt(seRegion / nRegion);
    console.log(`reversed-PE field error: RMS ${rms.toFixed(2)} Hz in the brain (${n} voxels), ${rmsRegion.toFixed(2)} Hz where the shift is >= 0.5 voxel`);
    // measured: 0.91 Hz RMS in the brain, 2.55 Hz where the shift is >= 0.5 voxel. 1 voxel of shift is
    // 1 / 0.01785 s = 56 Hz here: 3 Hz is under 0.06 voxel, below what moves a detection
    expect(rms).toBeLessThan(3);
    // near the sinus the field changes by tens of Hz per voxel and the 2-voxel regularisation averages
    // it: 6 Hz (0.1 voxel)
    expect(rmsRegion).toBeLessThan(6);
    // unwarping each image with its own half of the displacement brings the pair together
    const n3 = field.length;
    const brain = Uint8Array.from(labels, (l) => (l === 3 || l === 4 ? 1 : 0));
    const ua = applyUnwarp(distorted.volume.data, planUnwarp(est.shiftVoxels, dims, 1, { kernel: 'linear', jacobian: true }), new Float32Array(n3));
    const ub = applyUnwarp(reversed.volume.data, planUnwarp(est.shiftVoxels.map((x) => -x), dims, 1, { kernel: 'linear', jacobian: true }), new Float32Array(n3));
    const before = imageAgreement(distorted.volume.data, reversed.volume.data, brain), after = imageAgreement(ua, ub, brain);
    console.log(`pair agreement in the brain: correlation ${before.correlation.toFixed(4)} -> ${after.correlation.toFixed(4)}, mean |difference| ${before.meanAbsDifference.toFixed(1)} -> ${after.meanAbsDifference.toFixed(1)}`);
    // measured: correlation 0.942 -> 0.990, mean |difference| 9.5 -> 2.9
    expect(after.correlation).toBeGreaterThan(0.98);
    expect(after.meanAbsDifference).toBeLessThan(0.6 * before.meanAbsDifference);
  });
});

describe('signal that cannot be recovered', () => {
  it('flags folds (1 + d(shift)/dy <= 0) and strong dephasing, and matches the phantom\'s own loss', () => {
    const dims: [number, number, number] = [1, 10, 1];
    // shift falls by 3 voxels over 2 voxels around j = 5: d(shift)/dy = -1.5 there
    const shift = Float32Array.from({ length: 10 }, (_, j) => (j < 4 ? 2 : j > 6 ? -1 : 2 - 1.5 * (j - 4)));
    const r = unrecoverableSignal(new Float32Array(10), dims, shift, 1, 0.03);
    expect(Array.from(r.lost)).toEqual([0, 0, 0, 1, 1, 1, 1, 1, 0, 0].map((x, j) => (1 + ((shift[Math.min(9, j + 1)] - shift[Math.max(0, j - 1)]) / (j === 0 || j === 9 ? 1 : 2)) <= 0 ? 1 : 0)));
    expect(r.foldedVoxels).toBeGreaterThan(0);
    // dephasing: a field changing by 20 Hz per voxel at TE 30 ms keeps |sinc(0.6)| = 0.50 (about half)
    const ramp = Float32Array.from({ length: 10 }, (_, j) => 25 * j);
    const d = unrecoverableSignal(ramp, dims, new Float32Array(10), 1, 0.03);
    // 25 Hz/voxel x 0.03 s = 0.75 cycles: sinc(0.75) = 0.30 < 0.5 -> lost everywhere
    expect(d.dephasedVoxels).toBe(10);
    expect(d.keptFraction![5]).toBeCloseTo(Math.abs(Math.sin(Math.PI * 0.75) / (Math.PI * 0.75)), 5);
  });
});

describe('bad input', () => {
  it('names the sidecar field to supply', () => {
    const missingReadout = errorOf(() => b0Readout({ PhaseEncodingDirection: 'j' }, [8, 8, 8]));
    expect(missingReadout.code).toBe('READOUT_TIME_MISSING');
    expect(missingReadout.message).toMatch(/TotalReadoutTime/);
    const missingDirection = errorOf(() => b0Readout({ TotalReadoutTime: 0.03 }, [8, 8, 8]));
    expect(missingDirection.code).toBe('PHASE_ENCODE_MISSING');
    expect(missingDirection.message).toMatch(/PhaseEncodingDirection/);
    // a world axis or an anatomical label is not a voxel axis
    for (const bad of ['y', 'AP', 'j+']) {
      const e = errorOf(() => b0Readout({ TotalReadoutTime: 0.03, PhaseEncodingDirection: bad as 'j' }, [8, 8, 8]));
      expect(e.code).toBe('PHASE_ENCODE_INVALID');
      expect(e.message).toMatch(/PhaseEncodingDirection/);
    }
  });

  it('a field map on another grid: carried through both affines, refused without one', () => {
    const runAffine = diagonalAffine([3, 3, 3], [-12, -12, -12]);
    const fieldAffine = diagonalAffine([2, 2, 2], [-14, -14, -14]);
    // a field linear in world x: trilinear interpolation reproduces it exactly inside the field's grid
    const fd: [number, number, number] = [15, 15, 15];
    const data = new Float32Array(15 ** 3);
    for (let k = 0; k < 15; k++) for (let j = 0; j < 15; j++) for (let i = 0; i < 15; i++) data[i + 15 * (j + 15 * k)] = 10 * (-14 + 2 * i);
    const fieldVol = makeVolume({ dims: [...fd, 1], spacingMm: [2, 2, 2], trSec: 0, affine: fieldAffine, data });
    const onRun = fieldMapOnGrid(fieldVol, { dims: [9, 9, 9], affine: runAffine }, { field: true, run: true });
    for (let k = 0; k < 9; k++) for (let j = 0; j < 9; j++) for (let i = 0; i < 9; i++) expect(onRun[i + 9 * (j + 9 * k)]).toBeCloseTo(10 * (-12 + 3 * i), 3);
    const e = errorOf(() => fieldMapOnGrid(fieldVol, { dims: [9, 9, 9], affine: runAffine }, { field: false, run: true }));
    expect(e.code).toBe('FIELD_MAP_NO_AFFINE');
    expect(e.message).toMatch(/sform|qform/);
    // on the run's own grid no affine is needed
    expect(fieldMapOnGrid(fieldVol, { dims: fd, affine: fieldAffine }, { field: false, run: false }).length).toBe(15 ** 3);
  });
});

/** Per line along j through `region`: where the signal first rises through half its maximum, from the +j end. */
function lineEdges(img: Float32Array, dims: readonly [number, number, number], region: Uint8Array): number[] {
  const [nx, ny, nz] = dims;
  const out: number[] = [];
  for (let k = 0; k < nz; k++) for (let i = 0; i < nx; i++) {
    let inRegion = false, max = 0;
    for (let j = 0; j < ny; j++) { const v = i + nx * (j + ny * k); if (region[v]) inRegion = true; max = Math.max(max, img[v]); }
    if (!inRegion) continue;
    const half = max / 2;
    let edge = NaN;
    for (let j = ny - 1; j > 0; j--) {
      const a = img[i + nx * (j + ny * k)], b = img[i + nx * (j - 1 + ny * k)];
      if (a < half && b >= half) { edge = j - 1 + (b - half) / (b - a); break; }
    }
    out.push(edge);
  }
  return out;
}
