import type { MotionRow } from '../acquire/rigid-motion-affine.js';
import { fail } from '../core/fail.js';
import type { NuisanceRegressor } from '../model/design.js';
import { fdCensorVolumes } from '../model/fd-censor-volumes.js';
import { framewiseDisplacement } from '../model/framewise-displacement.js';
import { motionRegressors } from '../model/motion-regressors.js';
import type { ModelOptions } from './spec.js';

/** What a cell's model takes from the motion table: volumes to censor and the motion columns. */
export interface MotionNuisance {
  /** Volumes (0-based in the run as opened) whose framewise displacement is above `censorFdMm`, with the neighbours `censorFdBefore`/`censorFdAfter` ask for. */
  censorVolumes: number[];
  /** Motion columns on the modelled volumes (the last `nt` of the run), centred over the uncensored ones. */
  regressors: NuisanceRegressor[];
}

/**
 * The motion part of a cell's model: framewise displacement from the whole table (so the first
 * modelled volume after dropped ones keeps the movement since the volume before it), the volumes above
 * `model.censorFdMm` (and `censorFdBefore`/`censorFdAfter` neighbours of each), and `model.motionRegressors` columns on the modelled volumes, centred over
 * those not censored (by FD or by `model.censorVolumes`).
 * @param table - the motion table of the run as opened (one row per volume), or null
 * @param nt - volumes modelled: the last `nt` of the run (steps may only drop initial volumes)
 * @param model - the cell's model options
 * @returns censored volumes and regressors (both empty when the model asks for no motion terms)
 * @throws BoldsweepError MOTION_TABLE_MISSING when the model asks for motion terms without a table
 * @example const { censorVolumes, regressors } = motionNuisance(table, 196, { ...spec.model, motionRegressors: 24 })
 */
export function motionNuisance(table: readonly MotionRow[] | null, nt: number, model: Pick<ModelOptions, 'motionRegressors' | 'censorFdMm' | 'censorFdBefore' | 'censorFdAfter' | 'censorVolumes'>): MotionNuisance {
  const count = model.motionRegressors ?? 0;
  const censorFdMm = model.censorFdMm ?? null;
  if (count === 0 && censorFdMm === null) return { censorVolumes: [], regressors: [] };
  if (!table) fail('MOTION_TABLE_MISSING', `the model asks for ${count ? `${count} motion regressors` : ''}${count && censorFdMm !== null ? ' and ' : ''}${censorFdMm !== null ? `censoring above ${censorFdMm} mm framewise displacement` : ''}, but the sweep has no motion table`);
  const offset = table.length - nt;
  if (offset < 0) fail('MOTION_TABLE_LENGTH', `the motion table has ${table.length} rows, the modelled run ${nt} volumes`);
  const censorVolumes = censorFdMm === null ? [] : fdCensorVolumes(framewiseDisplacement(table), censorFdMm, { before: model.censorFdBefore ?? 0, after: model.censorFdAfter ?? 0 }).filter((t) => t >= offset);
  const censoredHere = [...censorVolumes, ...model.censorVolumes].map((t) => t - offset).filter((t) => t >= 0 && t < nt);
  const regressors = count === 0 ? [] : motionRegressors(table.slice(offset), count, censoredHere);
  return { censorVolumes, regressors };
}
