import { affineFromRows, composeAffine, invertAffine, type Affine, type Vec3 } from '../core/affine.js';
import { fail } from '../core/fail.js';
import { rigidMotionAffine } from '../acquire/rigid-motion-affine.js';
import { affineMotionParameters } from './affine-motion-parameters.js';
import { leastSquaresPass } from './least-squares-pass.js';
import { motionParametersAffine } from './motion-parameters-affine.js';
import { movingLevel, type MovingLevel } from './moving-level.js';
import { nelderMead } from './nelder-mead.js';
import { normalisedCorrelation } from './normalised-correlation.js';
import { normalisedMutualInformation } from './normalised-mutual-information.js';
import type { FixedLevel } from './prepare-fixed-level.js';
import type { ImageOnGrid, RegistrationCost, RegistrationModel, RegistrationResult } from './registration-types.js';
import { sampleMoving } from './sample-moving.js';
import { solveLinearSystem } from './solve-linear-system.js';

/** A fixed image prepared once for registering many moving images to it (a run's reference). */
export interface PreparedFixed {
  model: RegistrationModel;
  cost: RegistrationCost;
  centreMm: Vec3;
  /** Levels, coarse to fine. */
  levels: FixedLevel[];
  bins: number;
  toleranceMm: number;
  /** Iterations per level; undefined = the optimiser's default. */
  maxIterations?: number;
}

/** Radius (mm) at which a rotation's displacement is measured for the stopping rule (as framewise displacement, Power et al. 2012). */
const RADIUS_MM = 50;
/** A sample set below this fraction of the level's weight inside the moving grid is too little overlap. */
const MIN_OVERLAP = 0.1;
/** Step halvings tried when a Gauss-Newton step raises the cost (down to 1/1024 of the step). */
const HALVINGS = 10;
/** Nelder-Mead restarts from the best point at most (each must move it to continue). */
const RESTARTS = 4;

const DEG = 180 / Math.PI;

/** The small update W(q) of the inverse compositional scheme, about centre c. */
function updateAffine(q: Float64Array, c: Readonly<Vec3>): Affine {
  if (q.length === 6) return rigidMotionAffine({ shiftXMm: q[0], shiftYMm: q[1], shiftZMm: q[2], rotXDeg: q[3] * DEG, rotYDeg: q[4] * DEG, rotZDeg: q[5] * DEG }, c);
  const m = [[1 + q[3], q[4], q[5]], [q[6], 1 + q[7], q[8]], [q[9], q[10], 1 + q[11]]];
  return affineFromRows(m.map((row, i) => [row[0], row[1], row[2], q[i] + c[i] - (row[0] * c[0] + row[1] * c[1] + row[2] * c[2])]));
}

/** Largest displacement (bound) of the update over a sphere of RADIUS_MM about the centre. */
function updateSizeMm(q: Float64Array): number {
  const t = Math.hypot(q[0], q[1], q[2]);
  let m = 0;
  for (let i = 3; i < q.length; i++) m += q[i] * q[i];
  return t + RADIUS_MM * Math.sqrt(m);
}

