/**
 * The voxels where a run differs from a base run, with their whole time series: a planted run is the
 * run it was planted in plus signal at the blob voxels, so after steps that treat every voxel's time
 * series on its own (dropping volumes, say) a group stage differs from the same steps applied to the
 * unplanted run only there. A sweep worker keeps the stage as base + patch (a few percent of a run)
 * instead of a whole copy.
 *
 * Values are compared and copied as their 32-bit patterns, so rebuilding gives the stage's exact
 * bytes (NaN payloads and signed zeros included).
 */
export interface StagePatch {
  /** Voxel indices within one volume, ascending. */
  voxels: Int32Array;
  /** The stage's values at those voxels as 32-bit patterns, volume-major: volume t, voxel j at t * voxels.length + j. */
  bits: Int32Array;
}

const bitsOf = (a: Float32Array): Int32Array => new Int32Array(a.buffer, a.byteOffset, a.length);

/**
 * The voxels whose time series differ (in any bit of any volume) between a run and a base run of the
 * same size, with the run's values there; null when more than `maxFraction` of the voxels differ (a
 * patch would then save little over a copy).
 * @param run - run data, nVoxels x nt values, voxels fastest; not modified
 * @param base - base run data, same length; not modified
 * @param nVoxels - voxels per volume
 * @param maxFraction - largest fraction of voxels the patch may hold, in [0, 1]
 * @returns the patch, or null
 * @example const patch = stagePatch(stage.data, unplanted.data, nx * ny * nz, 0.25)
 */
export function stagePatch(run: Float32Array, base: Float32Array, nVoxels: number, maxFraction: number): StagePatch | null {
  if (run.length !== base.length || nVoxels < 1 || run.length % nVoxels !== 0) return null;
  const nt = run.length / nVoxels;
  const a = bitsOf(run);
  const b = bitsOf(base);
  const differs = new Uint8Array(nVoxels);
  for (let t = 0, o = 0; t < nt; t++, o += nVoxels) {
    for (let v = 0; v < nVoxels; v++) if (a[o + v] !== b[o + v]) differs[v] = 1;
  }
  let count = 0;
  for (let v = 0; v < nVoxels; v++) count += differs[v];
  if (count > maxFraction * nVoxels) return null;
  const voxels = new Int32Array(count);
  for (let v = 0, j = 0; v < nVoxels; v++) if (differs[v]) voxels[j++] = v;
  const bits = new Int32Array(count * nt);
  for (let t = 0, o = 0; t < nt; t++, o += nVoxels) {
    for (let j = 0; j < count; j++) bits[t * count + j] = a[o + voxels[j]];
  }
  return { voxels, bits };
}

/**
 * Rebuild a run from its base and patch: `out` = base with the patched voxels' series written over it.
 * @param base - base run data (nVoxels x nt values); not modified
 * @param patch - from {@link stagePatch} with the same nVoxels
 * @param nVoxels - voxels per volume
 * @param out - where the run goes, same length as base (not base itself)
 * @returns out
 * @example applyStagePatch(unplanted.data, patch, nx * ny * nz, workBuffer)
 */
export function applyStagePatch(base: Float32Array, patch: StagePatch, nVoxels: number, out: Float32Array): Float32Array {
  out.set(base);
  const { voxels, bits } = patch;
  const count = voxels.length;
  const o32 = bitsOf(out);
  for (let o = 0, k = 0; k < bits.length; o += nVoxels) {
    for (let j = 0; j < count; j++, k++) o32[o + voxels[j]] = bits[k];
  }
  return out;
}
