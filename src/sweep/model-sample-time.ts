/**
 * When the model can sample its task regressor at the slices' own time: the slice times the recipe
 * handed on are all one time (slice-timing correction aligned every slice to a reference time), so
 * one design fits every voxel, sampled at that time. Slices acquired at different times get a
 * design per slice time only when a step asked for it (`StepContext.modelAtSliceTimes`, see
 * `cellFit` in cell-pipeline.ts); otherwise the model samples mid-volume, as without slice times.
 * @param sliceTimesSec - slice acquisition times within a volume (s), or null when unknown
 * @param trSec - repetition time (s)
 * @returns the common time within [0, trSec], or null (sample mid-volume)
 * @example modelSampleTimeSec(Float64Array.of(0.5, 0.5, 0.5), 2) // 0.5
 */
export function modelSampleTimeSec(sliceTimesSec: ArrayLike<number> | null | undefined, trSec: number): number | null {
  if (!sliceTimesSec || sliceTimesSec.length === 0) return null;
  const t0 = sliceTimesSec[0];
  if (!(Number.isFinite(t0) && t0 >= 0 && t0 <= trSec)) return null;
  for (let k = 1; k < sliceTimesSec.length; k++) if (sliceTimesSec[k] !== t0) return null;
  return t0;
}
