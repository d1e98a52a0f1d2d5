/**
 * The digital phantom, one volume at a time:
 *
 *   head anatomy (partial volumes, padded grid) --+
 *   tissue T1, T2*, PD -> steady state + approach --+--> head-frame image of volume n
 *   task response, cardiac/respiratory at slice times --+     x intravoxel dephasing
 *        |
 *        v
 *   rigid motion (trilinear resample) -> EPI shift along phase encode (moved field map)
 *   [pose, field-map shift and slice times are the acquisition model's functions, src/acquire]
 *   -> drift x smooth random field -> slice dropout -> thermal noise (Rician) -> spikes
 */
import { composeAffine, diagonalAffine, invertAffine, type Affine, type Vec3 } from '../core/affine.js';
import { childSeed, createRng } from '../core/random.js';
import { makeVolume, type Volume } from '../core/volume.js';
import type { Sidecar } from '../io/run-types.js';
import { distortAlongAxis } from '../acquire/distort-along-axis.js';
import { headFieldShiftVoxels } from '../acquire/head-field-shift-voxels.js';
import { interleavedSliceTiming } from '../acquire/interleaved-slice-timing.js';
import { sliceOrderTiming } from '../acquire/slice-order-timing.js';
import { motionTablePoses } from '../acquire/motion-table-poses.js';
import { phaseEncodeAxis } from '../acquire/phase-encode-axis.js';
import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { steadyStateModelCount } from '../look/steady-state-model.js';
import { trilinearResample } from '../resample/trilinear-resample.js';
import { blockDesignEvents } from './block-design-events.js';
import { blockResponseAt } from './block-response-at.js';
import { eyeFraction } from './eye-fraction.js';
import { headAnatomy } from './head-anatomy.js';
import { intravoxelDephasing } from './intravoxel-dephasing.js';
import { resolvePhantomSpec, type PhantomSpecInput } from './phantom-spec.js';
import type { PhantomRun, PhantomSpike, PhantomTruth, TissueSteadyState } from './phantom-types.js';
import { physioTraces } from './physio-traces.js';
import { simulatedMotionTable } from './simulated-motion-table.js';
import { smoothGaussianField } from './smooth-gaussian-field.js';
import { sphereFieldMapHz } from './sphere-field-map-hz.js';
import { totalReadoutTimeSec } from '../acquire/total-readout-time.js';
import { mzBeforePulse, spoiledGreSignal } from './spoiled-gre-signal.js';
import { PHANTOM_TISSUES, TISSUE_LABEL, type PhantomTissue } from './tissue-properties.js';

/** Voxels of margin around the grid in which the head is drawn when it moves (covers 3 voxels of movement). */
const MOTION_PAD = 3;

/**
 * Simulate a run of the digital phantom: a head-shaped object with a folded cortex on an EPI-like
 * grid, its spoiled-gradient-echo signal approaching steady state, a task response, physiological
 * and thermal noise, drift, and the optional artefacts of the spec (head jerk, field inhomogeneity,
 * spikes, slice dropout), with the ground truth of all of them. Pure: same spec -> same bytes.
 * @param input - spec; anything left out takes the documented default (see {@link PhantomSpec})
 * @returns the run (float32 4D volume), its BIDS sidecar fields, the events and the truth
 * @throws BoldsweepError INVALID_ARGUMENT for a bad spec field
 * @example const { volume, truth } = simulatePhantomRun({ nVolumes: 20, seed: 3 })
 */
