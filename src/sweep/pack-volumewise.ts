import { fail } from '../core/fail.js';
import type { Volume } from '../core/volume.js';
import { getStep } from '../steps/registry.js';
import type { StepContext, StepNote } from '../steps/step-types.js';
import { runRecipeStep } from './recipe-step.js';
import type { RecipeStep } from './spec.js';

/** The run a {@link packVolumewise} call reads: its geometry and a way to write any one volume. */
export interface VolumeSource {
  /** Grid, TR and number of volumes of the run. */
  geometry: Omit<Volume, 'data'>;
  /** Write volume t (nx*ny*nz values) into `into`. */
  volumeAt: (t: number, into: Float32Array) => void;
}

/**
 * Run volume-wise steps (their definitions say `volumewise`) one volume at a time and keep only the
 * mask's voxels of the result: volume t goes into a volume-sized scratch, each step smooths (or
 * otherwise filters) it as a one-volume run into a second scratch, and the mask's voxels are copied
 * to `out`. A sweep worker so holds a preprocessed run at the brain mask's size, with two volumes of
 * scratch, instead of a whole run; by the steps' volume-wise contract the values are the bytes the
 * steps give on the whole run. The notes and the context are those of volume 0 (the same for every
 * volume by that contract).
 * @param source - the input run, volume by volume
 * @param steps - the steps, each volume-wise
 * @param estimates - each step's estimate (undefined: none)
 * @param context - the context the first step sees
 * @param maskIndex - the voxels to keep, ascending indices within a volume
 * @param out - the kept values, volume t's j-th kept voxel at t * maskIndex.length + j (length count * nt)
 * @returns the steps' notes and the context after the last step
 * @throws BoldsweepError INVALID_ARGUMENT when a step is not volume-wise, returns regressors or
 *   leaves the grid, or `out` has the wrong length
 * @example const { notes } = await packVolumewise(source, [smoothStep], [undefined], context, brainIndex, packed)
 */
export async function packVolumewise(source: VolumeSource, steps: readonly RecipeStep[], estimates: readonly unknown[], context: StepContext, maskIndex: Int32Array, out: Float32Array): Promise<{ notes: StepNote[]; context: StepContext }> {
  const [nx, ny, nz, nt] = source.geometry.dims;
  const n = nx * ny * nz;
  const m = maskIndex.length;
  if (out.length !== m * nt) fail('INVALID_ARGUMENT', `the packed output has ${out.length} values; ${m} voxels x ${nt} volumes need ${m * nt}`);
  for (const s of steps) if (!getStep(s.step).volumewise) fail('INVALID_ARGUMENT', `step '${s.step}' is not volume-wise: it needs the whole run`);
  const a = new Float32Array(n);
  const b = new Float32Array(n);
  const geometry = { ...source.geometry, dims: [nx, ny, nz, 1] as Volume['dims'] };
  const notes: StepNote[] = [];
  let last: StepContext = context;
  for (let t = 0; t < nt; t++) {
    source.volumeAt(t, a);
    let v: Volume = { ...geometry, data: a };
    let c = context;
    for (let i = 0; i < steps.length; i++) {
      const input = v.data;
      // the other scratch volume (a step writes there, or into an array of its own)
      const outputBuffer = (length: number): Float32Array => (length === n ? (input === a ? b : a) : new Float32Array(length));
      const r = await runRecipeStep(steps[i], v, { ...c, outputBuffer }, estimates[i]);
      if (r.regressors && r.regressors.length > 0) fail('INVALID_ARGUMENT', `step '${steps[i].step}' is declared volume-wise but returned regressors`);
      if (r.volume.dims[0] !== nx || r.volume.dims[1] !== ny || r.volume.dims[2] !== nz || r.volume.dims[3] !== 1) fail('INVALID_ARGUMENT', `step '${steps[i].step}' is declared volume-wise but changed the grid or the number of volumes`);
      const { outputBuffer: _given, ...next } = r.context;
      v = r.volume;
      c = next;
      if (t === 0) notes.push(r.note);
    }
    if (t === 0) last = c;
    const d = v.data;
    for (let j = 0, o = t * m; j < m; j++) out[o + j] = d[maskIndex[j]];
  }
  return { notes, context: last };
}