function gaussNewtonLevel(level: FixedLevel, moving: MovingLevel, start: Affine, prep: PreparedFixed, label: string): { transform: Affine; cost: number; iterations: number } {
  const nc = level.columns;
  const H = level.hessian as Float64Array;
  let b = new Float64Array(nc), out = new Float64Array(nc * nc);
  let bNext = new Float64Array(nc), outNext = new Float64Array(nc * nc);
  const tol = prep.toleranceMm * level.factor;
  const maxIt = prep.maxIterations ?? 50;
  let transform = start;
  let sums = leastSquaresPass(level, moving, transform, b, out);
  const overlap = (w: number) => { if (w < MIN_OVERLAP * level.weightSum) fail('REGISTRATION_NO_OVERLAP', `${label}: at level ${level.factor} only ${(100 * w / level.weightSum).toFixed(1)} % of the fixed samples fall inside the moving image`); };
  overlap(sums.validWeight);
  const h = new Float64Array(nc * nc);
  for (let it = 1; it <= maxIt; it++) {
    // the model is moving ~ a F(W(x; q)) + b: the step solves (a^2 H) q = a sum J r
    if (!(sums.scale > 0)) fail('REGISTRATION_NOT_CONVERGED', `${label}: at level ${level.factor} the moving image's intensities fall as the fixed image's rise (fitted scale ${sums.scale.toPrecision(3)}); last least-squares cost ${sums.cost.toPrecision(6)}`, { details: { level: level.factor, cost: sums.cost, iteration: it } });
    for (let i = 0; i < h.length; i++) h[i] = sums.scale * (H[i] - out[i]);
    const q = solveLinearSystem(h, b);
    if (!q) fail('CONSTANT_DATA', `${label}: the fixed image has no contrast in some direction at level ${level.factor} (its gradient cannot pin all ${nc} parameters); registration is undefined`);
    const size = updateSizeMm(q);
    // a step below the tolerance ends the level without another pass (it would change nothing that counts)
    if (size < tol) return { transform, cost: sums.cost, iterations: it };
    let alpha = 1;
    let accepted = false;
    let tried = size;
    for (let tries = 0; tries <= HALVINGS; tries++, alpha /= 2) {
      tried = size * alpha;
      const qa = q.map((x) => x * alpha);
      const candidate = composeAffine(transform, invertAffine(updateAffine(qa, prep.centreMm)));
      const next = leastSquaresPass(level, moving, candidate, bNext, outNext);
      if (next.validWeight >= MIN_OVERLAP * level.weightSum && next.cost <= sums.cost) {
        transform = candidate;
        sums = next;
        [b, bNext] = [bNext, b];
        [out, outNext] = [outNext, out];
        accepted = true;
        break;
      }
      // once the step tried is below the tolerance, smaller ones change nothing that counts
      if (tried < tol) break;
    }
    if (!accepted) {
      // no step size lowers the cost: settled if the smallest step tried was below the tolerance
      if (tried < tol) return { transform, cost: sums.cost, iterations: it };
      fail('REGISTRATION_NOT_CONVERGED', `${label}: at level ${level.factor} every Gauss-Newton step (down to ${tried.toFixed(4)} mm) raised the least-squares cost from ${sums.cost.toPrecision(6)}`, { details: { level: level.factor, cost: sums.cost, iteration: it } });
    }
    if (tried < tol) return { transform, cost: sums.cost, iterations: it };
  }
  return fail('REGISTRATION_NOT_CONVERGED', `${label}: ${maxIt} Gauss-Newton iterations at level ${level.factor} without settling; last least-squares cost ${sums.cost.toPrecision(6)}`, { details: { level: level.factor, cost: sums.cost, iterations: maxIt } });
}

/** Scale of each parameter in the simplex's units: mm, degrees, and 0.01 for scales and shears. */
function parameterScale(n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => (i < 6 ? 1 : 0.01));
}