export function simulatePhantomRun(input: PhantomSpecInput = {}): PhantomRun {
  const spec = resolvePhantomSpec(input);
  const acq = spec.acquisition;
  const [nx, ny, nz] = spec.dims;
  const nVox = nx * ny * nz;
  const nt = spec.nVolumes;
  const tr = acq.trSec;
  const origin: Vec3 = [0, 1, 2].map((a) => (-(spec.dims[a] - 1) / 2) * spec.spacingMm[a]) as Vec3;
  const affine = diagonalAffine(spec.spacingMm, origin);
  const centreMm: Vec3 = [0, 0, 0];

  // 1. anatomy on a padded grid (the head is drawn beyond the field of view so that motion brings real tissue in)
  const pad = spec.motion ? MOTION_PAD : 0;
  const pDims: [number, number, number] = [nx + 2 * pad, ny + 2 * pad, nz + 2 * pad];
  const pVox = pDims[0] * pDims[1] * pDims[2];
  const pAffine = diagonalAffine(spec.spacingMm, [origin[0] - pad * spec.spacingMm[0], origin[1] - pad * spec.spacingMm[1], origin[2] - pad * spec.spacingMm[2]]);
  const anatomy = headAnatomy(pDims, pAffine, spec.anatomy.geometry, spec.anatomy.supersample);
  const crop = <T extends Float32Array | Uint8Array>(src: T, out: T): T => {
    let p = 0;
    for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++, p++) out[p] = src[i + pad + pDims[0] * (j + pad + pDims[1] * (k + pad))];
    return out;
  };

  // 2. tissue signal: the grey-matter steady state sets the scale
  const timing = { trSec: tr, teSec: acq.teSec, flipAngleDeg: acq.flipAngleDeg };
  const gre = Object.fromEntries(PHANTOM_TISSUES.map((t) => [t, spoiledGreSignal(spec.tissues[t].t1Sec, spec.tissues[t].t2StarSec, timing)])) as Record<PhantomTissue, ReturnType<typeof spoiledGreSignal>>;
  const gm = spec.tissues['grey-matter'];
  const scale = spec.greyMatterSignal / (gm.protonDensity * gre['grey-matter'].steadySignal);
  const tissueSignal = Object.fromEntries(PHANTOM_TISSUES.map((t) => [t, scale * spec.tissues[t].protonDensity * gre[t].steadySignal])) as Record<PhantomTissue, number>;
  const nT = PHANTOM_TISSUES.length;
  const gmIndex = PHANTOM_TISSUES.indexOf('grey-matter');
  const fractions = PHANTOM_TISSUES.map((t) => anatomy.fractions[t]);

  // 3. timing: every slice is read at its own time within the TR
  // multiband: bands of the interleaved order read at once (without the option, the order as before)
  const multiband = spec.acquisition.multibandFactor ?? 1;
  const sliceTiming = multiband > 1 ? sliceOrderTiming(nz, tr, 'interleaved-odd-first', { multibandFactor: multiband }) : interleavedSliceTiming(nz, tr);
  const times = new Float64Array(nt * nz);
  for (let n = 0; n < nt; n++) for (let k = 0; k < nz; k++) times[n * nz + k] = n * tr + sliceTiming[k];
  const events = spec.design ? blockDesignEvents(spec.design, nt * tr) : [];
  const response = spec.activation && events.length > 0 ? blockResponseAt(events, times) : new Float64Array(nt * nz);
  const physio = spec.physio ? physioTraces(times, spec.physio.rates, createRng(childSeed(spec.seed, 'physio'))) : null;
  const cardiacAmp = PHANTOM_TISSUES.map((t) => (spec.physio?.cardiacPercent[t] ?? 0) / 100);
  const respAmp = PHANTOM_TISSUES.map((t) => (spec.physio?.respirationPercent[t] ?? 0) / 100);

  // 4. activation weight (Gaussian patch, grey matter only) on the padded grid
  const actWeight = new Float32Array(pVox);
  if (spec.activation) {
    const { centreMm: c, sigmaMm, amplitudePercent } = spec.activation;
    let p = 0;
    for (let k = 0; k < pDims[2]; k++) for (let j = 0; j < pDims[1]; j++) for (let i = 0; i < pDims[0]; i++, p++) {
      const x = pAffine[3] + i * spec.spacingMm[0] - c[0], y = pAffine[7] + j * spec.spacingMm[1] - c[1], z = pAffine[11] + k * spec.spacingMm[2] - c[2];
      const r2 = (x * x + y * y + z * z) / (sigmaMm * sigmaMm);
      if (r2 <= 2.5 * 2.5) actWeight[p] = (amplitudePercent / 100) * Math.exp(-0.5 * r2);
    }
  }

  // 5. field map and dephasing in the head frame
  const fieldPadded = spec.b0
    ? sphereFieldMapHz(pDims, pAffine, { centreMm: spec.anatomy.geometry.sinus.centreMm, radiusMm: spec.anatomy.geometry.sinus.radiusMm, fieldStrengthT: acq.fieldStrengthT, susceptibilityDifferencePpm: spec.b0.susceptibilityDifferencePpm })
    : new Float32Array(pVox);
  const dephase = spec.b0?.dephasing ? intravoxelDephasing(fieldPadded, pDims, acq.teSec) : null;
  const pe = phaseEncodeAxis(acq.phaseEncodingDirection);
  const readoutSec = totalReadoutTimeSec(acq.effectiveEchoSpacingSec, spec.dims[pe.axis]);

  // 6. motion table
  const motionTable: MotionRow[] = spec.motion
    ? simulatedMotionTable(nt, spec.motion, createRng(childSeed(spec.seed, 'motion')), physio && spec.motion.respiration ? volumeRespiration(physio.respiration, sliceTiming, nt, tr) : undefined)
    : Array.from({ length: nt }, (_, volume) => ({ volume, shiftXMm: 0, shiftYMm: 0, shiftZMm: 0, rotXDeg: 0, rotYDeg: 0, rotZDeg: 0 }));
  const poses = motionTablePoses(motionTable, nt, centreMm);
  const invPAffine = invertAffine(pAffine);

  // 7. the other random streams, each its own so that switching one component off leaves the others unchanged
  const thermalRng = createRng(childSeed(spec.seed, 'thermal'));
  const smoothRng = createRng(childSeed(spec.seed, 'smooth'));
  const spikeRng = createRng(childSeed(spec.seed, 'spikes'));

  const labels = crop(anatomy.labels, new Uint8Array(nVox));
  const brainVoxels: number[] = [];
  labels.forEach((l, p) => { if (l === TISSUE_LABEL['grey-matter'] || l === TISSUE_LABEL['white-matter']) brainVoxels.push(p); });
  // optional parts of a real-looking run; each has its own stream, so the others stay unchanged
  const eyes = spec.eyes ? eyeFraction(pDims, pAffine, spec.eyes, spec.anatomy.geometry.brain, spec.anatomy.supersample) : null;
  const lowBaseline = spec.lowBaselineVoxels ? pickLowBaselineVoxels(labels, spec.dims, spec.lowBaselineVoxels.count, spec.lowBaselineVoxels.excursionsPerVoxel, nt, createRng(childSeed(spec.seed, 'low-baseline'))) : [];
  const lowBaselineRng = createRng(childSeed(spec.seed, 'low-baseline-noise'));
  const spikes: PhantomSpike[] = spec.spikes.map((s) => {
    const p = brainVoxels[spikeRng.int(brainVoxels.length)];
    return { volume: s.volume, voxel: [p % nx, Math.floor(p / nx) % ny, Math.floor(p / (nx * ny))], amplitude: s.amplitude };
  });

  const data = new Float32Array(nVox * nt);
  const base = new Float32Array(pVox);
  const moved = new Float32Array(nVox);
  const movedField = new Float32Array(nVox);
  const shift = new Float32Array(nVox);
  const distorted = new Float32Array(nVox);
  const smooth = new Float32Array(nVox);
  const ratio = new Float64Array(nT);
  const sliceGain = new Float64Array(nT * nz);
  for (let n = 0; n < nt; n++) {
    // head-frame image of volume n; slices of the padded margin take the nearest real slice's time
    for (let t = 0; t < nT; t++) {
      const g = gre[PHANTOM_TISSUES[t]];
      ratio[t] = (tissueSignal[PHANTOM_TISSUES[t]] * mzBeforePulse(n + 1, g)) / g.mzSteadyFraction;
      for (let k = 0; k < nz; k++) {
        const c = physio ? cardiacAmp[t] * physio.cardiac[n * nz + k] + respAmp[t] * physio.respiration[n * nz + k] : 0;
        sliceGain[t * nz + k] = ratio[t] * (1 + c);
      }
    }
    let p = 0;
    for (let k = 0; k < pDims[2]; k++) {
      const ks = Math.min(Math.max(k - pad, 0), nz - 1);
      const x = response[n * nz + ks];
      for (let q = 0; q < pDims[0] * pDims[1]; q++, p++) {
        let s = 0;
        for (let t = 0; t < nT; t++) {
          const f = fractions[t][p];
          if (f !== 0) s += f * sliceGain[t * nz + ks] * (t === gmIndex ? 1 + actWeight[p] * x : 1);
        }
        if (eyes && eyes[p] > 0) s = (1 - eyes[p]) * s + eyes[p] * spec.eyes!.signalFraction * ratio[gmIndex];
        base[p] = dephase ? s * dephase[p] : s;
      }
    }
    // rigid motion: output voxel -> world -> head frame -> padded voxel
    const srcFromOut: Affine = composeAffine(invPAffine, composeAffine(invertAffine(poses[n]), affine));
    trilinearResample(base, pDims, srcFromOut, spec.dims, moved);
    let img = moved;
    if (spec.b0?.distortion) {
      // the field moves with the head; the signal is displaced along phase encode in the scanner
      headFieldShiftVoxels(fieldPadded, pDims, srcFromOut, spec.dims, { totalReadoutTimeSec: readoutSec, sign: pe.sign }, shift, undefined, movedField);
      img = distortAlongAxis(moved, shift, spec.dims, pe.axis, distorted);
    }
    // scanner-frame multiplicative effects
    const tau = nt > 1 ? (2 * n) / (nt - 1) - 1 : 0;
    const driftN = spec.drift ? (spec.drift.linearPercent * tau + spec.drift.quadraticPercent * 0.5 * (3 * tau * tau - 1)) / 100 : 0;
    if (spec.smoothNoise) smoothGaussianField(spec.dims, spec.spacingMm, spec.smoothNoise.fwhmMm, smoothRng, smooth);
    const smoothAmp = spec.smoothNoise ? spec.smoothNoise.percent / 100 : 0;
    const out = data.subarray(n * nVox, (n + 1) * nVox);
    p = 0;
    for (let k = 0; k < nz; k++) {
      const vert = spec.drift && nz > 1 ? 1 + spec.drift.verticalGradient * ((2 * k) / (nz - 1) - 1) : 1;
      let keep = 1;
      for (const d of spec.dropouts) if (d.volume === n && d.slice === k) keep *= d.keptFraction;
      for (let q = 0; q < nx * ny; q++, p++) {
        const s = img[p] * (1 + driftN * vert) * (1 + smoothAmp * smooth[p]) * keep;
        out[p] = s;
      }
    }
    // thermal noise: two draws per voxel, always (so the stream does not depend on the image)
    const sd = spec.thermalNoiseSd;
    for (let v = 0; v < nVox; v++) {
      const re = out[v] + thermalRng.normal(0, 1) * sd;
      const im = thermalRng.normal(0, 1) * sd;
      out[v] = spec.rician ? Math.sqrt(re * re + im * im) : re;
    }
    for (const s of spikes) if (s.volume === n) out[s.voxel[0] + nx * (s.voxel[1] + ny * s.voxel[2])] += s.amplitude;
    for (const lb of lowBaseline) {
      const e = lowBaselineRng.normal(0, 1) * spec.lowBaselineVoxels!.noiseSd;
      out[lb.index] = lb.volumes.includes(n) ? Math.abs(e) : Math.max(0, spec.lowBaselineVoxels!.baselineSignal + e);
    }
  }

  const volume = makeVolume({ dims: [nx, ny, nz, nt], spacingMm: [...spec.spacingMm], trSec: tr, affine, data });
  const truth = phantomTruth();
  const sidecar: Sidecar = {
    TaskName: spec.design?.trialType ?? 'rest',
    MagneticFieldStrength: acq.fieldStrengthT,
    RepetitionTime: tr,
    EchoTime: acq.teSec,
    FlipAngle: acq.flipAngleDeg,
    SliceTiming: sliceTiming,
    SliceEncodingDirection: 'k',
    ...(multiband > 1 ? { MultibandAccelerationFactor: multiband } : {}),
    PhaseEncodingDirection: acq.phaseEncodingDirection,
    EffectiveEchoSpacing: acq.effectiveEchoSpacingSec,
    TotalReadoutTime: Math.round(readoutSec * 1e9) / 1e9,
  };
  return { volume, sidecar, events, truth };

  function phantomTruth(): PhantomTruth {
    const vol3 = (d: Float32Array): Volume => makeVolume({ dims: [nx, ny, nz, 1], spacingMm: [...spec.spacingMm], trSec: 0, affine: new Float64Array(affine), data: d });
    const tissueFractions = Object.fromEntries(PHANTOM_TISSUES.map((t) => [t, crop(anatomy.fractions[t], new Float32Array(nVox))])) as Record<PhantomTissue, Float32Array>;
    const act = new Float32Array(nVox);
    const actCrop = crop(actWeight, new Float32Array(nVox));
    for (let v = 0; v < nVox; v++) {
      let total = 0;
      for (const t of PHANTOM_TISSUES) total += tissueFractions[t][v] * tissueSignal[t];
      const gmPart = tissueFractions['grey-matter'][v] * tissueSignal['grey-matter'];
      act[v] = total > 0 ? (100 * actCrop[v] * gmPart) / total : 0;
    }
    const perTissue = Object.fromEntries(PHANTOM_TISSUES.map((t) => {
      const g = gre[t];
      const s: TissueSteadyState = { q: g.q, firstVolumeExcessPercent: 100 * (1 / g.mzSteadyFraction - 1), firstSteadyVolume: 1 + steadyStateModelCount({ trSec: tr, flipAngleDeg: acq.flipAngleDeg, t1Sec: spec.tissues[t].t1Sec }, 0.01) };
      return [t, s];
    })) as Record<PhantomTissue, TissueSteadyState>;
    // tissues that give signal and occupy at least one voxel decide the run's steady state
    const present = PHANTOM_TISSUES.filter((t) => spec.tissues[t].protonDensity > 0 && tissueFractions[t].some((f) => f > 0));
    const first = Math.max(1, ...present.map((t) => perTissue[t].firstSteadyVolume));
    const labelNames = ['air', ...PHANTOM_TISSUES];
    return {
      tissueLabels: vol3(Float32Array.from(labels)),
      labelNames,
      tissueFractions,
      activationPercent: vol3(act),
      fieldMapHz: vol3(crop(fieldPadded, new Float32Array(nVox))),
      motionTable,
      rotationCentreMm: centreMm,
      spikes,
      dropouts: spec.dropouts.map((d) => ({ ...d })),
      ...(spec.lowBaselineVoxels ? { lowBaselineVoxels: lowBaseline.map(({ voxel, volumes }) => ({ voxel, volumes })) } : {}),
      ...(eyes ? { eyeFraction: vol3(crop(eyes, new Float32Array(nVox))) } : {}),
      steadyState: { tolerancePercent: 1, firstSteadyVolume: first, nonSteadyVolumeCount: first - 1, perTissue },
      tissueSignal,
      totalReadoutTimeSec: readoutSec,
      spec,
    };
  }
}

