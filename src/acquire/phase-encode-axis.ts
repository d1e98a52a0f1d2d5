import { fail } from '../core/fail.js';

/** A voxel axis (0 = i, 1 = j, 2 = k) and the sense along it (+1, or -1 for a reversed direction). */
export interface SignedAxis {
  axis: 0 | 1 | 2;
  sign: 1 | -1;
}

/**
 * The voxel axis and sense of a BIDS direction field (PhaseEncodingDirection, SliceEncodingDirection):
 * 'i', 'j', 'k' name the first, second, third voxel axis; a trailing '-' reverses it.
 * @param direction - e.g. 'j' or 'j-'
 * @param field - the field's name, for the message
 * @returns the axis and its sign
 * @throws BoldsweepError INVALID_ARGUMENT for anything else
 * @example phaseEncodeAxis('j-') // { axis: 1, sign: -1 }
 */
export function phaseEncodeAxis(direction: string, field = 'PhaseEncodingDirection'): SignedAxis {
  const m = /^([ijk])(-?)$/.exec(direction);
  if (!m) return fail('INVALID_ARGUMENT', `${field} must be one of i, j, k, i-, j-, k- (BIDS), got '${String(direction)}'`);
  return { axis: (['i', 'j', 'k'] as const).indexOf(m[1] as 'i' | 'j' | 'k') as 0 | 1 | 2, sign: m[2] === '-' ? -1 : 1 };
}
