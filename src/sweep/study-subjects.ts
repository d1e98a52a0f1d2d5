import { invertAffine, type Affine, type Vec3 } from '../core/affine.js';
import { childSeed } from '../core/child-seed.js';
import { createRng } from '../core/random.js';
import { placeCentres } from '../plant/plant-placement.js';
import type { CellGroup } from './plan.js';
import { studyDesignSeed } from './study-design-seed.js';

/** One simulated subject of a study group. */
export interface StudySubject {
  /** 0-based subject number. */
  index: number;
  /** Which of the study's runs the subject's data come from (subject mod runs). */
  runIndex: number;
  /** Seed of the subject's own random block design. */
  designSeed: number;
  /** The group's blob centres, each displaced by the subject's misregistration (fractional voxel indices). */
  centresVoxel: Vec3[];
  /** The subject's planted amplitude (percent), drawn around the group amplitude. */
  amplitudePct: number;
}

/** Attempts at drawing the group's centres before giving up (as planting does by default). */
const MAX_ATTEMPTS = 1000;

/**
 * The subjects of a study group: the group's blob centres drawn as a planting of this repeat draws
 * them (the same placement, seed and spacing rules), then for each subject a random displacement of
 * every blob (normal, SD `misregistrationMm` along each world axis, so the displaced blobs of many
 * subjects spread as a Gaussian of FWHM 2.355 SD around the group's position), an amplitude
 * A (1 + spread z) with z standard normal, and a design seed. Every draw comes from a child seed of
 * the group's planting seed and the subject's number, and the displacement is the unit draw times the
 * SD, so the misregistration levels of one repeat are paired: at 6 mm each blob moves twice as far as
 * at 3 mm, in the same direction, and the designs and amplitudes are the same.
 * @param group - the study group (planting condition, seed, study settings)
 * @param grid - the run's grid (dims and voxel -> world affine)
 * @param placementMask - where the group's centres may go
 * @param runCount - the study's runs (subjects cycle through them)
 * @returns the group's centres (integer voxel indices) and the subjects
 * @example const { groupCentresVoxel, subjects } = studySubjects(group, { dims, affine }, brain, 1)
 */
export function studySubjects(group: CellGroup, grid: { dims: readonly number[]; affine: Affine }, placementMask: ArrayLike<number>, runCount: number): { groupCentresVoxel: Vec3[]; subjects: StudySubject[] } {
  const study = group.study!;
  const plant = group.plant;
  const marginMm = plant.marginMm ?? plant.sizeMm / 2;
  const groupCentresVoxel = plant.count > 0
    ? placeCentres(placementMask, grid.dims, grid.affine, { count: plant.count, minDistanceMm: plant.separation * plant.sizeMm, marginMm, maxAttempts: MAX_ATTEMPTS }, createRng(group.plantSeed))
    : [];
  const inv = invertAffine(grid.affine);
  const subjects: StudySubject[] = [];
  for (let s = 0; s < study.subjects; s++) {
    const move = createRng(childSeed(group.plantSeed, 'study-misregistration', s));
    const centresVoxel = groupCentresVoxel.map((c): Vec3 => {
      const d = [move.normal(), move.normal(), move.normal()].map((u) => u * study.misregistrationMm);
      // a world displacement in voxel steps: the inverse affine's 3x3 part
      return [0, 1, 2].map((r) => c[r] + inv[4 * r] * d[0] + inv[4 * r + 1] * d[1] + inv[4 * r + 2] * d[2]) as Vec3;
    });
    const amplitudePct = plant.amplitudePct * (1 + study.amplitudeSpread * createRng(childSeed(group.plantSeed, 'study-amplitude', s)).normal());
    subjects.push({ index: s, runIndex: s % runCount, designSeed: studyDesignSeed(group.plantSeed, s), centresVoxel, amplitudePct });
  }
  return { groupCentresVoxel, subjects };
}