function simplexLevel(level: FixedLevel, moving: MovingLevel, start: Affine, prep: PreparedFixed, label: string): { transform: Affine; cost: number; iterations: number } {
  const p0 = affineMotionParameters(start, prep.centreMm, prep.model);
  const scale = parameterScale(p0.length);
  const fBuf = new Float32Array(level.count), mBuf = new Float32Array(level.count), wBuf = new Float32Array(level.count);
  const p = new Float64Array(p0.length);
  const cost = (u: Float64Array): number => {
    for (let i = 0; i < p.length; i++) p[i] = p0[i] + u[i] * scale[i];
    if (p.length === 12 && (p[6] <= 0 || p[7] <= 0 || p[8] <= 0)) return Infinity;
    const { kept, validWeight } = sampleMoving(level, moving, motionParametersAffine(p, prep.centreMm), fBuf, mBuf, wBuf);
    if (validWeight < MIN_OVERLAP * level.weightSum || kept < 3) return Infinity;
    const f = fBuf.subarray(0, kept), m = mBuf.subarray(0, kept), w = wBuf.subarray(0, kept);
    if (prep.cost === 'normalised-correlation') return 1 - normalisedCorrelation(f, m, w);
    return 2 - normalisedMutualInformation(f, m, w, { bins: prep.bins, fixedRange: level.range, movingRange: moving.range, window: 'cubic-bspline' });
  };
  // a simplex can collapse before it reaches the minimum (a known weakness of the method in several
  // dimensions): restart from the best point until a restart no longer moves it
  const xTolerance = prep.toleranceMm * level.factor;
  let result = nelderMead(cost, new Float64Array(p0.length), { step: 0.5 * level.factor, xTolerance, maxIterations: prep.maxIterations });
  let iterations = result.iterations;
  for (let restart = 0; restart < RESTARTS && result.converged && Number.isFinite(result.fx); restart++) {
    const again = nelderMead(cost, result.x, { step: 0.25 * level.factor, xTolerance, maxIterations: prep.maxIterations });
    iterations += again.iterations;
    let moved = 0;
    for (let i = 0; i < again.x.length; i++) moved = Math.max(moved, Math.abs(again.x[i] - result.x[i]));
    const better = again.fx <= result.fx;
    if (better) result = again;
    else if (!again.converged) result = again;
    if (!better || moved < xTolerance) break;
  }
  if (!Number.isFinite(result.fx)) fail('REGISTRATION_NO_OVERLAP', `${label}: at level ${level.factor} fewer than ${100 * MIN_OVERLAP} % of the fixed samples fall inside the moving image at every point the optimiser tried`);
  if (!result.converged) fail('REGISTRATION_NOT_CONVERGED', `${label}: ${result.iterations} Nelder-Mead iterations at level ${level.factor} without the simplex settling; last ${prep.cost} cost ${result.fx.toPrecision(6)}`, { details: { level: level.factor, cost: result.fx, iterations: result.iterations } });
  for (let i = 0; i < p.length; i++) p[i] = p0[i] + result.x[i] * scale[i];
  return { transform: motionParametersAffine(p, prep.centreMm), cost: result.fx, iterations };
}

/**
 * Register one moving image to a prepared fixed image, level by level (coarse to fine), each level
 * starting where the last ended: Gauss-Newton on the inverse compositional scheme for least squares
 * (step halved up to 10 times when it raises the cost; when every halving raises it and the last is below the tolerance, the level ends there: no descent along the Gauss-Newton direction, as for a volume whose contrast differs from the reference before the steady state), Nelder-Mead on the model's parameters for
 * normalised correlation and mutual information. A level is done when an update moves no point
 * within 50 mm of the centre by more than toleranceMm x the level's factor (Nelder-Mead: when the
 * simplex is that small, in mm and degrees, and 0.01 units for scales and shears).
 * @param prep - the fixed image's levels and the settings
 * @param moving - the moving image (not modified)
 * @param start - starting transform, fixed world -> moving world
 * @param label - name of the moving image in messages
 * @returns the registration result
 * @throws BoldsweepError REGISTRATION_NOT_CONVERGED (with the level and last cost), REGISTRATION_NO_OVERLAP, CONSTANT_DATA
 * @example const r = registerPrepared(prep, { data, grid }, identityAffine(), 'volume 3')
 */
export function registerPrepared(prep: PreparedFixed, moving: ImageOnGrid, start: Affine, label: string): RegistrationResult {
  let transform = start;
  let cost = NaN;
  const iterations: number[] = [];
  for (const level of prep.levels) {
    const m = movingLevel(moving, level.fwhmMm);
    const r = prep.cost === 'least-squares' ? gaussNewtonLevel(level, m, transform, prep, label) : simplexLevel(level, m, transform, prep, label);
    transform = r.transform;
    cost = r.cost;
    iterations.push(r.iterations);
  }
  const parameters = affineMotionParameters(transform, prep.centreMm, prep.model);
  return {
    affine: motionParametersAffine(parameters, prep.centreMm), parameters, cost, iterations,
    levels: prep.levels.map((l) => l.factor), fwhmMm: prep.levels.map((l) => l.fwhmMm), model: prep.model, costName: prep.cost, centreMm: [...prep.centreMm],
  };
}
