import { childSeed } from '../core/child-seed.js';

/**
 * The seed of a study subject's random block design: a child of the group's planting seed, so every
 * misregistration level of a repeat gives the subject the same design.
 * @param plantSeed - the group's planting seed
 * @param subject - 0-based subject number
 * @returns the seed
 * @example randomBlockEvents(studyDesignSeed(group.plantSeed, 3), runSec, design)
 */
export function studyDesignSeed(plantSeed: number, subject: number): number {
  return childSeed(plantSeed, 'study-design', subject);
}