/**
 * The respiratory trace at each volume, read at the slice acquired nearest mid-volume (the whole
 * head takes one pose per volume in this phantom, so one time per volume stands for it).
 */
function volumeRespiration(traceAtSlices: Float64Array, sliceTimesSec: ArrayLike<number>, nt: number, trSec: number): Float64Array {
  const nz = sliceTimesSec.length;
  let mid = 0;
  for (let k = 1; k < nz; k++) if (Math.abs(sliceTimesSec[k] - trSec / 2) < Math.abs(sliceTimesSec[mid] - trSec / 2)) mid = k;
  return Float64Array.from({ length: nt }, (_, n) => traceAtSlices[n * nz + mid]);
}

/**
 * Grey-matter voxels on the brain's surface (a 6-neighbour is not brain), `count` of them drawn
 * without replacement, each with `perVoxel` distinct volumes from volume 10 on (after the steady-state
 * approach) at which it falls to about zero.
 */
function pickLowBaselineVoxels(labels: Uint8Array, dims: readonly [number, number, number], count: number, perVoxel: number, nt: number, rng: ReturnType<typeof createRng>): Array<{ index: number; voxel: [number, number, number]; volumes: number[] }> {
  const [nx, ny, nz] = dims;
  const brain = (l: number) => l === TISSUE_LABEL['grey-matter'] || l === TISSUE_LABEL['white-matter'];
  const surface: number[] = [];
  for (let k = 1; k < nz - 1; k++) for (let j = 1; j < ny - 1; j++) for (let i = 1; i < nx - 1; i++) {
    const p = i + nx * (j + ny * k);
    if (labels[p] !== TISSUE_LABEL['grey-matter']) continue;
    if ([1, -1, nx, -nx, nx * ny, -nx * ny].some((d) => !brain(labels[p + d]))) surface.push(p);
  }
  const out: Array<{ index: number; voxel: [number, number, number]; volumes: number[] }> = [];
  const first = Math.min(10, Math.max(0, nt - perVoxel));
  for (let c = 0; c < count && surface.length > 0; c++) {
    const p = surface.splice(rng.int(surface.length), 1)[0];
    const pool = Array.from({ length: nt - first }, (_, i) => first + i);
    const volumes: number[] = [];
    for (let e = 0; e < perVoxel && pool.length > 0; e++) volumes.push(pool.splice(rng.int(pool.length), 1)[0]);
    out.push({ index: p, voxel: [p % nx, Math.floor(p / nx) % ny, Math.floor(p / (nx * ny))], volumes: volumes.sort((a, b) => a - b) });
  }
  return out;
}
